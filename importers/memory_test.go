package importers

import (
	"bytes"
	"fmt"
	"runtime"
	"strings"
	"testing"
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
