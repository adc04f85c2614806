package rank

import (
	"testing"

	"tidesift/rank/synth"
)

// BenchmarkBuildPlans: the serial set-up of Run for 10,000 moons.
func BenchmarkBuildPlans(b *testing.B) {
	cat := synth.Catalog(10000, 1)
	prof := mustProfile(b, "ocean")
	for b.Loop() {
		ix := newCatIndex(cat)
		for i := range cat.Moons {
			if _, err := buildPlan(ix, &cat.Moons[i], prof); err != nil {
				b.Fatal(err)
			}
		}
	}
}
