package xlsx

import (
	"bytes"
	"os"
	"path/filepath"
	"testing"
	"time"
)

// FuzzReader feeds arbitrary bytes (mostly mutated workbooks) to the reader,
// with small unzip limits: it must never panic, must end, and must keep its
// promises (one cell per column, sheet row numbers increasing).
func FuzzReader(f *testing.F) {
	b, err := os.ReadFile(filepath.Join("testdata", "moons.xlsx"))
	if err != nil {
		f.Fatal(err)
	}
	f.Add(b, 0)
	f.Add(b, 4)
	f.Add([]byte("PK\x03\x04"), 0)
	f.Fuzz(func(t *testing.T, data []byte, header int) {
		if header < 0 || header > 1000 {
			return
		}
		tm := time.AfterFunc(10*time.Second, func() { panic("FuzzReader: one input took over 10 s") })
		defer tm.Stop()
		tmp := t.TempDir()
		rd, err := NewReader(bytes.NewReader(data), Options{HeaderRow: header, MaxUnzip: 4 << 20, MaxUnzipXML: 1 << 20, TmpDir: tmp})
		if err != nil {
			return
		}
		defer rd.Close()
		ncol, last := len(rd.Columns()), rd.HeaderRow()
		for {
			cells, n, err := rd.Next()
			if err != nil {
				break
			}
			if len(cells) != ncol || n <= last {
				t.Fatalf("row %d after %d: %d cells for %d columns", n, last, len(cells), ncol)
			}
			last = n
		}
	})
}
