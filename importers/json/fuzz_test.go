package json

import (
	"bytes"
	stdjson "encoding/json"
	"errors"
	"io"
	"math"
	"strconv"
	"strings"
	"testing"
)

// FuzzReader feeds arbitrary bytes to the reader, seekable and not: it must
// never panic, must stop (every Next consumes input or ends), and must keep
// its promises: one cell per column, row numbers positive.
func FuzzReader(f *testing.F) {
	for _, s := range []string{
		`[{"name":"A","mass [kg]":1.2e22},{"name":"B","mass [kg]":null}]`,
		"{\"name\":\"A\"}\n{\"name\":\"B\"}\n",
		`[{"name":"A","x":{"y":1}}]`,
		`[{"name":"A"}] junk`,
		"\uFEFF[{\"name\":\"\\u00e9\"}]",
		`[[[[[[[[`,
		`{"a":1}{"a":2}`,
	} {
		f.Add([]byte(s))
	}
	f.Fuzz(func(t *testing.T, data []byte) {
		differential(t, data)
		for _, r := range []io.Reader{bytes.NewReader(data), noSeek{bytes.NewReader(data)}} {
			rd, err := NewReader(r, Options{MaxString: 4096, MaxElement: 1 << 16})
			if err != nil {
				continue
			}
			ncol := len(rd.Columns())
			for i := 0; ; i++ {
				cells, n, err := rd.Next()
				if err != nil {
					break
				}
				if len(cells) != ncol || n <= 0 {
					t.Fatalf("row %d: %d cells for %d columns, row number %d", i, len(cells), ncol, n)
				}
				if i > len(data) {
					t.Fatalf("more rows (%d) than input bytes (%d)", i, len(data))
				}
			}
		}
	})
}

// FuzzRoundTrip encodes fuzzed rows with encoding/json, as an array and as
// NDJSON, and checks that reading them back yields the same cells: strings as
// encoding/json decodes them, numbers as the same float64.
func FuzzRoundTrip(f *testing.F) {
	f.Add("Vasha b I", "mass [kg]", "note", 1.2e22, "invented", false)
	f.Add("", "a", "b", 0.0, "", true)
	f.Add("x\x00\xff\"\\", "k\u2028", " y ", -5e-324, "\t", false)
	f.Fuzz(func(t *testing.T, name, k1, k2 string, num float64, text string, ndjson bool) {
		if math.IsNaN(num) || math.IsInf(num, 0) {
			return // not representable in JSON
		}
		// Keys as the reader will see them: decoded and trimmed; they must be
		// distinct, non-empty and not "name".
		keys := []string{"name", decoded(t, k1), decoded(t, k2)}
		for i := range keys {
			keys[i] = strings.TrimSpace(keys[i])
		}
		if keys[1] == "" || keys[2] == "" || keys[1] == keys[2] || keys[1] == "name" || keys[2] == "name" {
			return
		}
		rows := []map[string]any{
			{keys[0]: name, keys[1]: num, keys[2]: text},
			{keys[0]: text, keys[1]: nil, keys[2]: name},
		}
		var buf bytes.Buffer
		if ndjson {
			for _, r := range rows {
				b, err := stdjson.Marshal(r)
				if err != nil {
					t.Fatal(err)
				}
				buf.Write(b)
				buf.WriteByte('\n')
			}
		} else {
			b, err := stdjson.Marshal(rows)
			if err != nil {
				t.Fatal(err)
			}
			buf.Write(b)
		}
		rd, err := NewReader(bytes.NewReader(buf.Bytes()), Options{})
		if err != nil {
			t.Fatalf("%s: %v", buf.Bytes(), err)
		}
		idx := map[string]int{}
		for i, c := range rd.Columns() {
			idx[c.Name] = i
		}
		if len(idx) != 3 {
			t.Fatalf("columns %v, want 3", rd.Columns())
		}
		for i, want := range rows {
			cells, _, err := rd.Next()
			if err != nil {
				t.Fatalf("row %d: %v", i, err)
			}
			for _, k := range keys {
				got := cells[idx[k]]
				switch v := want[k].(type) {
				case nil:
					if got != "" {
						t.Errorf("row %d key %q: %q, want empty", i, k, got)
					}
				case float64:
					g, err := strconv.ParseFloat(got, 64)
					if err != nil || g != v {
						t.Errorf("row %d key %q: %q, want %v", i, k, got, v)
					}
				case string:
					if w := decoded(t, v); got != w {
						t.Errorf("row %d key %q: %q, want %q", i, k, got, w)
					}
				}
			}
		}
		if _, _, err := rd.Next(); err != io.EOF {
			t.Fatalf("after the rows: %v, want EOF", err)
		}
	})
}

// decoded is s after an encoding/json round trip (invalid UTF-8 becomes U+FFFD).
func decoded(tb testing.TB, s string) string {
	tb.Helper()
	b, err := stdjson.Marshal(s)
	if err != nil {
		tb.Fatal(err)
	}
	var out string
	if err := stdjson.Unmarshal(b, &out); err != nil {
		tb.Fatal(err)
	}
	return out
}

// differential checks the reader against encoding/json on inputs that
// encoding/json reads as an array of flat objects: the reader must accept
// them (unless it reports a repeated key or a size limit) and give the same
// values, key by key.
func differential(t *testing.T, data []byte) {
	if t := bytes.TrimLeft(data, " \t\r\n"); len(t) == 0 || t[0] != '[' {
		return // null, or not an array
	}
	dec := stdjson.NewDecoder(bytes.NewReader(data))
	dec.UseNumber()
	var elems []map[string]any
	if err := dec.Decode(&elems); err != nil || dec.More() {
		return
	}
	if _, err := dec.Token(); err != io.EOF {
		return // trailing data; FuzzReader's other checks cover it
	}
	for _, m := range elems {
		if m == nil {
			return // a null element: not a table
		}
		for k, v := range m {
			switch v.(type) {
			case map[string]any, []any:
				return // nested values are refused by design
			}
			if strings.TrimSpace(k) == "" {
				return
			}
		}
	}
	rd, err := NewReader(bytes.NewReader(data), Options{MaxString: 4096, MaxElement: 1 << 16})
	if err == nil {
		var cells []string
		for i := 0; i < len(elems) && err == nil; i++ {
			if cells, _, err = rd.Next(); err != nil {
				break
			}
			idx := map[string]int{}
			for j, c := range rd.Columns() {
				idx[c.Name] = j
			}
			for k, v := range elems[i] {
				var want string
				switch v := v.(type) {
				case string:
					want = v
				case stdjson.Number:
					want = string(v)
				case bool:
					want = strconv.FormatBool(v)
				}
				j, ok := idx[strings.TrimSpace(k)]
				if !ok || cells[j] != want {
					t.Fatalf("element %d key %q: reader gives %q (column found: %v), encoding/json %q", i+1, k, cellAt(cells, j, ok), ok, want)
				}
			}
		}
		if err == nil {
			if _, _, err = rd.Next(); err != io.EOF {
				t.Fatalf("after %d elements: %v, want EOF", len(elems), err)
			}
			return
		}
	}
	var le *LimitError
	keys := 0
	for _, m := range elems {
		keys += len(m)
	}
	if errors.Is(err, ErrDuplicateKey) || errors.As(err, &le) || (keys == 0 && errors.Is(err, ErrEmpty)) {
		return
	}
	t.Fatalf("encoding/json reads %d flat objects; the reader fails: %v", len(elems), err)
}

func cellAt(cells []string, j int, ok bool) string {
	if !ok {
		return ""
	}
	return cells[j]
}
