package importers

import (
	"fmt"
	"testing"
)

func TestKeySet(t *testing.T) {
	for name, s := range map[string]*keySet{
		"maphash":        newKeySet(),
		"every collides": {hash: func([]byte) uint64 { return 7 }, index: map[uint64]int32{}},
	} {
		for i := range 300 {
			if first, added := s.add(fmt.Appendf(nil, "p\x00moon %d", i), i+2); !added || first != i+2 {
				t.Fatalf("%s: new key %d: first %d added %v", name, i, first, added)
			}
		}
		for i := range 300 {
			if first, added := s.add(fmt.Appendf(nil, "p\x00moon %d", i), 1000); added || first != i+2 {
				t.Fatalf("%s: repeated key %d: first %d added %v; want row %d", name, i, first, added, i+2)
			}
		}
	}
}
