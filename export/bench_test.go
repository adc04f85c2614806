package export

import (
	"io"
	"runtime"
	"testing"
)

// BenchmarkWorkbook10k writes the review workbook of 10,000 invented targets
// (15 inputs and 8 drivers each). The goal is at most 5 s and 300 MiB beyond
// the ranking; b.ReportMetric adds the heap the writer obtained from the
// system and the bytes it allocated.
//
//	go test ./export -run '^$' -bench Workbook10k -benchtime 3x
//
// Peak resident memory, against the baseline of building the Result alone:
//
//	go test -c -o export.test ./export
//	/usr/bin/time -v ./export.test -test.run '^$' -test.bench '^BenchmarkBaselineResult10k$' -test.benchtime 1x
//	/usr/bin/time -v ./export.test -test.run '^$' -test.bench '^BenchmarkWorkbook10k$' -test.benchtime 1x
//
// Measured on the project's 2-core machine (other jobs running, load ≈ 2.7):
// 3.2–3.9 s per workbook (2.9 s user + 0.5 s system CPU), 217–224 MB peak RSS
// against 57 MB for the Result alone, i.e. about 165 MB beyond the ranking;
// heap obtained from the system grew by 156–164 MiB.
func BenchmarkWorkbook10k(b *testing.B) {
	r := syntheticResult(10_000)
	info := testInfo(nil)
	runtime.GC()
	var before, after runtime.MemStats
	runtime.ReadMemStats(&before)
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		if err := WriteWorkbook(io.Discard, r, info); err != nil {
			b.Fatal(err)
		}
	}
	b.StopTimer()
	runtime.ReadMemStats(&after)
	b.ReportMetric(float64(after.HeapSys-before.HeapSys)/(1<<20), "MiB-heapsys-growth")
	b.ReportMetric(float64(after.TotalAlloc-before.TotalAlloc)/float64(b.N)/(1<<20), "MiB-alloc/op")
}

// BenchmarkCSV10k and BenchmarkJSON10k give the other writers' cost for scale.
func BenchmarkCSV10k(b *testing.B) {
	r := syntheticResult(10_000)
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		if err := WriteCSV(io.Discard, r); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkJSON10k(b *testing.B) {
	r := syntheticResult(10_000)
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		if err := WriteJSON(io.Discard, r); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkBaselineResult10k only builds the synthetic 10,000-target Result:
// run under /usr/bin/time -v beside BenchmarkWorkbook10k, its peak resident
// memory is the baseline the workbook's memory is measured against.
func BenchmarkBaselineResult10k(b *testing.B) {
	for i := 0; i < b.N; i++ {
		r := syntheticResult(10_000)
		if len(r.Targets) != 10_000 {
			b.Fatal("wrong size")
		}
	}
}
