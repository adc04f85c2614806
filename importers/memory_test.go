package importers

import (
	"bytes"
	"flag"
	"fmt"
	"os"
	"runtime"
	"strings"
	"testing"

	"tidesift/schema"
)

// TestRecordsDoNotPinLines checks that kept records hold their own small
// strings, not the lines they came from: each row carries 2 KB of digits
// that only become one float64.
func TestRecordsDoNotPinLines(t *testing.T) {
	const n = 5000
	long := "1." + strings.Repeat("0", 2000)
	var b bytes.Buffer
	b.WriteString("name,planet,star,source,eccentricity\n")
	for i := range n {
		fmt.Fprintf(&b, "Moon-%d,Planet-%d,Star-%d,Invented source %d,%s\n", i, i/8, i/64, i/100, strings.Replace(long, "1.", "0.", 1))
	}
	data := b.Bytes()
	var before, after runtime.MemStats
	runtime.GC()
	runtime.ReadMemStats(&before)
	res, err := Read("long.csv", bytes.NewReader(data), Options{})
	if err != nil {
		t.Fatal(err)
	}
	runtime.GC()
	runtime.ReadMemStats(&after)
	perRow := (float64(after.HeapAlloc) - float64(before.HeapAlloc)) / n
	if len(res.Records) != n {
		t.Fatalf("%d records", len(res.Records))
	}
	// A record with one param is ~170 B + 120 B + its name; a pinned line
	// would add 2 KB.
	if perRow > 800 {
		t.Errorf("%.0f bytes of heap per kept record; the lines (2 KB each) seem to be pinned", perRow)
	}
	t.Logf("%.0f bytes of heap per kept record", perRow)
	runtime.KeepAlive(res)
	runtime.KeepAlive(data)
}

var streamFile = flag.String("stream-file", "", "canonical CSV for BenchmarkStreamHeap (\"\" skips it), e.g. one written by bench/gencsv")

// BenchmarkStreamHeap reads -stream-file through ReadStream, records
// discarded, and reports the largest live heap (after a forced GC, every
// 100,000 rows and at the end, while the reader still holds its cross-row
// state) as live-MiB and live-B/row. The heap before the read is subtracted.
//
//	go run ./bench/gencsv -n 1000000 -o bench/out/moons-1000000.csv
//	go test ./importers -run '^$' -bench StreamHeap -benchtime 1x -stream-file ../bench/out/moons-1000000.csv
func BenchmarkStreamHeap(b *testing.B) {
	if *streamFile == "" {
		b.Skip("set -stream-file to run")
	}
	for b.Loop() {
		var m runtime.MemStats
		runtime.GC()
		runtime.ReadMemStats(&m)
		base := m.HeapAlloc
		f, err := os.Open(*streamFile)
		if err != nil {
			b.Fatal(err)
		}
		rows := 0
		peak := uint64(0)
		sample := func() {
			runtime.GC()
			runtime.ReadMemStats(&m)
			peak = max(peak, m.HeapAlloc-min(base, m.HeapAlloc))
		}
		var last *schema.Record
		_, err = ReadStream(*streamFile, f, Options{}, func(rec *schema.Record) error {
			rows++
			last = rec
			if rows%100_000 == 0 {
				sample()
			}
			return nil
		})
		f.Close()
		if err != nil {
			b.Fatal(err)
		}
		if rows == 0 || last == nil {
			b.Fatal("no rows read")
		}
		b.ReportMetric(float64(peak)/(1<<20), "live-MiB")
		b.ReportMetric(float64(peak)/float64(rows), "live-B/row")
		b.ReportMetric(float64(rows), "rows")
	}
}
