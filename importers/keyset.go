package importers

import (
	"bytes"
	"hash/maphash"
	"math"
)

// keySet remembers byte-string keys with the row that first gave each. It is
// a map from a 64-bit hash to an entry whose key bytes live in one growing
// arena, so adding a key costs no allocation of its own; a hash match is
// confirmed against the stored bytes, and a collision probes the next hash,
// so the set is exact. Several small index maps may share one arena (addIn):
// the duplicate check keeps one per planet, which stays in cache while a
// planet's rows go by.
type keySet struct {
	hash    func([]byte) uint64 // replaced in tests to force collisions
	index   map[uint64]int32
	entries []keyEntry
	arena   []byte
}

// keyEntry is 12 bytes: a file of a million moons keeps a million of them.
type keyEntry struct {
	off    uint32 // in arena
	n, row int32
}

func newKeySet() *keySet {
	seed := maphash.MakeSeed()
	return &keySet{hash: func(b []byte) uint64 { return maphash.Bytes(seed, b) }, index: map[uint64]int32{}}
}

// add records key with row; if key is already present it returns the first
// row and false. Past its capacity (4 GiB of keys, 2^31 rows) it returns
// -1 and false.
func (s *keySet) add(key []byte, row int) (first int, added bool) {
	return s.addIn(s.index, key, row)
}

// addIn is add with its own index map, sharing the arena.
func (s *keySet) addIn(index map[uint64]int32, key []byte, row int) (first int, added bool) {
	h := s.hash(key)
	for {
		i, ok := index[h]
		if !ok {
			break
		}
		e := s.entries[i]
		if bytes.Equal(s.arena[e.off:e.off+uint32(e.n)], key) {
			return int(e.row), false
		}
		h++ // a collision of different keys: probe on
	}
	if len(s.arena)+len(key) > math.MaxUint32 || len(s.entries) >= math.MaxInt32 || row > math.MaxInt32 {
		return -1, false
	}
	index[h] = int32(len(s.entries))
	s.entries = append(s.entries, keyEntry{off: uint32(len(s.arena)), n: int32(len(key)), row: int32(row)})
	s.arena = append(s.arena, key...)
	return row, true
}
