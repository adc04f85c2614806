package csv

import (
	"bytes"
	stdcsv "encoding/csv"
	"errors"
	"io"
	"slices"
	"strings"
	"testing"
)

type row struct {
	line  int
	cells []string
}

// readAll reads every row, copying cells, and stops at the first error.
func readAll(tb testing.TB, in io.Reader, opt Options) ([]string, []row, error) {
	tb.Helper()
	r, err := NewReader(in, opt)
	if err != nil {
		return nil, nil, err
	}
	var names []string
	for _, c := range r.Columns() {
		names = append(names, c.Name)
	}
	var rows []row
	for {
		cells, line, err := r.Next()
		if err == io.EOF {
			return names, rows, nil
		}
		if err != nil {
			return names, rows, err
		}
		rows = append(rows, row{line, slices.Clone(cells)})
	}
}

func TestBasic(t *testing.T) {
	in := "# a comment line\nname , mass [kg]\nAlpha,1.5\n\n\"Beta, the second\",\"2\"\n# another\n\"multi\nline\",3\nGamma,4\n"
	names, rows, err := readAll(t, strings.NewReader(in), Options{})
	if err != nil {
		t.Fatal(err)
	}
	if want := []string{"name", "mass [kg]"}; !slices.Equal(names, want) {
		t.Errorf("header %q, want %q", names, want)
	}
	want := []row{
		{3, []string{"Alpha", "1.5"}},
		{5, []string{"Beta, the second", "2"}},
		{7, []string{"multi\nline", "3"}},
		{9, []string{"Gamma", "4"}},
	}
	if len(rows) != len(want) {
		t.Fatalf("rows %v, want %v", rows, want)
	}
	for i := range want {
		if rows[i].line != want[i].line || !slices.Equal(rows[i].cells, want[i].cells) {
			t.Errorf("row %d = %v, want %v", i, rows[i], want[i])
		}
	}
}

func TestLineEndings(t *testing.T) {
	cases := map[string]string{
		"LF":    "a,b\n1,2\n3,4\n",
		"CRLF":  "a,b\r\n1,2\r\n3,4\r\n",
		"CR":    "a,b\r1,2\r3,4\r",
		"mixed": "a,b\r\n1,2\n3,4\r",
		"BOM":   "\xef\xbb\xbfa,b\r\n1,2\r\n3,4",
	}
	for name, in := range cases {
		t.Run(name, func(t *testing.T) {
			names, rows, err := readAll(t, strings.NewReader(in), Options{})
			if err != nil {
				t.Fatal(err)
			}
			if !slices.Equal(names, []string{"a", "b"}) {
				t.Errorf("header %q", names)
			}
			if len(rows) != 2 || rows[0].line != 2 || rows[1].line != 3 ||
				!slices.Equal(rows[0].cells, []string{"1", "2"}) || !slices.Equal(rows[1].cells, []string{"3", "4"}) {
				t.Errorf("rows %v", rows)
			}
		})
	}
}

// oneByte hands out one byte per Read, to cross every buffer boundary.
type oneByte struct{ r io.Reader }

func (o oneByte) Read(p []byte) (int, error) { return o.r.Read(p[:1]) }

func TestCRLFAcrossReads(t *testing.T) {
	_, rows, err := readAll(t, oneByte{strings.NewReader("a,b\r\n1,2\r\n\"x\r\ny\",3\r\n")}, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if len(rows) != 2 || rows[1].cells[0] != "x\ny" || rows[1].line != 3 {
		t.Errorf("rows %v", rows)
	}
}

func TestTSV(t *testing.T) {
	_, rows, err := readAll(t, strings.NewReader("name\tmass [kg]\nA, with comma\t1e22\n"), Options{Comma: '\t'})
	if err != nil {
		t.Fatal(err)
	}
	if len(rows) != 1 || !slices.Equal(rows[0].cells, []string{"A, with comma", "1e22"}) {
		t.Errorf("rows %v", rows)
	}
}

func TestFieldCount(t *testing.T) {
	r, err := NewReader(strings.NewReader("a,b,c\n1,2,3\n4,5\n6,7,8\n"), Options{})
	if err != nil {
		t.Fatal(err)
	}
	if _, _, err := r.Next(); err != nil {
		t.Fatal(err)
	}
	_, line, err := r.Next()
	var re *RowError
	if !errors.As(err, &re) || !errors.Is(err, ErrFieldCount) || line != 3 || re.Line != 3 {
		t.Fatalf("short row: line %d, err %v; want a RowError on line 3", line, err)
	}
	if !strings.Contains(err.Error(), "line 3") || !strings.Contains(err.Error(), "2 fields, the header has 3") {
		t.Errorf("message %q", err)
	}
	if !re.Recoverable() {
		t.Error("a field-count error should be recoverable")
	}
	cells, line, err := r.Next() // reading goes on
	if err != nil || line != 4 || cells[2] != "8" {
		t.Errorf("after the error: %v %d %v", cells, line, err)
	}
}

func TestInvalidUTF8(t *testing.T) {
	r, err := NewReader(strings.NewReader("name,mass\nok,1\nbad\xff\xfe,2\n"), Options{})
	if err != nil {
		t.Fatal(err)
	}
	r.Next()
	_, _, err = r.Next()
	var re *RowError
	if !errors.As(err, &re) || !errors.Is(err, ErrInvalidUTF8) || re.Line != 3 || re.Column != 1 || re.Name != "name" {
		t.Fatalf("err %v (%+v); want invalid UTF-8 on line 3, column 1", err, re)
	}
	if !strings.Contains(err.Error(), "line 3") || !strings.Contains(err.Error(), `"name"`) {
		t.Errorf("message %q", err)
	}
	// In the header.
	if _, err := NewReader(strings.NewReader("na\xffme,mass\n"), Options{}); !errors.Is(err, ErrInvalidUTF8) {
		t.Errorf("header: %v", err)
	}
}

// repeat yields n copies of b without holding them.
type repeat struct {
	b byte
	n int
}

func (r *repeat) Read(p []byte) (int, error) {
	if r.n == 0 {
		return 0, io.EOF
	}
	k := min(len(p), r.n)
	for i := range k {
		p[i] = r.b
	}
	r.n -= k
	return k, nil
}

func TestHugeField(t *testing.T) {
	for _, quoted := range []bool{false, true} {
		q := ""
		if quoted {
			q = `"`
		}
		src := io.MultiReader(
			strings.NewReader("name,notes\nok,1\nbig,"+q),
			&repeat{b: 'x', n: 10 << 20}, // a 10 MB field
			strings.NewReader(q+"\nafter,2\n"),
		)
		var counted countingReader
		counted.r = src
		r, err := NewReader(&counted, Options{})
		if err != nil {
			t.Fatal(err)
		}
		if _, _, err := r.Next(); err != nil {
			t.Fatal(err)
		}
		_, _, err = r.Next()
		if !errors.Is(err, ErrRecordTooLong) {
			t.Fatalf("quoted=%v: err %v, want ErrRecordTooLong", quoted, err)
		}
		if !strings.Contains(err.Error(), "line 3") || !strings.Contains(err.Error(), "1 MiB") {
			t.Errorf("message %q", err)
		}
		// Refused while reading: far less than the field was consumed.
		if counted.n > 2<<20 {
			t.Errorf("read %d bytes before refusing; want it bounded near the 1 MiB cap", counted.n)
		}
	}
	// A quoted field with many short lines counts as one record.
	src := io.MultiReader(strings.NewReader("a,b\n\""), &repeat{b: '\n', n: 2 << 20}, strings.NewReader("\",1\n"))
	r, _ := NewReader(src, Options{})
	if _, _, err := r.Next(); !errors.Is(err, ErrRecordTooLong) {
		t.Errorf("multi-line quoted field: %v", err)
	}
}

type countingReader struct {
	r io.Reader
	n int
}

func (c *countingReader) Read(p []byte) (int, error) {
	n, err := c.r.Read(p)
	c.n += n
	return n, err
}

func TestCommentWithQuote(t *testing.T) {
	// An unbalanced quote in a comment must not make later rows one record.
	in := "# it's \"quoted\nname,mass\n" + strings.Repeat("a,1\n", 10)
	_, rows, err := readAll(t, strings.NewReader(in), Options{MaxRecordBytes: 32})
	if err != nil || len(rows) != 10 {
		t.Fatalf("rows %d, err %v", len(rows), err)
	}
}

func TestBareQuote(t *testing.T) {
	_, _, err := readAll(t, strings.NewReader("a,b\nx\"y,1\n"), Options{})
	if !errors.Is(err, ErrSyntax) || !strings.Contains(err.Error(), "line 2") {
		t.Errorf("bare quote: %v", err)
	}
}

func TestEmpty(t *testing.T) {
	if _, err := NewReader(strings.NewReader(""), Options{}); !errors.Is(err, ErrNoHeader) {
		t.Errorf("empty input: %v", err)
	}
	if _, err := NewReader(strings.NewReader("# only a comment\n"), Options{}); !errors.Is(err, ErrNoHeader) {
		t.Errorf("comment only: %v", err)
	}
}

// FuzzCSV checks that the reader never panics on arbitrary bytes, and that a
// table written by encoding/csv from random cells reads back as written (up
// to the documented normalisation of CR to LF).
func FuzzCSV(f *testing.F) {
	f.Add([]byte("a,b\n1,2\n"), "x", "y", "z", false)
	f.Add([]byte("\xef\xbb\xbfa\tb\r\n1\t2\r"), "multi\nline", "q\"uote", "", true)
	f.Add([]byte("a,\"b\n"), "#hash", " space", "c,omma", false)
	f.Fuzz(func(t *testing.T, raw []byte, c1, c2, c3 string, tab bool) {
		comma := ','
		if tab {
			comma = '\t'
		}
		// Never panic, and end.
		if r, err := NewReader(bytes.NewReader(raw), Options{Comma: comma, MaxRecordBytes: 1 << 10}); err == nil {
			for range 1 << 16 {
				if _, _, err := r.Next(); err != nil {
					var re *RowError
					if !errors.As(err, &re) {
						break
					}
				}
			}
		}

		// Round trip.
		var buf bytes.Buffer
		w := stdcsv.NewWriter(&buf)
		w.Comma = comma
		recs := [][]string{{"h1", "h2", "h3"}, {c1, c2, c3}, {c3, c1, c2}}
		if err := w.WriteAll(recs); err != nil {
			return // e.g. a cell the writer refuses
		}
		_, rows, err := readAll(t, &buf, Options{Comma: comma, NoComments: true})
		valid := true
		for _, c := range []string{c1, c2, c3} {
			valid = valid && strings.ToValidUTF8(c, "") == c
		}
		if !valid {
			if err == nil {
				t.Fatalf("invalid UTF-8 cells read without error")
			}
			return
		}
		if c1 == "" && c2 == "" && c3 == "" {
			// encoding/csv writes ",," for an all-empty row; still a row.
		}
		if err != nil {
			t.Fatalf("read back: %v\ninput %q", err, buf.String())
		}
		norm := func(s string) string {
			return strings.ReplaceAll(strings.ReplaceAll(s, "\r\n", "\n"), "\r", "\n")
		}
		if len(rows) != 2 {
			t.Fatalf("read %d rows, want 2: %q", len(rows), buf.String())
		}
		for i, want := range recs[1:] {
			for j := range want {
				if rows[i].cells[j] != norm(want[j]) {
					t.Fatalf("row %d cell %d = %q, want %q", i, j, rows[i].cells[j], norm(want[j]))
				}
			}
		}
	})
}
