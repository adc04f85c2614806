package schema

import (
	"strings"
	"testing"
)

// TestNameKeyFastPath: the fast path agrees with the full rule (trim,
// collapse white space, lower case) on names in and out of key form.
func TestNameKeyFastPath(t *testing.T) {
	slow := func(s string) string { return strings.ToLower(strings.Join(strings.Fields(s), " ")) }
	for _, name := range []string{"", " ", "a", "A", "ab c", "ab  c", " ab", "ab ", "a\tb", "Ab", "synth-m0000001",
		"teodra b iii", "Teodra b III", "x\u00a0y", "é", "É", "a\nb", "a\rb", "a\vb", "a\fb", "a b c d"} {
		if got, want := NameKey(name), slow(name); got != want {
			t.Errorf("NameKey(%q) = %q, want %q", name, got, want)
		}
		if got, want := CollapseSpace(name), strings.Join(strings.Fields(name), " "); got != want {
			t.Errorf("CollapseSpace(%q) = %q, want %q", name, got, want)
		}
	}
}
