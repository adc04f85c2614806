package json

import (
	"bytes"
	stdjson "encoding/json"
	"flag"
	"io"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"tidesift/importers/csv"
)

var update = flag.Bool("update", false, "rewrite the canonical JSON fixtures from importers/testdata/canonical.csv")

// canonicalCSV reads the shared invented catalog that every format's
// fixture carries.
func canonicalCSV(tb testing.TB) (header []string, rows [][]string) {
	tb.Helper()
	f, err := os.Open(filepath.Join("..", "testdata", "canonical.csv"))
	if err != nil {
		tb.Fatal(err)
	}
	defer f.Close()
	rd, err := csv.NewReader(f, csv.Options{})
	if err != nil {
		tb.Fatal(err)
	}
	for _, c := range rd.Columns() {
		header = append(header, c.Name)
	}
	for {
		cells, _, err := rd.Next()
		if err == io.EOF {
			return header, rows
		}
		if err != nil {
			tb.Fatal(err)
		}
		rows = append(rows, append([]string(nil), cells...))
	}
}

// missing reports a cell that the importers read as a missing value.
func missing(s string) bool {
	return s == "" || s == "--" || strings.EqualFold(s, "nan")
}

// jsonValue is a CSV cell as JSON: a number literal as written, a missing
// marker as null, anything else as a string.
func jsonValue(s string) any {
	if missing(s) {
		return nil
	}
	if _, err := strconv.ParseFloat(s, 64); err == nil && stdjson.Valid([]byte(s)) {
		return stdjson.Number(s)
	}
	return s
}

// encodeCanonical writes the catalog as an array (one element per line) or
// as NDJSON, keys in the CSV's column order.
func encodeCanonical(tb testing.TB, header []string, rows [][]string, ndjson bool) []byte {
	tb.Helper()
	var b bytes.Buffer
	if !ndjson {
		b.WriteString("[\n")
	}
	for i, row := range rows {
		b.WriteByte('{')
		for j, h := range header {
			if j > 0 {
				b.WriteString(", ")
			}
			k, _ := stdjson.Marshal(h)
			v, err := stdjson.Marshal(jsonValue(row[j]))
			if err != nil {
				tb.Fatal(err)
			}
			b.Write(k)
			b.WriteString(": ")
			b.Write(v)
		}
		b.WriteByte('}')
		if !ndjson && i < len(rows)-1 {
			b.WriteByte(',')
		}
		b.WriteByte('\n')
	}
	if !ndjson {
		b.WriteString("]\n")
	}
	return b.Bytes()
}

// TestCanonicalFixtures checks that importers/testdata/canonical.json and
// canonical.ndjson are the CSV's catalog (regenerate with -update) and that
// reading each yields the CSV's columns and cells, missing markers ("--",
// NaN, empty) being null in JSON.
func TestCanonicalFixtures(t *testing.T) {
	header, want := canonicalCSV(t)
	for _, tc := range []struct {
		file   string
		ndjson bool
	}{{"canonical.json", false}, {"canonical.ndjson", true}} {
		t.Run(tc.file, func(t *testing.T) {
			path := filepath.Join("..", "testdata", tc.file)
			gen := encodeCanonical(t, header, want, tc.ndjson)
			if *update {
				if err := os.WriteFile(path, gen, 0o644); err != nil {
					t.Fatal(err)
				}
			}
			committed, err := os.ReadFile(path)
			if err != nil {
				t.Fatalf("%v (run go test -update)", err)
			}
			if !bytes.Equal(committed, gen) {
				t.Errorf("%s differs from canonical.csv: run go test -update", tc.file)
			}
			for _, r := range []io.Reader{bytes.NewReader(committed), noSeek{bytes.NewReader(committed)}} {
				rd, err := NewReader(r, Options{})
				if err != nil {
					t.Fatal(err)
				}
				if got := names(rd); strings.Join(got, "|") != strings.Join(header, "|") {
					t.Fatalf("columns %q, want %q", got, header)
				}
				rows := readAll(t, rd)
				if len(rows) != len(want) {
					t.Fatalf("%d rows, want %d", len(rows), len(want))
				}
				for i, r := range rows {
					for j := range header {
						g, w := r.cells[j], want[i][j]
						if g != w && !(missing(g) && missing(w)) {
							t.Errorf("row %d, %s: %q, want %q", i+1, header[j], g, w)
						}
					}
				}
			}
		})
	}
}
