package xlsx

import (
	"io"
	"os"
	"path/filepath"
	"testing"
	"time"

	"github.com/xuri/excelize/v2"
)

// BenchmarkSheet reads a 20k-row, 12-column invented sheet from a file.
func BenchmarkSheet(b *testing.B) {
	const n = 20000
	path := filepath.Join(b.TempDir(), "bench.xlsx")
	f := excelize.NewFile()
	sw, err := f.NewStreamWriter("Sheet1")
	if err != nil {
		b.Fatal(err)
	}
	head := []any{"name", "planet"}
	for k := range 10 {
		head = append(head, "v"+string(rune('a'+k))+" [kg]")
	}
	sw.SetRow("A1", head)
	for i := 2; i <= n+1; i++ {
		row := []any{"Invented moon", "Vasha b"}
		for k := range 10 {
			row = append(row, float64(i*k)*1.37e19)
		}
		ref, _ := excelize.CoordinatesToCellName(1, i)
		sw.SetRow(ref, row)
	}
	if err := sw.Flush(); err != nil {
		b.Fatal(err)
	}
	if err := f.SaveAs(path); err != nil {
		b.Fatal(err)
	}
	f.Close()
	b.ReportAllocs()
	start := time.Now()
	for b.Loop() {
		fh, err := os.Open(path)
		if err != nil {
			b.Fatal(err)
		}
		rd, err := NewReader(fh, Options{HeaderRow: 1})
		if err != nil {
			b.Fatal(err)
		}
		rows := 0
		for {
			_, _, err := rd.Next()
			if err == io.EOF {
				break
			}
			if err != nil {
				b.Fatal(err)
			}
			rows++
		}
		fh.Close()
		if rows != n {
			b.Fatalf("%d rows", rows)
		}
	}
	b.ReportMetric(float64(n*b.N)/time.Since(start).Seconds(), "rows/s")
}
