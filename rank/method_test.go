package rank

import (
	"strings"
	"testing"
)

// TestMethodText: the method section names the sources of the estimators the
// code uses, and the numbers it states match the code's constants.
func TestMethodText(t *testing.T) {
	m := MethodText()
	for _, s := range []string{"Uncertainty and ranking\n-----------------------\n", "Plischke", "McKean & Schrader", "Hyndman & Fan",
		"Kelley", "Wallis 2014", "Johnson, Kotz & Balakrishnan", "Sobol'", "1,024", "10,000", "type 7"} {
		if !strings.Contains(m, s) {
			t.Errorf("method text lacks %q", s)
		}
	}
	if ChunkSize != 1024 || DefaultSamples != 10000 {
		t.Error("method text states ChunkSize 1,024 and 10,000 default samples: update it")
	}
	if !strings.HasSuffix(m, "\n") {
		t.Error("no final newline")
	}
}
