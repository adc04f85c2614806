package rank

import (
	"context"
	"fmt"
	"testing"

	"tidesift/rank/profile"
	"tidesift/rank/synth"
)

// BenchmarkRun times Run on invented synthetic catalogs (package synth) under
// the ocean profile. The ns/cell metric is the cost per target × sample.
//
//	go test -run XXX -bench Run -benchtime 1x ./rank/
func BenchmarkRun(b *testing.B) {
	prof, err := profile.Builtin("ocean")
	if err != nil {
		b.Fatal(err)
	}
	for _, c := range []struct{ n, s int }{{100, 10000}, {1000, 10000}, {2000, 10000}} {
		cat := synth.Catalog(c.n, 1)
		b.Run(fmt.Sprintf("targets=%d/samples=%d", c.n, c.s), func(b *testing.B) {
			for b.Loop() {
				if _, err := Run(context.Background(), cat, prof, Options{Samples: c.s}); err != nil {
					b.Fatal(err)
				}
			}
			b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(c.n*c.s), "ns/cell")
		})
	}
}
