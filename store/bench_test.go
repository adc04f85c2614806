package store

import (
	"context"
	"fmt"
	"path/filepath"
	"runtime"
	"runtime/metrics"
	"testing"
	"time"

	"tidesift/schema"
)

// BenchmarkImport imports about 100,000 invented values (11,112 moons of 10
// planets, nine moon values each, a planet mass on every row) into a file
// catalog: "new" into an empty catalog, "changed" as a second import that
// changes every value (so each one is superseded). It reports values/s.
//
//	go test ./store -run '^$' -bench 'BenchmarkImport$' -benchtime 3x
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

// BenchmarkImportLarge imports 1,000,000 invented values (111,112 moons) into
// an empty file catalog and reports the heap the import itself added at its
// peak (the live heap after each collection, sampled every 10 ms, above the
// live heap holding the request), with and
// without ImportResult.Changes.
//
//	go test ./store -run '^$' -bench BenchmarkImportLarge -benchtime 1x
func BenchmarkImportLarge(b *testing.B) {
	recs := synthRecords(111112, 10, 0)
	values := 0
	for _, r := range recs {
		values += len(r.Params)
	}
	ctx := context.Background()
	for _, omit := range []bool{false, true} {
		b.Run(fmt.Sprintf("omitChanges=%v", omit), func(b *testing.B) {
			var peak uint64
			var cpu float64
			for i := 0; b.Loop(); i++ {
				b.StopTimer()
				s, err := Open(ctx, filepath.Join(b.TempDir(), "large.db"), Options{})
				if err != nil {
					b.Fatal(err)
				}
				runtime.GC()
				base := heapInUse()
				stop := make(chan struct{})
				done := make(chan uint64)
				go func() {
					var max uint64
					t := time.NewTicker(10 * time.Millisecond)
					defer t.Stop()
					for {
						select {
						case <-stop:
							done <- max
							return
						case <-t.C:
							if h := heapInUse(); h > base && h-base > max {
								max = h - base
							}
						}
					}
				}()
				b.StartTimer()
				c0 := cpuSeconds()
				if _, err := s.Import(ctx, ImportRequest{File: "large", Records: recs, OmitChanges: omit}); err != nil {
					b.Fatal(err)
				}
				cpu += cpuSeconds() - c0
				b.StopTimer()
				close(stop)
				peak = max(peak, <-done)
				s.Close()
				b.StartTimer()
			}
			b.ReportMetric(float64(values)*float64(b.N)/b.Elapsed().Seconds(), "values/s")
			if cpu > 0 {
				b.ReportMetric(float64(values)*float64(b.N)/cpu, "values/cpu-s")
			}
			b.ReportMetric(float64(peak)/(1<<20), "peak-extra-heap-MiB")
		})
	}
}

func heapInUse() uint64 {
	s := []metrics.Sample{{Name: "/gc/heap/live:bytes"}}
	metrics.Read(s)
	return s[0].Value.Uint64()
}

// BenchmarkSnapshot reads the latest snapshot of a catalog of about 100,000
// values, and the snapshot as of its first of two revisions.
//
//	go test ./store -run '^$' -bench BenchmarkSnapshot
func BenchmarkSnapshot(b *testing.B) {
	ctx := context.Background()
	s, err := Open(ctx, filepath.Join(b.TempDir(), "snap.db"), Options{})
	if err != nil {
		b.Fatal(err)
	}
	defer s.Close()
	for i, seed := range []float64{0, 0.5} {
		if _, err := s.Import(ctx, ImportRequest{File: fmt.Sprint(i), Records: synthRecords(11112, 10, seed), OmitChanges: true}); err != nil {
			b.Fatal(err)
		}
	}
	for _, rev := range []int64{0, 1} {
		b.Run(fmt.Sprintf("rev=%d", rev), func(b *testing.B) {
			for b.Loop() {
				c, err := s.Snapshot(ctx, rev)
				if err != nil {
					b.Fatal(err)
				}
				if len(c.Moons) != 11112 {
					b.Fatalf("%d moons", len(c.Moons))
				}
			}
		})
	}
	b.Run("diff", func(b *testing.B) {
		for b.Loop() {
			cs, err := s.Diff(ctx, 1, 2)
			if err != nil {
				b.Fatal(err)
			}
			if len(cs) == 0 {
				b.Fatal("no changes")
			}
		}
	})
	b.Run("check", func(b *testing.B) {
		for b.Loop() {
			if _, err := s.Check(ctx); err != nil {
				b.Fatal(err)
			}
		}
	})
}

// BenchmarkImportStream streams invented moons (each with its own planet
// values, ten moons to a planet, every planet its own star) into an empty
// file catalog through ImportStream, at two sizes, and reports the peak live
// heap: it should not grow with the number of moons.
//
//	go test ./store -run '^$' -bench BenchmarkImportStream -benchtime 1x
func BenchmarkImportStream(b *testing.B) {
	ctx := context.Background()
	for _, n := range []int{20000, 100000} {
		b.Run(fmt.Sprintf("moons=%d", n), func(b *testing.B) {
			var peak uint64
			for b.Loop() {
				b.StopTimer()
				s, err := Open(ctx, filepath.Join(b.TempDir(), "stream.db"), Options{})
				if err != nil {
					b.Fatal(err)
				}
				runtime.GC()
				stop, done := make(chan struct{}), make(chan uint64)
				go func() {
					var max uint64
					t := time.NewTicker(10 * time.Millisecond)
					defer t.Stop()
					for {
						select {
						case <-stop:
							done <- max
							return
						case <-t.C:
							max = maxU(max, heapInUse())
						}
					}
				}()
				b.StartTimer()
				_, err = s.ImportStream(ctx, ImportRequest{File: "stream", OmitAdded: true}, func(yield func(*schema.Record) error) error {
					for i := range n {
						pl := i / 10
						r := schema.Record{Row: i + 1, Name: fmt.Sprintf("Stream Moon %d", i), Planet: fmt.Sprintf("Stream Giant %d", pl),
							Star: fmt.Sprintf("Stream Star %d", pl), Source: "invented benchmark row",
							Params: []schema.Param{pSym("mass", 1e20*float64(i+1), 1e18), p("radius", 1e5), p("semi_major_axis", 1e8),
								p("eccentricity", 0.01), p("period", 1e5), p("planet_mass", 1e27*float64(pl+1)), p("star_mass", 2e30)}}
						if err := yield(&r); err != nil {
							return err
						}
					}
					return nil
				})
				if err != nil {
					b.Fatal(err)
				}
				b.StopTimer()
				close(stop)
				peak = maxU(peak, <-done)
				s.Close()
				b.StartTimer()
			}
			b.ReportMetric(float64(n)*float64(b.N)/b.Elapsed().Seconds(), "moons/s")
			b.ReportMetric(float64(peak)/(1<<20), "peak-heap-MiB")
		})
	}
}

func maxU(a, b uint64) uint64 {
	if a > b {
		return a
	}
	return b
}
