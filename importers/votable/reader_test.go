package votable

import (
	"bytes"
	"encoding/base64"
	"errors"
	"math"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"

	"tidesift/importers/table"
)

func readFixture(tb testing.TB, name string) []byte {
	tb.Helper()
	b, err := os.ReadFile(filepath.Join("testdata", name))
	if err != nil {
		tb.Fatal(err)
	}
	return b
}

var wantMoons = [][]string{
	{"Vasha b I", "1.2e22", "3e20", "1450", "0.004", "1"},
	{"Vasha b II", "", "", "610.5", "", ""},
	{"Vasha b III & co", "4.5E19", "2.5e18", "210", "0.0123", ""},
}

// TestCatalogVOTable14 reads the fixture written after the structure of the
// IVOA VOTable 1.4 Recommendation: nested DESCRIPTION, INFO, COOSYS, PARAM and
// GROUP are passed over; units, UCDs and datatypes come through; an empty TD,
// a VALUES null and a NaN are missing.
func TestCatalogVOTable14(t *testing.T) {
	rd, rows := mustRead(t, readFixture(t, "catalog.vot"), Options{})
	if rd.Version() != "1.4" {
		t.Errorf("version = %q, want 1.4", rd.Version())
	}
	wantCols := []table.Column{
		{Name: "name", UCD: "meta.id;meta.main", Datatype: "char", Description: "moon name"},
		{Name: "mass", Unit: "kg", UCD: "phys.mass", Datatype: "double"},
		{Name: "mass_err", Unit: "kg", UCD: "stat.error;phys.mass", Datatype: "double"},
		{Name: "radius", Unit: "km", UCD: "phys.size.radius", Datatype: "float"},
		{Name: "ecc", UCD: "src.orbital.eccentricity", Datatype: "double"},
		{Name: "flag", Datatype: "int", Description: "quality flag; -999 when unset"},
	}
	if !reflect.DeepEqual(rd.Columns(), wantCols) {
		t.Errorf("columns:\n got %+v\nwant %+v", rd.Columns(), wantCols)
	}
	if len(rows) != len(wantMoons) {
		t.Fatalf("got %d rows, want %d", len(rows), len(wantMoons))
	}
	for i, r := range rows {
		if r.n != i+1 {
			t.Errorf("row %d numbered %d", i, r.n)
		}
		if !reflect.DeepEqual(r.cells, wantMoons[i]) {
			t.Errorf("TR %d: %q, want %q", i+1, r.cells, wantMoons[i])
		}
	}
	ti := rd.Table()
	if ti.Name != "moons" || ti.ID != "t_moons" || ti.Resource != "vasha" || ti.Fields != 6 ||
		ti.Serialization != "TABLEDATA" || ti.Description != "Moons of Vasha b (invented)" {
		t.Errorf("table info = %+v", ti)
	}
	if w := rd.Warnings(); len(w) != 1 || !strings.Contains(w[0], `2 tables (1 "moons" (ID t_moons), 2 "planets" (ID t_planets))`) {
		t.Errorf("warnings = %q, want one naming both tables", w)
	}
}

func TestSelectTable(t *testing.T) {
	src := readFixture(t, "catalog.vot")
	for _, sel := range []string{"planets", "t_planets", "2"} {
		rd, rows := mustRead(t, src, Options{Table: sel})
		if got := rd.Columns(); len(got) != 2 || got[1].Unit != "jupiterMass" {
			t.Errorf("%s: columns %+v", sel, got)
		}
		if len(rows) != 1 || !reflect.DeepEqual(rows[0].cells, []string{"Vasha b", "1.3"}) {
			t.Errorf("%s: rows %v", sel, rows)
		}
		if len(rd.Warnings()) != 0 {
			t.Errorf("%s: warnings %q for an explicit choice", sel, rd.Warnings())
		}
	}
	_, err := NewReader(bytes.NewReader(src), Options{Table: "rings"})
	if !errors.Is(err, ErrTableNotFound) || !strings.Contains(err.Error(), `1 "moons" (ID t_moons), 2 "planets"`) {
		t.Errorf("unknown table: err = %v, want ErrTableNotFound listing the tables", err)
	}
}

func TestTables(t *testing.T) {
	ts, err := Tables(bytes.NewReader(readFixture(t, "catalog.vot")))
	if err != nil {
		t.Fatal(err)
	}
	want := []TableInfo{
		{Index: 1, Name: "moons", ID: "t_moons", Resource: "vasha", Description: "Moons of Vasha b (invented)", Fields: 6, Serialization: "TABLEDATA"},
		{Index: 2, Name: "planets", ID: "t_planets", Resource: "vasha", Fields: 2, Serialization: "TABLEDATA"},
	}
	if !reflect.DeepEqual(ts, want) {
		t.Errorf("Tables:\n got %+v\nwant %+v", ts, want)
	}
}

var moonFields = []wfield{
	{name: "name", datatype: "char", arraysize: "*", ucd: "meta.id;meta.main"},
	{name: "mass", datatype: "double", unit: "kg", ucd: "phys.mass"},
	{name: "mass_err", datatype: "double", unit: "kg", ucd: "stat.error;phys.mass"},
	{name: "radius", datatype: "float", unit: "km", ucd: "phys.size.radius"},
	{name: "ecc", datatype: "double", ucd: "src.orbital.eccentricity"},
	{name: "flag", datatype: "int", null: "-999"},
}

var moonRows = [][]any{
	{"Vasha b I", 1.2e22, 3e20, 1450.0, 0.004, int64(1)},
	{"Vasha b II", nil, nil, 610.5, nil, int64(-999)},
	{"Vasha b III & co", 4.5e19, 2.5e18, 210.0, 0.0123, nil},
}

// TestBinary2Fixture checks the committed BINARY2 fixture against the test
// writer, then reads it: the same cells as the TABLEDATA fixture, with nulls
// from the null flags, from VALUES null and from NaN.
func TestBinary2Fixture(t *testing.T) {
	doc := binaryDoc(t, moonFields, moonRows, true)
	golden(t, "catalog-binary2.vot", doc)
	rd, rows := mustRead(t, readFixture(t, "catalog-binary2.vot"), Options{})
	if rd.Table().Serialization != "BINARY2" {
		t.Errorf("serialization %q", rd.Table().Serialization)
	}
	if len(rows) != len(wantMoons) {
		t.Fatalf("got %d rows, want %d", len(rows), len(wantMoons))
	}
	for i, r := range rows {
		if r.n != i+1 {
			t.Errorf("row %d numbered %d", i, r.n)
		}
		for j := range r.cells {
			if !sameCell(r.cells[j], wantMoons[i][j]) {
				t.Errorf("row %d, %s: %q, want %q", i+1, moonFields[j].name, r.cells[j], wantMoons[i][j])
			}
		}
	}
	// BINARY (no null flags): a null double must be NaN, and is missing.
	rowsNoFlags := [][]any{{"Vasha b I", 1.2e22, 3e20, 1450.0, 0.004, int64(1)}}
	_, rows = mustRead(t, binaryDoc(t, moonFields, rowsNoFlags, false), Options{})
	if len(rows) != 1 || !sameCell(rows[0].cells[1], "1.2e22") || rows[0].cells[0] != "Vasha b I" {
		t.Errorf("BINARY rows %v", rows)
	}
}

func TestBinaryDatatypes(t *testing.T) {
	fields := []wfield{
		{name: "b", datatype: "boolean"},
		{name: "u8", datatype: "unsignedByte"},
		{name: "i16", datatype: "short"},
		{name: "i32", datatype: "int"},
		{name: "i64", datatype: "long"},
		{name: "f32", datatype: "float"},
		{name: "f64", datatype: "double"},
		{name: "c8", datatype: "char", arraysize: "8"},
		{name: "cv", datatype: "char", arraysize: "*"},
		{name: "uc", datatype: "unicodeChar", arraysize: "6"},
		{name: "ucv", datatype: "unicodeChar", arraysize: "*"},
		{name: "vec", datatype: "double", arraysize: "3"},
		{name: "vvec", datatype: "float", arraysize: "2x*"},
	}
	rows := [][]any{
		{true, int64(255), int64(-32768), int64(-2147483648), int64(-9007199254740993), 0.1, -1.5e-300,
			"Vasha", "a longer name, variable", "Ωmega", "ταυ é", []float64{1, 2.5, -3}, []float64{0.5, 0.25, 4, 8}},
		{nil, nil, nil, nil, nil, nil, nil, nil, nil, nil, nil, nil, nil},
		{false, int64(0), int64(7), int64(42), int64(1), math.NaN(), 2.0, "12345678", "", "", "", []float64{0, 0, 0}, []float64{}},
	}
	want := [][]string{
		{"T", "255", "-32768", "-2147483648", "-9007199254740993", "0.1", "-1.5e-300",
			"Vasha", "a longer name, variable", "Ωmega", "ταυ é", "1 2.5 -3", "0.5 0.25 4 8"},
		{"", "", "", "", "", "", "", "", "", "", "", "", ""},
		{"F", "0", "7", "42", "1", "", "2", "12345678", "", "", "", "0 0 0", ""},
	}
	_, got := mustRead(t, binaryDoc(t, fields, rows, true), Options{})
	if len(got) != len(want) {
		t.Fatalf("got %d rows", len(got))
	}
	for i := range want {
		if !reflect.DeepEqual(got[i].cells, want[i]) {
			t.Errorf("row %d:\n got %q\nwant %q", i+1, got[i].cells, want[i])
		}
	}
}

func TestBinaryBitAndComplex(t *testing.T) {
	// A bit array of 10 (two bytes) and a doubleComplex, written by hand.
	raw := []byte{0x00, 0b10100000, 0b01000000, // flags, then bits 1010000001
		0x3F, 0xF0, 0, 0, 0, 0, 0, 0, 0xC0, 0, 0, 0, 0, 0, 0, 0} // 1 + (-2)i
	doc := `<VOTABLE><RESOURCE><TABLE><FIELD name="bits" datatype="bit" arraysize="10"/>` +
		`<FIELD name="z" datatype="doubleComplex"/><DATA><BINARY2><STREAM encoding="base64">` +
		base64.StdEncoding.EncodeToString(raw) + `</STREAM></BINARY2></DATA></TABLE></RESOURCE></VOTABLE>`
	_, rows := mustRead(t, []byte(doc), Options{})
	if len(rows) != 1 || !reflect.DeepEqual(rows[0].cells, []string{"1010000001", "1 -2"}) {
		t.Errorf("rows = %v", rows)
	}
}

func TestNamespaces(t *testing.T) {
	body := `<RESOURCE><TABLE><FIELD name="name" datatype="char" arraysize="*"/><DATA><TABLEDATA><TR><TD>A</TD></TR></TABLEDATA></DATA></TABLE></RESOURCE>`
	for _, root := range []string{
		`<VOTABLE version="1.3" xmlns="http://www.ivoa.net/xml/VOTable/v1.3">%s</VOTABLE>`,
		`<VOTABLE version="1.5" xmlns="http://www.ivoa.net/xml/VOTable/v1.3">%s</VOTABLE>`,
		`<VOTABLE>%s</VOTABLE>`,
		`<v:VOTABLE xmlns:v="http://www.ivoa.net/xml/VOTable/v1.3">%s</v:VOTABLE>`,
	} {
		src := strings.Replace(root, "%s", body, 1)
		if strings.HasPrefix(root, "<v:") {
			src = strings.Replace(root, "%s", strings.NewReplacer("</", "</v:", "<", "<v:").Replace(body), 1)
		}
		_, rows := mustRead(t, []byte(src), Options{})
		if len(rows) != 1 || rows[0].cells[0] != "A" {
			t.Errorf("%s: rows %v", src, rows)
		}
	}
}

// TestSkipsLargeStreamOfOtherTable reads the second table past a first one
// whose base64 stream is far larger than the token limit.
func TestSkipsLargeStreamOfOtherTable(t *testing.T) {
	big := strings.Repeat("QUJD", 1<<20) // 4 MiB of base64
	src := `<VOTABLE><RESOURCE><TABLE name="big"><FIELD name="x" datatype="char" arraysize="3"/><DATA><BINARY><STREAM encoding="base64">` +
		big + `</STREAM></BINARY></DATA></TABLE><TABLE name="small"><FIELD name="name" datatype="char" arraysize="*"/>` +
		`<DATA><TABLEDATA><TR><TD>A</TD></TR></TABLEDATA></DATA></TABLE></RESOURCE></VOTABLE>`
	_, rows := mustRead(t, []byte(src), Options{Table: "small"})
	if len(rows) != 1 || rows[0].cells[0] != "A" {
		t.Errorf("rows %v", rows)
	}
	// And reading the large stream itself works too (1 MiB rows of "ABC").
	_, rows = mustRead(t, []byte(src), Options{Table: "big"})
	if len(rows) != 1<<20 || rows[len(rows)-1].cells[0] != "ABC" {
		t.Errorf("%d rows", len(rows))
	}
}

func TestErrors(t *testing.T) {
	tbl := func(data string) string {
		return `<VOTABLE><RESOURCE><TABLE name="t"><FIELD name="name" datatype="char" arraysize="*"/><FIELD name="x" datatype="double"/><DATA>` +
			data + `</DATA></TABLE></RESOURCE></VOTABLE>`
	}
	for _, tc := range []struct {
		name, src string
		want      error
		msg       string
	}{
		{"empty", "", ErrNotVOTable, "empty"},
		{"html", "<html><body/></html>", ErrNotVOTable, "<html>"},
		{"no table", "<VOTABLE><RESOURCE/></VOTABLE>", ErrNoTable, ""},
		{"doctype", `<?xml version="1.0"?><!DOCTYPE VOTABLE SYSTEM "x.dtd"><VOTABLE/>`, ErrDeclaration, "line 1"},
		{"entity bomb", "<?xml version=\"1.0\"?>\n<!DOCTYPE lolz [<!ENTITY lol \"lol\"><!ENTITY lol2 \"&lol;&lol;&lol;\">]>\n<VOTABLE>&lol2;</VOTABLE>", ErrDeclaration, "line 2"},
		{"undefined entity", "<VOTABLE>&lol;</VOTABLE>", nil, "entity"},
		{"fits", tbl(`<FITS><STREAM encoding="base64">AAAA</STREAM></FITS>`), ErrUnsupported, "FITS serialisation"},
		{"href", tbl(`<BINARY2><STREAM href="http://example.org/data.bin"/></BINARY2>`), ErrRemoteStream, "example.org"},
		{"file href", tbl(`<BINARY><STREAM href="file:///etc/passwd"/></BINARY>`), ErrRemoteStream, ""},
		{"gzip", tbl(`<BINARY2><STREAM encoding="gzip">AAAA</STREAM></BINARY2>`), ErrUnsupported, "gzip"},
		{"bad base64", tbl(`<BINARY2><STREAM encoding="base64">!!!!</STREAM></BINARY2>`), ErrBadStream, ""},
		{"truncated row", tbl(`<BINARY2><STREAM encoding="base64">AAAAAA==</STREAM></BINARY2>`), ErrBadStream, "row 1"},
		{"huge array length", tbl(`<BINARY2><STREAM encoding="base64">AP////8=</STREAM></BINARY2>`), ErrBadStream, "array length"},
		{"too many TD", tbl(`<TABLEDATA><TR><TD>a</TD><TD>1</TD><TD>2</TD></TR></TABLEDATA>`), ErrBadRow, "TR 1"},
		{"element in TD", tbl(`<TABLEDATA><TR><TD><b>a</b></TD></TR></TABLEDATA>`), ErrBadRow, "inside a TD"},
		{"truncated", tbl(`<TABLEDATA><TR><TD>a</TD>`)[:90], nil, "EOF"},
		{"mismatched", tbl(`<TABLEDATA><TR><TD>a</TR></TD></TABLEDATA>`), nil, "element <TD>"},
		{"text after root", "<VOTABLE><RESOURCE><TABLE/></RESOURCE></VOTABLE>junk", nil, "after the VOTABLE"},
		{"long text", tbl(`<TABLEDATA><TR><TD>` + strings.Repeat("x", 2<<20) + `</TD></TR></TABLEDATA>`), ErrTooLarge, "text longer than 1048576"},
		{"long cdata", tbl(`<TABLEDATA><TR><TD><![CDATA[` + strings.Repeat("<a>", 1<<20) + `]]></TD></TR></TABLEDATA>`), ErrTooLarge, "CDATA"},
		{"long comment", "<VOTABLE><!--" + strings.Repeat("<>", 1<<20) + "--></VOTABLE>", ErrTooLarge, "comment"},
		{"long attribute", `<VOTABLE a="` + strings.Repeat(">", 2<<20) + `"/>`, ErrTooLarge, "tag"},
		{"deep", "<VOTABLE>" + strings.Repeat("<a>", 100000), ErrTooLarge, "deeper than 64"},
		{"latin1", `<?xml version="1.0" encoding="ISO-8859-1"?><VOTABLE/>`, nil, "ISO-8859-1"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			err := readErr(tc.src, Options{})
			if err == nil {
				t.Fatal("no error")
			}
			if tc.want != nil && !errors.Is(err, tc.want) {
				t.Errorf("err = %v, want %v", err, tc.want)
			}
			if !strings.Contains(err.Error(), tc.msg) {
				t.Errorf("err = %q, want it to contain %q", err, tc.msg)
			}
		})
	}
}

// TestEncodingDetails covers a byte-order mark, CRLF line ends (XML turns
// them into LF) and invalid UTF-8 (refused, with its line).
func TestEncodingDetails(t *testing.T) {
	doc := func(td string) string {
		return "<VOTABLE><RESOURCE><TABLE><FIELD name=\"a\" datatype=\"char\" arraysize=\"*\"/><DATA><TABLEDATA>\r\n<TR><TD>" +
			td + "</TD></TR></TABLEDATA></DATA></TABLE></RESOURCE></VOTABLE>"
	}
	_, rows := mustRead(t, []byte("\xEF\xBB\xBF<?xml version=\"1.0\" encoding=\"UTF-8\"?>\r\n"+doc("a\r\nb")), Options{})
	if len(rows) != 1 || rows[0].cells[0] != "a\nb" {
		t.Errorf("BOM and CRLF: rows %v", rows)
	}
	if err := readErr(doc("\xff\xfe"), Options{}); err == nil || !strings.Contains(err.Error(), "invalid UTF-8") || !strings.Contains(err.Error(), "line 2") {
		t.Errorf("invalid UTF-8: %v", err)
	}
}

func TestMissingTDsAndEmptyTable(t *testing.T) {
	src := `<VOTABLE><RESOURCE><TABLE><FIELD name="a" datatype="char"/><FIELD name="b" datatype="int"/>` +
		`<DATA><TABLEDATA><TR><TD>x</TD></TR><TR/></TABLEDATA></DATA></TABLE></RESOURCE></VOTABLE>`
	_, rows := mustRead(t, []byte(src), Options{})
	if len(rows) != 2 || !reflect.DeepEqual(rows[0].cells, []string{"x", ""}) || !reflect.DeepEqual(rows[1].cells, []string{"", ""}) {
		t.Errorf("rows %v", rows)
	}
	src = `<VOTABLE><RESOURCE><TABLE><FIELD name="a" datatype="char"/></TABLE></RESOURCE></VOTABLE>`
	rd, rows := mustRead(t, []byte(src), Options{})
	if len(rows) != 0 || len(rd.Columns()) != 1 {
		t.Errorf("table without DATA: %d rows, %d columns", len(rows), len(rd.Columns()))
	}
}
