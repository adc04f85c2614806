package votable

import (
	"bytes"
	"encoding/xml"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"tidesift/importers/csv"
	"tidesift/schema"
)

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

// splitUnit splits a canonical header "mass [kg]" into name and unit.
func splitUnit(h string) (name, unit string) {
	if i := strings.IndexByte(h, '['); i > 0 && strings.HasSuffix(h, "]") {
		return strings.TrimSpace(h[:i]), strings.TrimSpace(h[i+1 : len(h)-1])
	}
	return h, ""
}

// numericColumn reports whether a canonical column holds numbers: a catalog
// key or one of its uncertainty companions (not a _source).
func numericColumn(name string) bool {
	for _, s := range []string{"_err_plus", "_err_minus", "_err", "_min", "_max", "_factor"} {
		if base, ok := strings.CutSuffix(name, s); ok {
			name = base
			break
		}
	}
	_, ok := schema.LookupKey(name)
	return ok
}

// ucdFor gives a column its UCD (IVOA UCD1+ words; the choices are common
// practice for these quantities), "" where none fits.
func ucdFor(name string) string {
	prefix := ""
	for s, u := range map[string]string{"_err_plus": "stat.error", "_err_minus": "stat.error", "_err": "stat.error", "_min": "stat.min", "_max": "stat.max"} {
		if base, ok := strings.CutSuffix(name, s); ok {
			name, prefix = base, u+";"
			break
		}
	}
	u := map[string]string{
		"name": "meta.id;meta.main", "mass": "phys.mass", "radius": "phys.size.radius",
		"semi_major_axis": "phys.size.smajAxis", "eccentricity": "src.orbital.eccentricity",
		"period": "time.period.revolution", "density": "phys.density", "bond_albedo": "phys.albedo",
		"planet_mass": "phys.mass", "planet_radius": "phys.size.radius",
	}[name]
	if u == "" {
		return ""
	}
	return prefix + u
}

func xmlText(s string) string {
	var b bytes.Buffer
	xml.EscapeText(&b, []byte(s))
	return b.String()
}

// encodeCanonical writes the catalog as a VOTable 1.4 TABLEDATA document: one
// FIELD per CSV column, the "[unit]" of the header as the FIELD's unit,
// double for numeric columns and char for text; a missing value is an empty
// TD, except NaN, which a double column keeps as VOTable's float null.
func encodeCanonical(header []string, rows [][]string) []byte {
	var b bytes.Buffer
	b.WriteString(`<?xml version="1.0" encoding="UTF-8"?>
<!-- Invented moons for tidesift's importer tests, the same catalog as
     canonical.csv (generated from it by the votable tests: go test -update).
     Every name and value here is made up; none describes a real body. -->
<VOTABLE version="1.4" xmlns="http://www.ivoa.net/xml/VOTable/v1.3">
  <RESOURCE name="canonical">
    <TABLE name="moons">
`)
	numeric := make([]bool, len(header))
	for i, h := range header {
		name, unit := splitUnit(h)
		numeric[i] = numericColumn(name)
		dt := `datatype="char" arraysize="*"`
		if numeric[i] {
			dt = `datatype="double"`
		}
		fmt.Fprintf(&b, `      <FIELD name=%q %s`, name, dt)
		if unit != "" {
			fmt.Fprintf(&b, ` unit=%q`, unit)
		}
		if u := ucdFor(name); u != "" {
			fmt.Fprintf(&b, ` ucd=%q`, u)
		}
		b.WriteString("/>\n")
	}
	b.WriteString("      <DATA><TABLEDATA>\n")
	for _, row := range rows {
		b.WriteString("        <TR>")
		for i, c := range row {
			if c == "--" || (!numeric[i] && strings.EqualFold(c, "nan")) {
				c = ""
			}
			if c == "" {
				b.WriteString("<TD/>")
				continue
			}
			b.WriteString("<TD>" + xmlText(c) + "</TD>")
		}
		b.WriteString("</TR>\n")
	}
	b.WriteString("      </TABLEDATA></DATA>\n    </TABLE>\n  </RESOURCE>\n</VOTABLE>\n")
	return b.Bytes()
}

// TestCanonicalFixture checks that importers/testdata/canonical.vot is the
// CSV's catalog (regenerate with -update) and that reading it yields the
// CSV's cells, every missing marker ("--", NaN, empty) reading as missing,
// with the header's units as FIELD units.
func TestCanonicalFixture(t *testing.T) {
	header, want := canonicalCSV(t)
	path := filepath.Join("..", "testdata", "canonical.vot")
	gen := encodeCanonical(header, want)
	if *update {
		if err := os.WriteFile(path, gen, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	committed := readFile(t, path)
	if !bytes.Equal(committed, gen) {
		t.Errorf("canonical.vot differs from canonical.csv: run go test -update")
	}
	rd, rows := mustRead(t, committed, Options{})
	cols := rd.Columns()
	if len(cols) != len(header) {
		t.Fatalf("%d columns, want %d", len(cols), len(header))
	}
	for i, c := range cols {
		name, unit := splitUnit(header[i])
		if c.Name != name || c.Unit != unit {
			t.Errorf("column %d: %q [%s], want %q [%s]", i+1, c.Name, c.Unit, name, unit)
		}
	}
	if len(rows) != len(want) {
		t.Fatalf("%d rows, want %d", len(rows), len(want))
	}
	missing := func(s string) bool { return s == "" || s == "--" || strings.EqualFold(s, "nan") }
	for i, r := range rows {
		for j := range header {
			g, w := r.cells[j], want[i][j]
			if g != w && !(missing(g) && missing(w)) {
				t.Errorf("row %d, %s: %q, want %q", i+1, header[j], g, w)
			}
		}
	}
}

func readFile(tb testing.TB, path string) []byte {
	tb.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		tb.Fatalf("%v (run go test -update)", err)
	}
	return b
}
