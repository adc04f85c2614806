package xlsx

import (
	"archive/zip"
	"bytes"
	"compress/flate"
	"errors"
	"flag"
	"io"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"
)

var update = flag.Bool("update", false, "rewrite the generated fixtures under testdata")

type row struct {
	n     int
	cells []string
}

func readAll(tb testing.TB, rd *Reader) []row {
	tb.Helper()
	var out []row
	for {
		cells, n, err := rd.Next()
		if err == io.EOF {
			return out
		}
		if err != nil {
			tb.Fatalf("Next after %d rows: %v", len(out), err)
		}
		out = append(out, row{n, append([]string(nil), cells...)})
	}
}

func mustOpen(tb testing.TB, path string, opt Options) *Reader {
	tb.Helper()
	f, err := os.Open(path)
	if err != nil {
		tb.Fatal(err)
	}
	defer f.Close()
	rd, err := NewReader(f, opt)
	if err != nil {
		tb.Fatal(err)
	}
	tb.Cleanup(func() { rd.Close() })
	return rd
}

func mustSet(tb testing.TB, f *excelize.File, sheet, cell string, v any) {
	tb.Helper()
	if err := f.SetCellValue(sheet, cell, v); err != nil {
		tb.Fatal(err)
	}
}

// writeMoonsWorkbook writes the fixture workbook: a sheet "Moons" with a
// three-row title block, the header in row 4, data in rows 5, 6 and 8 (row 7
// is empty), a number shown with a two-decimal format, and styled but empty
// trailing rows; and a second sheet "Notes".
func writeMoonsWorkbook(tb testing.TB, path string) {
	tb.Helper()
	f := excelize.NewFile()
	defer f.Close()
	if err := f.SetSheetName("Sheet1", "Moons"); err != nil {
		tb.Fatal(err)
	}
	s := "Moons"
	mustSet(tb, f, s, "A1", "Invented moons of Vasha b")
	mustSet(tb, f, s, "A2", "All values invented for tidesift tests")
	mustSet(tb, f, s, "A3", "Prepared 2026-12-01")
	rows := [][]any{
		{"name", "planet", "mass [kg]", "mass_err [kg]", "radius [km]", "eccentricity", "source"},
		{"Vasha b I", "Vasha b", 1.2345678e22, 3e20, 1450, 0.004, "invented"},
		{"Vasha b II", "Vasha b", nil, nil, 610.5, 0.0123, nil},
		nil,
		{" Vasha b III ", "Vasha b", 4.5e19, 2.5e18, 210, 0, "invented"},
	}
	for i, r := range rows {
		for j, v := range r {
			if v == nil {
				continue
			}
			ref, _ := excelize.CoordinatesToCellName(j+1, i+4)
			mustSet(tb, f, s, ref, v)
		}
	}
	style, err := f.NewStyle(&excelize.Style{NumFmt: 2}) // "0.00"
	if err != nil {
		tb.Fatal(err)
	}
	if err := f.SetCellStyle(s, "C5", "C8", style); err != nil {
		tb.Fatal(err)
	}
	if err := f.SetCellStyle(s, "A9", "G12", style); err != nil { // trailing empty rows
		tb.Fatal(err)
	}
	if _, err := f.NewSheet("Notes"); err != nil {
		tb.Fatal(err)
	}
	mustSet(tb, f, "Notes", "A1", "name")
	mustSet(tb, f, "Notes", "B1", "note")
	mustSet(tb, f, "Notes", "A2", "Vasha b I")
	mustSet(tb, f, "Notes", "B2", "invented")
	if err := f.SaveAs(path); err != nil {
		tb.Fatal(err)
	}
}

var wantCols = []string{"name", "planet", "mass [kg]", "mass_err [kg]", "radius [km]", "eccentricity", "source"}

var wantRows = []row{
	{5, []string{"Vasha b I", "Vasha b", "12345678000000000000000", "300000000000000000000", "1450", "0.004", "invented"}},
	{6, []string{"Vasha b II", "Vasha b", "", "", "610.5", "0.0123", ""}},
	{8, []string{"Vasha b III", "Vasha b", "45000000000000000000", "2500000000000000000", "210", "0", "invented"}},
}

func checkMoons(tb testing.TB, rd *Reader) {
	tb.Helper()
	var names []string
	for _, c := range rd.Columns() {
		names = append(names, c.Name)
	}
	if !reflect.DeepEqual(names, wantCols) {
		tb.Errorf("columns = %q, want %q", names, wantCols)
	}
	if rd.HeaderRow() != 4 || rd.Sheet() != "Moons" {
		tb.Errorf("header row %d of sheet %q, want 4 of Moons", rd.HeaderRow(), rd.Sheet())
	}
	if got := readAll(tb, rd); !reflect.DeepEqual(got, wantRows) {
		tb.Errorf("rows:\n got %v\nwant %v", got, wantRows)
	}
}

func TestFixture(t *testing.T) {
	fixture := filepath.Join("testdata", "moons.xlsx")
	if *update {
		writeMoonsWorkbook(t, fixture)
	}
	checkMoons(t, mustOpen(t, fixture, Options{}))
	// A freshly generated workbook reads the same (the zip bytes differ run
	// to run, so the fixture is compared by content).
	fresh := filepath.Join(t.TempDir(), "moons.xlsx")
	writeMoonsWorkbook(t, fresh)
	checkMoons(t, mustOpen(t, fresh, Options{}))
	// Through a reader that is not a file: spooled to a temporary file.
	b, err := os.ReadFile(fixture)
	if err != nil {
		t.Fatal(err)
	}
	rd, err := NewReader(io.MultiReader(bytes.NewReader(b)), Options{TmpDir: t.TempDir()})
	if err != nil {
		t.Fatal(err)
	}
	defer rd.Close()
	checkMoons(t, rd)
}

func TestSheetAndHeaderOptions(t *testing.T) {
	path := filepath.Join("testdata", "moons.xlsx")
	rd := mustOpen(t, path, Options{Sheet: "notes"})
	got := readAll(t, rd)
	if rd.Sheet() != "Notes" || len(rd.Columns()) != 2 || len(got) != 1 || got[0].n != 2 ||
		!reflect.DeepEqual(got[0].cells, []string{"Vasha b I", "invented"}) {
		t.Errorf("sheet %q columns %v rows %v", rd.Sheet(), rd.Columns(), got)
	}
	if !reflect.DeepEqual(rd.Sheets(), []string{"Moons", "Notes"}) {
		t.Errorf("sheets %q", rd.Sheets())
	}
	f, _ := os.Open(path)
	defer f.Close()
	_, err := NewReader(f, Options{Sheet: "Rings"})
	if !errors.Is(err, ErrNoSheet) || !strings.Contains(err.Error(), `"Moons", "Notes"`) {
		t.Errorf("unknown sheet: %v", err)
	}
	// An explicit header row: row 2 makes the title line the header.
	rd = mustOpen(t, path, Options{HeaderRow: 2})
	if c := rd.Columns(); len(c) != 1 || c[0].Name != "All values invented for tidesift tests" {
		t.Errorf("header row 2: %v", c)
	}
	// Row 3 is the last title row; the real header is then data, whose
	// seven cells run past the one-cell header.
	rd = mustOpen(t, path, Options{HeaderRow: 3})
	if _, _, err := rd.Next(); !errors.Is(err, ErrBeyondHeader) || !strings.Contains(err.Error(), "cell B4") {
		t.Errorf("data beyond header: %v", err)
	}
}

// TestFallbackHeader reads a foreign layout with no canonical names: the
// first all-text row of two or more cells is the header.
func TestFallbackHeader(t *testing.T) {
	path := filepath.Join(t.TempDir(), "foreign.xlsx")
	f := excelize.NewFile()
	for ref, v := range map[string]any{
		"A1": "Survey of invented satellites", "A2": "Body", "B2": "Mass (kg)", "C2": "R (km)",
		"A3": "Zel-3a", "B3": 5e20, "C3": 300.0,
	} {
		mustSet(t, f, "Sheet1", ref, v)
	}
	if err := f.SaveAs(path); err != nil {
		t.Fatal(err)
	}
	f.Close()
	rd := mustOpen(t, path, Options{})
	rows := readAll(t, rd)
	if rd.HeaderRow() != 2 || len(rd.Columns()) != 3 || rd.Columns()[1].Name != "Mass (kg)" ||
		len(rows) != 1 || rows[0].n != 3 || rows[0].cells[0] != "Zel-3a" {
		t.Errorf("header %d, columns %v, rows %v", rd.HeaderRow(), rd.Columns(), rows)
	}
	// A sheet of numbers only has no header.
	path2 := filepath.Join(t.TempDir(), "numbers.xlsx")
	f = excelize.NewFile()
	mustSet(t, f, "Sheet1", "A1", 1.0)
	mustSet(t, f, "Sheet1", "B1", 2.0)
	if err := f.SaveAs(path2); err != nil {
		t.Fatal(err)
	}
	f.Close()
	g, _ := os.Open(path2)
	defer g.Close()
	if _, err := NewReader(g, Options{}); !errors.Is(err, ErrNoHeader) {
		t.Errorf("numbers only: %v, want ErrNoHeader", err)
	}
}

func TestLooksCanonical(t *testing.T) {
	for h, want := range map[string]bool{
		"mass [kg]": true, "Mass": true, "mass_err [kg]": true, "radius_err_plus [km]": true,
		"k2_q": true, "eccentricity_min": true, "planet": true, "source": true, "mass_source": true,
		"Mass (kg)": false, "colour": false, "": false, "name_err": false,
	} {
		if got := looksCanonical(h); got != want {
			t.Errorf("looksCanonical(%q) = %v, want %v", h, got, want)
		}
	}
}

// zipOf builds a zip archive in memory; each part is (name, data) or, for a
// raw part, a header and already-compressed bytes.
type part struct {
	name string
	data []byte
	raw  *zip.FileHeader
}

func zipOf(tb testing.TB, parts ...part) []byte {
	tb.Helper()
	var b bytes.Buffer
	zw := zip.NewWriter(&b)
	for _, p := range parts {
		var w io.Writer
		var err error
		if p.raw != nil {
			w, err = zw.CreateRaw(p.raw)
		} else {
			w, err = zw.Create(p.name)
		}
		if err != nil {
			tb.Fatal(err)
		}
		if _, err := w.Write(p.data); err != nil {
			tb.Fatal(err)
		}
	}
	if err := zw.Close(); err != nil {
		tb.Fatal(err)
	}
	return b.Bytes()
}

func deflate(tb testing.TB, data []byte) []byte {
	tb.Helper()
	var b bytes.Buffer
	w, _ := flate.NewWriter(&b, flate.BestCompression)
	w.Write(data)
	w.Close()
	return b.Bytes()
}

// TestZipBombs builds small archives that would unzip to far more than the
// limits, and checks each is refused with a clear error, quickly.
func TestZipBombs(t *testing.T) {
	zeros := make([]byte, 8<<20) // compresses to about 8 KiB
	small := deflate(t, zeros)
	t.Logf("8 MiB of zeros deflate to %d bytes", len(small))
	sheetXML := []byte(`<?xml version="1.0" encoding="UTF-8"?><worksheet xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main"><sheetData/></worksheet>`)
	for _, tc := range []struct {
		name string
		zip  []byte
		opt  Options
		want error
		msg  string
	}{
		{
			// One part declaring 1 TiB: refused from the directory, before any unzipping.
			name: "declared huge part",
			zip: zipOf(t, part{raw: &zip.FileHeader{Name: "xl/worksheets/sheet1.xml", Method: zip.Deflate,
				CompressedSize64: uint64(len(small)), UncompressedSize64: 1 << 40, CRC32: 0}, data: small}),
			want: ErrTooLarge, msg: "zip bomb",
		},
		{
			// Honest parts whose total exceeds the limit.
			name: "total over limit",
			zip:  zipOf(t, part{name: "xl/worksheets/sheet1.xml", data: sheetXML}, part{name: "xl/media/a.bin", data: zeros}, part{name: "xl/media/b.bin", data: zeros}),
			opt:  Options{MaxUnzip: 12 << 20, MaxUnzipXML: 1 << 20},
			want: ErrTooLarge, msg: "12582912 bytes",
		},
		{
			// A part that unzips to more than it declares: Go's zip reader stops
			// after the declared 1 KiB, and the truncated part does not parse.
			name: "lying size",
			zip: zipOf(t, part{raw: &zip.FileHeader{Name: "xl/styles.xml", Method: zip.Deflate,
				CompressedSize64: uint64(len(small)), UncompressedSize64: 1024}, data: small}),
			want: ErrNotXLSX,
		},
		{name: "not a zip", zip: []byte("name,mass [kg]\nVasha b I,1e22\n"), want: ErrNotXLSX},
		{name: "empty", zip: nil, want: ErrNotXLSX},
		{name: "input over limit", zip: zeros, opt: Options{MaxUnzip: 1 << 20}, want: ErrTooLarge, msg: "input is above"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			tc.opt.TmpDir = t.TempDir()
			rd, err := NewReader(bytes.NewReader(tc.zip), tc.opt)
			if err == nil {
				rd.Close()
				t.Fatal("no error")
			}
			if !errors.Is(err, tc.want) || !strings.Contains(err.Error(), tc.msg) {
				t.Errorf("err = %v, want %v containing %q", err, tc.want, tc.msg)
			}
			left, _ := os.ReadDir(tc.opt.TmpDir)
			if len(left) != 0 {
				t.Errorf("temporary files left behind: %v", left)
			}
		})
	}
}

// TestLargeSheetSpillsToDisk reads a sheet larger than MaxUnzipXML, which
// excelize unzips to a temporary file rather than memory.
func TestLargeSheetSpillsToDisk(t *testing.T) {
	if testing.Short() {
		t.Skip("writes a 20k-row workbook")
	}
	path := filepath.Join(t.TempDir(), "big.xlsx")
	f := excelize.NewFile()
	sw, err := f.NewStreamWriter("Sheet1")
	if err != nil {
		t.Fatal(err)
	}
	sw.SetRow("A1", []any{"name", "mass [kg]", "radius [km]", "eccentricity"})
	const n = 20000
	for i := 2; i <= n+1; i++ {
		ref, _ := excelize.CoordinatesToCellName(1, i)
		sw.SetRow(ref, []any{"Invented moon", 1e20 + float64(i), 100.5, 0.01})
	}
	if err := sw.Flush(); err != nil {
		t.Fatal(err)
	}
	if err := f.SaveAs(path); err != nil {
		t.Fatal(err)
	}
	f.Close()
	tmp := t.TempDir()
	rd := mustOpen(t, path, Options{MaxUnzipXML: 64 << 10, TmpDir: tmp})
	if spilled, _ := os.ReadDir(tmp); len(spilled) == 0 {
		t.Error("the sheet was not unzipped to a temporary file")
	}
	rows := readAll(t, rd)
	if len(rows) != n || rows[n-1].n != n+1 {
		t.Fatalf("%d rows, last numbered %d", len(rows), rows[len(rows)-1].n)
	}
	// Next closed the workbook at the end: nothing is left behind.
	if left, _ := os.ReadDir(tmp); len(left) != 0 {
		t.Errorf("temporary files left after the last row: %v", left)
	}
}
