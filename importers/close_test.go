package importers

import (
	"archive/zip"
	"bytes"
	"errors"
	"fmt"
	"os"
	"strings"
	"testing"

	"tidesift/schema"
)

// TestWarningsOfVOTable checks that a VOTable's note about tables other than
// the one read reaches Result.Warnings, and that choosing a table silences it.
func TestWarningsOfVOTable(t *testing.T) {
	const doc = `<?xml version="1.0" encoding="UTF-8"?>
<!-- invented values -->
<VOTABLE version="1.4" xmlns="http://www.ivoa.net/xml/VOTable/v1.3">
  <RESOURCE>
    <TABLE name="moons">
      <FIELD name="name" datatype="char" arraysize="*"/>
      <FIELD name="planet" datatype="char" arraysize="*"/>
      <DATA><TABLEDATA><TR><TD>Kel</TD><TD>Vorlan</TD></TR></TABLEDATA></DATA>
    </TABLE>
    <TABLE name="rings">
      <FIELD name="name" datatype="char" arraysize="*"/>
      <DATA><TABLEDATA><TR><TD>Outer</TD></TR></TABLEDATA></DATA>
    </TABLE>
  </RESOURCE>
</VOTABLE>
`
	for _, tc := range []struct {
		name, table string
		want        []string // substrings of the one warning; nil: no warning
	}{
		{"first table by default", "", []string{"2 tables", `"moons"`, `"rings"`}},
		{"chosen table", "moons", nil},
	} {
		t.Run(tc.name, func(t *testing.T) {
			res, err := Read("two.vot", strings.NewReader(doc), Options{Table: tc.table})
			if err != nil {
				t.Fatal(err)
			}
			if len(res.Records) != 1 || res.Records[0].Name != "Kel" {
				t.Fatalf("records %+v, want the one moon of table moons", res.Records)
			}
			if tc.want == nil {
				if len(res.Warnings) != 0 {
					t.Errorf("warnings %q, want none", res.Warnings)
				}
				return
			}
			if len(res.Warnings) != 1 {
				t.Fatalf("warnings %q, want one", res.Warnings)
			}
			for _, s := range tc.want {
				if !strings.Contains(res.Warnings[0], s) {
					t.Errorf("warning %q lacks %q", res.Warnings[0], s)
				}
			}
		})
	}
}

// bigWorkbook returns an XLSX whose sheet XML is larger than the xlsx
// reader's in-memory limit (16 MiB), so that the workbook keeps it in a
// temporary file until closed. header is the first row's cells.
func bigWorkbook(tb testing.TB, header ...string) []byte {
	tb.Helper()
	var sheet bytes.Buffer
	sheet.WriteString(`<?xml version="1.0" encoding="UTF-8" standalone="yes"?>` +
		`<worksheet xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main"><sheetData>`)
	cellRow := func(r int, cells ...string) {
		fmt.Fprintf(&sheet, `<row r="%d">`, r)
		for i, c := range cells {
			fmt.Fprintf(&sheet, `<c r="%c%d" t="inlineStr"><is><t>%s</t></is></c>`, 'A'+i, r, c)
		}
		sheet.WriteString(`</row>`)
	}
	cellRow(1, header...)
	for r := 2; sheet.Len() < 17<<20; r++ {
		cellRow(r, fmt.Sprintf("Invented-%d", r), "Vorlan")
	}
	sheet.WriteString(`</sheetData></worksheet>`)
	parts := []struct{ name, data string }{
		{"[Content_Types].xml", `<?xml version="1.0" encoding="UTF-8" standalone="yes"?>` +
			`<Types xmlns="http://schemas.openxmlformats.org/package/2006/content-types">` +
			`<Default Extension="rels" ContentType="application/vnd.openxmlformats-package.relationships+xml"/>` +
			`<Default Extension="xml" ContentType="application/xml"/>` +
			`<Override PartName="/xl/workbook.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.sheet.main+xml"/>` +
			`<Override PartName="/xl/worksheets/sheet1.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.worksheet+xml"/>` +
			`</Types>`},
		{"_rels/.rels", `<?xml version="1.0" encoding="UTF-8" standalone="yes"?>` +
			`<Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships">` +
			`<Relationship Id="rId1" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/officeDocument" Target="xl/workbook.xml"/>` +
			`</Relationships>`},
		{"xl/workbook.xml", `<?xml version="1.0" encoding="UTF-8" standalone="yes"?>` +
			`<workbook xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main" xmlns:r="http://schemas.openxmlformats.org/officeDocument/2006/relationships">` +
			`<sheets><sheet name="Moons" sheetId="1" r:id="rId1"/></sheets></workbook>`},
		{"xl/_rels/workbook.xml.rels", `<?xml version="1.0" encoding="UTF-8" standalone="yes"?>` +
			`<Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships">` +
			`<Relationship Id="rId1" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/worksheet" Target="worksheets/sheet1.xml"/>` +
			`</Relationships>`},
		{"xl/worksheets/sheet1.xml", sheet.String()},
	}
	var b bytes.Buffer
	zw := zip.NewWriter(&b)
	for _, p := range parts {
		w, err := zw.Create(p.name)
		if err != nil {
			tb.Fatal(err)
		}
		if _, err := w.Write([]byte(p.data)); err != nil {
			tb.Fatal(err)
		}
	}
	if err := zw.Close(); err != nil {
		tb.Fatal(err)
	}
	return b.Bytes()
}

// TestReaderClosedOnEarlyStop checks that ReadStream closes the format reader
// however reading ends, so an XLSX whose sheet sits in a temporary file
// leaves none behind: after an error from emit, and after a header problem
// that stops reading before the first row.
func TestReaderClosedOnEarlyStop(t *testing.T) {
	if testing.Short() {
		t.Skip("builds a 17 MiB sheet")
	}
	errStop := errors.New("stop here")
	for _, tc := range []struct {
		name   string
		header []string
		emit   func(*schema.Record) error
		want   error
	}{
		{"emit error", []string{"name", "planet"}, func(*schema.Record) error { return errStop }, errStop},
		{"header problem", []string{"name", "planet", "colour"}, func(*schema.Record) error { return nil }, ErrUnknownColumn},
	} {
		t.Run(tc.name, func(t *testing.T) {
			dir := t.TempDir()
			t.Setenv("TMPDIR", dir) // where the xlsx reader and its workbook put temporary files
			data := bigWorkbook(t, tc.header...)
			_, err := ReadStream("big.xlsx", bytes.NewReader(data), Options{}, tc.emit)
			if !errors.Is(err, tc.want) {
				t.Fatalf("err = %v, want %v", err, tc.want)
			}
			left, err := os.ReadDir(dir)
			if err != nil {
				t.Fatal(err)
			}
			for _, e := range left {
				t.Errorf("temporary file %s left behind", e.Name())
			}
		})
	}
}

// TestJSONKeyOnlyInThirdObject reads JSON through Read (which hands the
// format reader a buffered reader that cannot seek): a key that only the
// third object has is honoured, not refused. Names and values are invented.
func TestJSONKeyOnlyInThirdObject(t *testing.T) {
	const src = `[
{"name": "Kel", "planet": "Vorlan"},
{"name": "Ara", "planet": "Vorlan"},
{"name": "Ossa", "planet": "Vorlan", "eccentricity": 0.012},
{"name": "Tiv", "planet": "Vorlan"}
]`
	res, err := Read("moons.json", strings.NewReader(src), Options{})
	if err != nil {
		t.Fatal(err)
	}
	if len(res.Records) != 4 {
		t.Fatalf("%d records, want 4", len(res.Records))
	}
	for i, r := range res.Records {
		want := 0
		if i == 2 {
			want = 1
		}
		if len(r.Params) != want {
			t.Errorf("record %d (%s): %d params, want %d", i+1, r.Name, len(r.Params), want)
		}
	}
	if p := res.Records[2].Params; len(p) == 1 && (p[0].Key != "eccentricity" || p[0].Value != 0.012) {
		t.Errorf("third record's param %+v, want eccentricity 0.012", p[0])
	}
}
