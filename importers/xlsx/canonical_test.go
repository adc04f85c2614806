package xlsx

import (
	"io"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"

	"tidesift/importers/csv"
)

// canonicalCSV reads the shared invented catalog that every format's
// fixture carries, with its leading comment lines.
func canonicalCSV(tb testing.TB) (comments, header []string, rows [][]string) {
	tb.Helper()
	path := filepath.Join("..", "testdata", "canonical.csv")
	b, err := os.ReadFile(path)
	if err != nil {
		tb.Fatal(err)
	}
	for _, line := range strings.Split(string(b), "\n") {
		if !strings.HasPrefix(line, "#") {
			break
		}
		comments = append(comments, strings.TrimSpace(strings.TrimPrefix(line, "#")))
	}
	rd, err := csv.NewReader(strings.NewReader(string(b)), csv.Options{})
	if err != nil {
		tb.Fatal(err)
	}
	for _, c := range rd.Columns() {
		header = append(header, c.Name)
	}
	for {
		cells, _, err := rd.Next()
		if err == io.EOF {
			return comments, header, rows
		}
		if err != nil {
			tb.Fatal(err)
		}
		rows = append(rows, append([]string(nil), cells...))
	}
}

// writeCanonical writes the catalog to a workbook: the CSV's comment lines
// as a title block, a blank row, the header, then the rows. A cell that reads
// as a number is stored as a number cell holding the CSV's digits exactly;
// anything else, "--" and NaN included, as text, as a colleague would type it.
func writeCanonical(tb testing.TB, path string) {
	tb.Helper()
	comments, header, rows := canonicalCSV(tb)
	f := excelize.NewFile()
	defer f.Close()
	const sheet = "Catalog"
	if err := f.SetSheetName("Sheet1", sheet); err != nil {
		tb.Fatal(err)
	}
	r := 1
	for _, c := range comments {
		if err := f.SetCellStr(sheet, "A"+strconv.Itoa(r), c); err != nil {
			tb.Fatal(err)
		}
		r++
	}
	r++ // a blank row under the title block
	all := append([][]string{header}, rows...)
	for _, row := range all {
		for j, v := range row {
			if v == "" {
				continue
			}
			ref, _ := excelize.CoordinatesToCellName(j+1, r)
			var err error
			if x, perr := strconv.ParseFloat(v, 64); perr == nil && !strings.EqualFold(v, "nan") && x == x {
				err = f.SetCellDefault(sheet, ref, v) // a number cell with these digits
			} else {
				err = f.SetCellStr(sheet, ref, v)
			}
			if err != nil {
				tb.Fatal(err)
			}
		}
		r++
	}
	if err := f.SaveAs(path); err != nil {
		tb.Fatal(err)
	}
	if err := os.Chmod(path, 0o644); err != nil {
		tb.Fatal(err)
	}
}

// TestCanonicalFixture checks that importers/testdata/canonical.xlsx carries
// the CSV's catalog (regenerate with -update): the header found below the
// title block, and every cell as in the CSV.
func TestCanonicalFixture(t *testing.T) {
	path := filepath.Join("..", "testdata", "canonical.xlsx")
	if *update {
		writeCanonical(t, path)
	}
	comments, header, want := canonicalCSV(t)
	check := func(path string) {
		t.Helper()
		rd := mustOpen(t, path, Options{})
		if rd.HeaderRow() != len(comments)+2 {
			t.Errorf("%s: header found in row %d, want %d", path, rd.HeaderRow(), len(comments)+2)
		}
		var names []string
		for _, c := range rd.Columns() {
			names = append(names, c.Name)
		}
		if strings.Join(names, "|") != strings.Join(header, "|") {
			t.Fatalf("%s: columns %q, want %q", path, names, header)
		}
		rows := readAll(t, rd)
		if len(rows) != len(want) {
			t.Fatalf("%s: %d rows, want %d", path, len(rows), len(want))
		}
		for i, r := range rows {
			if r.n != rd.HeaderRow()+1+i {
				t.Errorf("%s: row %d numbered %d", path, i+1, r.n)
			}
			for j := range header {
				if r.cells[j] != want[i][j] {
					t.Errorf("%s: row %d, %s: %q, want %q", path, i+1, header[j], r.cells[j], want[i][j])
				}
			}
		}
	}
	check(path)
	// The committed workbook is what the writer makes today (compared by
	// content: the zip bytes change from run to run).
	fresh := filepath.Join(t.TempDir(), "canonical.xlsx")
	writeCanonical(t, fresh)
	check(fresh)
}
