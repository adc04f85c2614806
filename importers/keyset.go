package importers

import (
	"bytes"
	"hash/maphash"
)

// keySet remembers byte-string keys with the row that first gave each. It is
// a map from a 64-bit hash to an entry whose key bytes live in one growing
// arena, so adding a key costs no allocation of its own; a hash match is
// confirmed against the stored bytes, and a collision probes the next hash,
// so the set is exact.
type keySet struct {
	hash    func([]byte) uint64 // replaced in tests to force collisions
	index   map[uint64]int
	entries []keyEntry
	arena   []byte
}

type keyEntry struct {
	off, n, row int
}

func newKeySet() *keySet {
	seed := maphash.MakeSeed()
	return &keySet{hash: func(b []byte) uint64 { return maphash.Bytes(seed, b) }, index: map[uint64]int{}}
}

// add records key with row; if key is already present it returns the first
// row and false.
func (s *keySet) add(key []byte, row int) (first int, added bool) {
	h := s.hash(key)
	for {
		i, ok := s.index[h]
		if !ok {
			break
		}
		e := s.entries[i]
		if bytes.Equal(s.arena[e.off:e.off+e.n], key) {
			return e.row, false
		}
		h++ // a collision of different keys: probe on
	}
	s.index[h] = len(s.entries)
	s.entries = append(s.entries, keyEntry{off: len(s.arena), n: len(key), row: row})
	s.arena = append(s.arena, key...)
	return row, true
}
