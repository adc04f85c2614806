package votable

import (
	"bytes"
	"encoding/base64"
	"encoding/xml"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"unicode/utf8"
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

// fuzzKinds maps a byte of the fuzzer's field spec to a FIELD.
var fuzzKinds = []wfield{
	{datatype: "boolean"}, {datatype: "bit", arraysize: "*"}, {datatype: "unsignedByte"},
	{datatype: "short"}, {datatype: "int", null: "0"}, {datatype: "long"},
	{datatype: "float"}, {datatype: "double", arraysize: "2"}, {datatype: "char", arraysize: "4"},
	{datatype: "char", arraysize: "*"}, {datatype: "unicodeChar", arraysize: "*"},
	{datatype: "floatComplex"}, {datatype: "doubleComplex", arraysize: "*"}, {datatype: "double", arraysize: "2x*"},
}

// FuzzBinary2 wraps arbitrary bytes as the base64 stream of a table whose
// FIELDs the fuzzer also picks, so the binary decoder itself is exercised: it
// must never panic, must end, and each row must consume at least one byte.
func FuzzBinary2(f *testing.F) {
	f.Add([]byte{0, 0, 0, 0, 1, 'T'}, []byte{2, 0}, true)
	f.Add([]byte{0xff, 0xff, 0xff, 0xff, 0xff}, []byte{9, 10, 13}, true)
	f.Add([]byte("\x00\x00\x00\x00\x05Vasha"), []byte{9}, false)
	f.Fuzz(func(t *testing.T, stream, spec []byte, binary2 bool) {
		if len(spec) == 0 || len(spec) > 64 {
			return
		}
		var doc bytes.Buffer
		doc.WriteString(`<VOTABLE version="1.4"><RESOURCE><TABLE>`)
		for i, c := range spec {
			k := fuzzKinds[int(c)%len(fuzzKinds)]
			fmt.Fprintf(&doc, `<FIELD name="f%d" datatype=%q`, i, k.datatype)
			if k.arraysize != "" {
				fmt.Fprintf(&doc, ` arraysize=%q`, k.arraysize)
			}
			if k.null != "" {
				fmt.Fprintf(&doc, `><VALUES null=%q/></FIELD>`, k.null)
			} else {
				doc.WriteString("/>")
			}
		}
		ser := "BINARY"
		if binary2 {
			ser = "BINARY2"
		}
		fmt.Fprintf(&doc, `<DATA><%s><STREAM encoding="base64">%s</STREAM></%s></DATA></TABLE></RESOURCE></VOTABLE>`,
			ser, base64.StdEncoding.EncodeToString(stream), ser)
		rd, err := NewReader(&doc, Options{MaxToken: 1 << 16})
		if err != nil {
			t.Fatalf("a well-formed document was refused: %v", err)
		}
		for n := 1; ; n++ {
			cells, _, err := rd.Next()
			if err != nil {
				break
			}
			if len(cells) != len(spec) {
				t.Fatalf("%d cells for %d fields", len(cells), len(spec))
			}
			if n > len(stream) {
				t.Fatalf("%d rows from %d bytes", n, len(stream))
			}
		}
	})
}

// FuzzTableDataRoundTrip writes fuzzed text as TD cells (escaped as XML
// requires) and checks that reading gives it back, trimmed.
func FuzzTableDataRoundTrip(f *testing.F) {
	f.Add("Vasha b I", "1.2e22", " <&> ", false)
	f.Add("", "NaN", "]]>", true)
	f.Fuzz(func(t *testing.T, a, b, c string, cdata bool) {
		cells := []string{a, b, c}
		for _, s := range cells {
			if !xmlSafe(s) || (cdata && strings.Contains(s, "]]>")) {
				return
			}
		}
		var doc bytes.Buffer
		doc.WriteString(`<VOTABLE><RESOURCE><TABLE><FIELD name="a" datatype="char" arraysize="*"/><FIELD name="b" datatype="char" arraysize="*"/><FIELD name="c" datatype="char" arraysize="*"/><DATA><TABLEDATA><TR>`)
		for _, s := range cells {
			doc.WriteString("<TD>")
			if cdata {
				doc.WriteString("<![CDATA[" + s + "]]>")
			} else {
				xml.EscapeText(&doc, []byte(s))
			}
			doc.WriteString("</TD>")
		}
		doc.WriteString(`</TR></TABLEDATA></DATA></TABLE></RESOURCE></VOTABLE>`)
		rd, err := NewReader(&doc, Options{})
		if err != nil {
			t.Fatal(err)
		}
		got, _, err := rd.Next()
		if err != nil {
			t.Fatalf("%q: %v", doc.String(), err)
		}
		for i, s := range cells {
			if want := strings.TrimSpace(s); got[i] != want {
				t.Errorf("cell %d: %q, want %q", i, got[i], want)
			}
		}
	})
}

// xmlSafe reports whether s survives XML unchanged: valid UTF-8, only
// characters XML 1.0 allows, and no carriage return (XML normalises line ends).
func xmlSafe(s string) bool {
	if !utf8.ValidString(s) {
		return false
	}
	for _, r := range s {
		switch {
		case r == '\r':
			return false
		case r == '\t' || r == '\n':
		case r < 0x20, r == 0xFFFE, r == 0xFFFF, r >= 0xD800 && r <= 0xDFFF:
			return false
		}
	}
	return true
}
