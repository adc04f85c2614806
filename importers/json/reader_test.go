package json

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"
)

// noSeek hides any Seek method, as a pipe would.
type noSeek struct{ io.Reader }

type row struct {
	n     int
	cells []string
}

// readAll reads every row of r, copying the cells.
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

// readErr reads src until an error and returns it (nil if none).
func readErr(src io.Reader, opt Options) error {
	rd, err := NewReader(src, opt)
	if err != nil {
		return err
	}
	for {
		_, _, err := rd.Next()
		if err == io.EOF {
			return nil
		}
		if err != nil {
			return err
		}
	}
}

func names(rd *Reader) []string {
	var s []string
	for _, c := range rd.Columns() {
		s = append(s, c.Name)
	}
	return s
}

func mustOpen(tb testing.TB, name string) *os.File {
	tb.Helper()
	f, err := os.Open(filepath.Join("testdata", name))
	if err != nil {
		tb.Fatal(err)
	}
	tb.Cleanup(func() { f.Close() })
	return f
}

func TestFixtures(t *testing.T) {
	wantCols := []string{"name", "planet", "mass [kg]", "mass_err [kg]", "radius [km]", "eccentricity", "source"}
	wantCells := [][]string{
		{"Vasha b I", "Vasha b", "1.2e22", "3e20", "1450", "0.004", ""},
		{"Vasha b II", "Vasha b", "", "", "610.5", "0.0123", "invented for tests"},
	}
	for _, tc := range []struct {
		file string
		rows []int
	}{
		{"moons.json", []int{1, 2}},   // element indices
		{"moons.ndjson", []int{1, 3}}, // start lines (line 2 is blank)
	} {
		t.Run(tc.file, func(t *testing.T) {
			rd, err := NewReader(mustOpen(t, tc.file), Options{})
			if err != nil {
				t.Fatal(err)
			}
			if got := names(rd); !reflect.DeepEqual(got, wantCols) {
				t.Fatalf("columns = %q, want %q", got, wantCols)
			}
			rows := readAll(t, rd)
			if len(rows) != len(wantCells) {
				t.Fatalf("got %d rows, want %d", len(rows), len(wantCells))
			}
			for i, r := range rows {
				if r.n != tc.rows[i] {
					t.Errorf("row %d: number %d, want %d", i, r.n, tc.rows[i])
				}
				if !reflect.DeepEqual(r.cells, wantCells[i]) {
					t.Errorf("row %d: cells %q, want %q", i, r.cells, wantCells[i])
				}
			}
		})
	}
}

func TestColumnsUnionOfKeys(t *testing.T) {
	src := `[{"name":"A","mass [kg]":1},{"name":"B","radius [km]":2}]`
	// Seekable (rewound) and not seekable (spooled): union of keys.
	for name, r := range map[string]io.Reader{
		"seekable": strings.NewReader(src),
		"pipe":     noSeek{strings.NewReader(src)},
	} {
		dir := t.TempDir()
		rd, err := NewReader(r, Options{TmpDir: dir})
		if err != nil {
			t.Fatal(err)
		}
		if got, want := names(rd), []string{"name", "mass [kg]", "radius [km]"}; !reflect.DeepEqual(got, want) {
			t.Errorf("%s: columns = %q, want %q", name, got, want)
		}
		if got := readAll(t, rd); !reflect.DeepEqual(got[1].cells, []string{"B", "", "2"}) {
			t.Errorf("%s: row 2 = %q", name, got[1].cells)
		}
		if left, _ := os.ReadDir(dir); len(left) != 0 {
			t.Errorf("%s: %d temporary files left after the last row", name, len(left))
		}
	}
	// NoPrescan: the new key is an error naming element and key.
	for name, r := range map[string]io.Reader{
		"seekable": strings.NewReader(src),
		"pipe":     noSeek{strings.NewReader(src)},
	} {
		err := readErr(r, Options{NoPrescan: true})
		var re *RowError
		if !errors.As(err, &re) || !errors.Is(err, ErrUnknownKey) || re.Row != 2 || re.Key != "radius [km]" {
			t.Errorf("NoPrescan, %s: err = %v, want ErrUnknownKey at element 2, key radius [km]", name, err)
		}
	}
}

// TestKeyOnlyInThirdObject reads, from a pipe, NDJSON whose third object
// alone has a key: the key is a column, its cell empty in the other rows,
// and the spooled copy is gone once the rows are read, or once Close is
// called by a reader that stops early.
func TestKeyOnlyInThirdObject(t *testing.T) {
	const src = `{"name":"A","planet":"P"}
{"name":"B","planet":"P"}
{"name":"C","planet":"P","eccentricity":0.01}
{"name":"D","planet":"P"}
`
	want := []row{{1, []string{"A", "P", ""}}, {2, []string{"B", "P", ""}}, {3, []string{"C", "P", "0.01"}}, {4, []string{"D", "P", ""}}}
	for _, early := range []bool{false, true} {
		dir := t.TempDir()
		pr, pw := io.Pipe()
		go func() { io.WriteString(pw, src); pw.Close() }()
		rd, err := NewReader(pr, Options{TmpDir: dir})
		if err != nil {
			t.Fatal(err)
		}
		if got := names(rd); !reflect.DeepEqual(got, []string{"name", "planet", "eccentricity"}) {
			t.Errorf("columns %q", got)
		}
		if early {
			if _, _, err := rd.Next(); err != nil {
				t.Fatal(err)
			}
			if left, _ := os.ReadDir(dir); len(left) != 1 {
				t.Errorf("%d spooled files while reading, want 1", len(left))
			}
			if err := rd.Close(); err != nil {
				t.Errorf("Close: %v", err)
			}
		} else if got := readAll(t, rd); !reflect.DeepEqual(got, want) {
			t.Errorf("rows %v, want %v", got, want)
		}
		if left, _ := os.ReadDir(dir); len(left) != 0 {
			t.Errorf("early stop %v: %d temporary files left", early, len(left))
		}
	}
}

func TestErrors(t *testing.T) {
	for _, tc := range []struct {
		name, src string
		want      error  // errors.Is target, if any
		msg       string // substring of the message
	}{
		{"empty", "", ErrEmpty, "no JSON objects"},
		{"spaces", " \n\t", ErrEmpty, ""},
		{"empty array", "[]", ErrEmpty, ""},
		{"scalar", "42", ErrNotTable, "line 1"},
		{"string top", `"x"`, ErrNotTable, ""},
		{"array of numbers", `[1, 2]`, ErrNotTable, "element 1"},
		{"second not object", `[{"name":"A"}, [1]]`, ErrNotTable, "element 2 (line 1)"},
		{"nested object", "[{\"name\":\"A\"},\n{\"name\":\"B\",\"mass [kg]\":{\"v\":1}}]", ErrNested, `element 2 (line 2), key "mass [kg]"`},
		{"nested array ndjson", "{\"name\":\"A\",\"x\":1}\n\n{\"name\":\"B\",\"x\":[1]}\n", ErrNested, `line 3, key "x"`},
		{"duplicate", `[{"name":"A","name":"B"}]`, ErrDuplicateKey, `key "name"`},
		{"empty key", `[{"name":"A"," ":1}]`, ErrEmptyKey, "element 1"},
		{"trailing data", `[{"name":"A"}] {"name":"B"}`, nil, "after the closing bracket"},
		{"unterminated", `[{"name":"A"}, {"name":`, io.ErrUnexpectedEOF, "element 2"},
		{"syntax", "{\"name\":\"A\"}\n{\"name\" \"B\"}\n", nil, "line 2"},
		{"missing bracket", `[{"name":"A"}`, io.ErrUnexpectedEOF, "element 2"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			for _, r := range []io.Reader{strings.NewReader(tc.src), noSeek{strings.NewReader(tc.src)}} {
				err := readErr(r, Options{})
				if err == nil {
					t.Fatalf("no error for %q", tc.src)
				}
				if tc.want != nil && !errors.Is(err, tc.want) {
					t.Errorf("err = %v, want %v", err, tc.want)
				}
				if !strings.Contains(err.Error(), tc.msg) {
					t.Errorf("err = %q, want it to contain %q", err, tc.msg)
				}
			}
		})
	}
}

func TestValues(t *testing.T) {
	src := "\uFEFF" + `{"name":"  Vasha b I ","n":-1.50E+022,"s":"a\"b\u00e9","null":null,"t":true,"f":false,"z":0}`
	rd, err := NewReader(strings.NewReader(src), Options{})
	if err != nil {
		t.Fatal(err)
	}
	got := readAll(t, rd)
	want := []string{"  Vasha b I ", "-1.50E+022", "a\"bé", "", "true", "false", "0"}
	if len(got) != 1 || !reflect.DeepEqual(got[0].cells, want) {
		t.Fatalf("cells = %v, want %q", got, want)
	}
}

// TestEncodingDetails covers invalid UTF-8 (replaced by U+FFFD, as
// encoding/json does) and CRLF line ends in NDJSON.
func TestEncodingDetails(t *testing.T) {
	rd, err := NewReader(strings.NewReader("{\"name\":\"bad \xff\xfe here\"}\r\n\r\n{\"name\":\"ok\"}\r\n"), Options{})
	if err != nil {
		t.Fatal(err)
	}
	got := readAll(t, rd)
	if len(got) != 2 || got[0].cells[0] != "bad \uFFFD\uFFFD here" || got[0].n != 1 || got[1].n != 3 {
		t.Errorf("rows %v", got)
	}
}

func TestLimits(t *testing.T) {
	deep := strings.Repeat("[", 1_000_000)
	long := `[{"name":"` + strings.Repeat("x", 2<<20) + `"}]`
	var keys strings.Builder
	for i := range 200 {
		fmt.Fprintf(&keys, `"k%d":1,`, i)
	}
	big := `[{"name":"A"},{` + keys.String() + `"name":"B"}]`
	for _, tc := range []struct {
		name, src string
		opt       Options
		what, msg string
	}{
		{"depth 2 over 1", `[{"name":"A"}]`, Options{MaxDepth: 1}, "nesting depth", "limit of 1"},
		{"deep", "\n" + deep, Options{MaxDepth: 1}, "nesting depth", "line 2"},
		{"long string", long, Options{}, "string length", "limit of 1048576 bytes"},
		{"big element", big, Options{MaxElement: 1000}, "element size", "element 2"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			err := readErr(strings.NewReader(tc.src), tc.opt)
			var le *LimitError
			if !errors.As(err, &le) || le.What != tc.what {
				t.Fatalf("err = %v, want a %s LimitError", err, tc.what)
			}
			if !strings.Contains(err.Error(), tc.msg) {
				t.Errorf("err = %q, want it to contain %q", err, tc.msg)
			}
		})
	}
}

// TestManyRowsStream reads a long generated stream through a pipe; the reader
// keeps one element at a time, so this mostly checks row numbering far in.
// TestDeepNestingRefused checks that a million open brackets, in a value or
// as elements, are refused by the depth limit before the decoder scans them.
func TestDeepNestingRefused(t *testing.T) {
	deep := strings.Repeat("[", 1_000_000)
	for _, src := range []string{deep, `[{"name":` + deep, "{\"name\":" + deep} {
		err := readErr(noSeek{strings.NewReader(src)}, Options{})
		var le *LimitError
		if !errors.As(err, &le) || le.What != "nesting depth" || le.Limit != DefaultMaxDepth {
			t.Errorf("%.12q...: err = %v, want a nesting depth LimitError", src, err)
		}
	}
	// A shallow nested value is refused as nested, naming the key.
	err := readErr(strings.NewReader(`[{"name":"A","mass [kg]":[1,2]}]`), Options{})
	if !errors.Is(err, ErrNested) || !strings.Contains(err.Error(), `key "mass [kg]"`) {
		t.Errorf("nested array value: %v", err)
	}
}

func TestManyRowsStream(t *testing.T) {
	const n = 20000
	pr, pw := io.Pipe()
	go func() {
		var b bytes.Buffer
		for i := range n {
			b.Reset()
			b.WriteString(`{"name":"m`)
			b.WriteString(strings.Repeat("x", i%7))
			b.WriteString(`","mass [kg]":1e20}` + "\n")
			pw.Write(b.Bytes())
		}
		pw.Close()
	}()
	rd, err := NewReader(pr, Options{})
	if err != nil {
		t.Fatal(err)
	}
	rows := readAll(t, rd)
	if len(rows) != n || rows[n-1].n != n {
		t.Fatalf("got %d rows, last numbered %d; want %d", len(rows), rows[len(rows)-1].n, n)
	}
}
