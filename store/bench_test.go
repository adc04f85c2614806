package store

import (
	"context"
	"fmt"
	"path/filepath"
	"testing"
)

// BenchmarkImport imports about 100,000 invented values (11,112 moons of 10
// planets, nine moon values each, a planet mass on every row) into a file
// catalog: "new" into an empty catalog, "changed" as a second import that
// changes every value (so each one is superseded). It reports values/s.
//
//	go test ./store -run '^$' -bench BenchmarkImport -benchtime 3x
func BenchmarkImport(b *testing.B) {
	const moons = 11112
	first := synthRecords(moons, 10, 0)
	second := synthRecords(moons, 10, 0.5)
	values := 0
	for _, r := range first {
		values += len(r.Params)
	}
	ctx := context.Background()
	for _, mode := range []string{"new", "changed"} {
		b.Run(mode, func(b *testing.B) {
			var stored int
			var cpu float64
			for i := 0; b.Loop(); i++ {
				b.StopTimer()
				s, err := Open(ctx, filepath.Join(b.TempDir(), fmt.Sprintf("bench%d.db", i)), Options{})
				if err != nil {
					b.Fatal(err)
				}
				if mode == "changed" {
					if _, err := s.Import(ctx, ImportRequest{File: "first", Records: first, OmitChanges: true}); err != nil {
						b.Fatal(err)
					}
				}
				recs := first
				if mode == "changed" {
					recs = second
				}
				b.StartTimer()
				c0 := cpuSeconds()
				res, err := s.Import(ctx, ImportRequest{File: "bench", Records: recs})
				if err != nil {
					b.Fatal(err)
				}
				cpu += cpuSeconds() - c0
				b.StopTimer()
				stored = res.Added + res.Changed
				s.Close()
				b.StartTimer()
			}
			b.ReportMetric(float64(values)*float64(b.N)/b.Elapsed().Seconds(), "values/s")
			b.ReportMetric(float64(stored), "stored/op")
			if cpu > 0 {
				b.ReportMetric(float64(values)*float64(b.N)/cpu, "values/cpu-s")
			}
		})
	}
}
