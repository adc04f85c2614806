package importers

import (
	"encoding/binary"
	"hash/maphash"
	"math"
)

// keySet remembers byte-string keys (a moon's planet and name, see moonKey)
// with the row that first gave each. It keeps no key bytes: an entry is a
// 64-bit hash of the key, the map key, and a second, independent 32-bit hash
// beside the row, 16 bytes a slot in all, the size the map's alignment gives
// a uint64 key with an int32 value anyway. A million moons cost about
// 30 bytes each (the map's load factor included) instead of the 66 an exact
// set of the key bytes with one index per planet needed.
//
// The price is that two different keys whose 64-bit and 32-bit hashes both
// agree would be taken for a duplicate. With n keys in a file the chance
// that any such pair exists is about n²/2⁹⁷ (birthday bound over 96 bits):
// 6·10⁻¹⁸ for a million moons, 6·10⁻¹⁴ for a hundred million. Two keys that
// agree in the 64-bit hash only are kept apart by probing the next slot, so
// they are not taken for duplicates. The seeds are random per set, so no
// input can be built to collide on purpose.
type keySet struct {
	hash  func([]byte) (uint64, uint32) // replaced in tests to force collisions
	index map[uint64]keySlot
}

// keySlot is what the set keeps per key besides its 64-bit hash.
type keySlot struct {
	row   int32
	check uint32 // the second hash, confirming a match of the first
}

func newKeySet() *keySet {
	s1, s2 := maphash.MakeSeed(), maphash.MakeSeed()
	return &keySet{
		hash: func(b []byte) (uint64, uint32) {
			return maphash.Bytes(s1, b), uint32(maphash.Bytes(s2, b))
		},
		index: map[uint64]keySlot{},
	}
}

// add records key with row; if key is already present it returns the first
// row and false. For a row number above 2³¹−1 it returns -1 and false.
func (s *keySet) add(key []byte, row int) (first int, added bool) {
	h, check := s.hash(key)
	for {
		e, ok := s.index[h]
		if !ok {
			break
		}
		if e.check == check {
			return int(e.row), false
		}
		h++ // the first hash alone collides: probe on
	}
	if row > math.MaxInt32 || row < 0 {
		return -1, false
	}
	s.index[h] = keySlot{row: int32(row), check: check}
	return row, true
}

// appendMoonKey appends the duplicate check's key of a moon: the natural
// keys (schema.NameKey) of its planet and its name, the planet's prefixed
// by its length so that no split of the bytes between the two is ambiguous.
func appendMoonKey(b []byte, planet, name string) []byte {
	b = append(b, 0, 0, 0, 0)
	start := len(b)
	b = appendNameKey(b, planet)
	binary.LittleEndian.PutUint32(b[start-4:], uint32(len(b)-start))
	return appendNameKey(b, name)
}
