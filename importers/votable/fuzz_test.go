package votable

import (
	"bytes"
	"os"
	"path/filepath"
	"testing"
)

// FuzzReader feeds arbitrary documents to the reader and to Tables: they must
// never panic, must end, and must keep their promises (one cell per column,
// row numbers counting up from 1).
func FuzzReader(f *testing.F) {
	for _, name := range []string{"catalog.vot", "catalog-binary2.vot"} {
		b, err := os.ReadFile(filepath.Join("testdata", name))
		if err != nil {
			f.Fatal(err)
		}
		f.Add(b, "")
		f.Add(b, "2")
	}
	f.Add([]byte(`<VOTABLE><RESOURCE><TABLE><FIELD name="b" datatype="bit" arraysize="*"/><FIELD name="u" datatype="unicodeChar" arraysize="3"/><DATA><BINARY2><STREAM encoding="base64">AAAAAAMgAEEAQgBD</STREAM></BINARY2></DATA></TABLE></RESOURCE></VOTABLE>`), "")
	f.Add([]byte(`<!DOCTYPE x [<!ENTITY a "b">]><VOTABLE/>`), "")
	f.Add([]byte(`<VOTABLE><RESOURCE><TABLE><DATA><FITS><STREAM href="x"/></FITS></DATA></TABLE></RESOURCE></VOTABLE>`), "")
	f.Fuzz(func(t *testing.T, data []byte, table string) {
		opt := Options{Table: table, MaxToken: 1 << 12}
		if ts, err := Tables(bytes.NewReader(data)); err == nil && len(ts) > len(data) {
			t.Fatalf("%d tables from %d bytes", len(ts), len(data))
		}
		rd, err := NewReader(bytes.NewReader(data), opt)
		if err != nil {
			return
		}
		ncol := len(rd.Columns())
		for want := 1; ; want++ {
			cells, n, err := rd.Next()
			if err != nil {
				break
			}
			if len(cells) != ncol || n != want {
				t.Fatalf("row %d: %d cells for %d columns, numbered %d", want, len(cells), ncol, n)
			}
			if want > len(data) && ncol > 0 {
				t.Fatalf("more rows (%d) than input bytes (%d)", want, len(data))
			}
		}
	})
}
