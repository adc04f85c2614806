package importers

import (
	"fmt"
	"hash/crc32"
	"testing"
)

func TestKeySet(t *testing.T) {
	for name, s := range map[string]*keySet{
		"maphash": newKeySet(),
		// Every key has the same 64-bit hash: the check hash and probing
		// must keep them apart.
		"first hash collides": {hash: func(b []byte) (uint64, uint32) { return 7, crc32.ChecksumIEEE(b) }, index: map[uint64]keySlot{}},
	} {
		for i := range 300 {
			if first, added := s.add(fmt.Appendf(nil, "p\x00moon %03d", i), i+2); !added || first != i+2 {
				t.Fatalf("%s: new key %d: first %d added %v", name, i, first, added)
			}
		}
		for i := range 300 {
			if first, added := s.add(fmt.Appendf(nil, "p\x00moon %03d", i), 1000); added || first != i+2 {
				t.Fatalf("%s: repeated key %d: first %d added %v; want row %d", name, i, first, added, i+2)
			}
		}
	}
}

func TestMoonKeyUnambiguous(t *testing.T) {
	for _, tc := range []struct{ p1, n1, p2, n2 string }{
		{"ab", "c", "a", "bc"},
		{"a\x00b", "c", "a", "b\x00c"},
		{"Vorlan", "", "", "Vorlan"},
	} {
		a := appendMoonKey(nil, tc.p1, tc.n1)
		b := appendMoonKey(nil, tc.p2, tc.n2)
		if string(a) == string(b) {
			t.Errorf("(%q, %q) and (%q, %q) share the key %q", tc.p1, tc.n1, tc.p2, tc.n2, a)
		}
	}
	if a, b := appendMoonKey(nil, "Vorlan  B", "Kel"), appendMoonKey(nil, "vorlan b", "KEL"); string(a) != string(b) {
		t.Errorf("case and spacing should not matter: %q vs %q", a, b)
	}
}
