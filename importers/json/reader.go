package json

import (
	"bufio"
	"bytes"
	stdjson "encoding/json"
	"errors"
	"fmt"
	"io"
	"os"
	"strings"
	"unicode/utf8"

	"tidesift/importers/table"
)

// Default limits; see Options.
const (
	DefaultMaxDepth   = 64
	DefaultMaxString  = 1 << 20
	DefaultMaxElement = 16 << 20
)

// Errors returned by NewReader and Next, wrapped in a *RowError or returned
// as they are. Test with errors.Is.
var (
	// ErrEmpty is returned by NewReader when the input holds no object with
	// a key: no columns, so no table.
	ErrEmpty = errors.New("no JSON objects with keys in the input")
	// ErrNotTable is returned when the input is neither an array of objects
	// nor a stream of objects, or when an element is not an object.
	ErrNotTable = errors.New("expected an array of objects or one object per line")
	// ErrNested is returned for a value that is an object or an array.
	ErrNested = errors.New("nested objects and arrays are not allowed as values; expected a number, a string or null")
	// ErrUnknownKey is returned, when the columns come from the first object
	// (Options.NoPrescan), for a later object with a key the first one lacks.
	ErrUnknownKey = errors.New("key not in the first object (put every key in the first object, with null where unknown)")
	// ErrDuplicateKey is returned for an object that repeats a key.
	ErrDuplicateKey = errors.New("key repeated in one object")
	// ErrEmptyKey is returned for a key that is empty or only spaces.
	ErrEmptyKey = errors.New("empty key")
)

// Options adjust NewReader. The zero value is ready to use.
type Options struct {
	// MaxDepth is the deepest nesting of arrays and objects accepted anywhere
	// in the input (0: DefaultMaxDepth). A table needs 2.
	MaxDepth int
	// MaxString is the longest string accepted, in bytes as written (0:
	// DefaultMaxString).
	MaxString int
	// MaxElement is the largest element (one object) accepted, in bytes as
	// written (0: DefaultMaxElement).
	MaxElement int
	// NoPrescan takes the columns from the first object, so the input is read
	// once and nothing is spooled; a later object with another key is then
	// an error (ErrUnknownKey).
	NoPrescan bool
	// TmpDir is where an input that cannot seek is spooled ("" for the
	// system default).
	TmpDir string
}

func (o Options) withDefaults() Options {
	if o.MaxDepth <= 0 {
		o.MaxDepth = DefaultMaxDepth
	}
	if o.MaxString <= 0 {
		o.MaxString = DefaultMaxString
	}
	if o.MaxElement <= 0 {
		o.MaxElement = DefaultMaxElement
	}
	return o
}

// RowError is an error at one element of the input. Row is the element's row
// number as Next reports it; Line is the line on which the element starts (0
// if unknown); Key is the key concerned, if any.
type RowError struct {
	Row  int
	Line int
	Key  string
	Err  error
	// array tells how to name Row: element index or line.
	array bool
}

func (e *RowError) Error() string {
	var b strings.Builder
	if e.array {
		fmt.Fprintf(&b, "element %d", e.Row)
		if e.Line > 0 {
			fmt.Fprintf(&b, " (line %d)", e.Line)
		}
	} else {
		fmt.Fprintf(&b, "line %d", e.Row)
	}
	if e.Key != "" {
		fmt.Fprintf(&b, ", key %q", e.Key)
	}
	b.WriteString(": ")
	b.WriteString(e.Err.Error())
	return b.String()
}

func (e *RowError) Unwrap() error { return e.Err }

// Reader reads rows from JSON. It implements table.Reader.
type Reader struct {
	opt    Options
	g      *guard
	dec    *stdjson.Decoder
	array  bool // input is one array (else a stream of objects)
	strict bool // keys outside cols are errors (else they are added)

	cols  []table.Column
	index map[string]int
	cells []string
	seen  []int // seen[i] == gen when column i was set in the current object
	gen   int

	spool *os.File // the copy of an input that cannot seek, removed by Close

	raw     stdjson.RawMessage // the current element, as read
	elem    int                // elements read so far
	pending bool               // cells holds the first object, not yet returned by Next
	prow    int
	done    bool
	err     error
}

var _ table.Reader = (*Reader)(nil)

// NewReader starts reading a table from r. Unless Options.NoPrescan is set,
// it first reads the whole input once to collect the keys of every object:
// when r is an io.Seeker it then seeks back to where r was; otherwise (a
// pipe, or the buffered reader the importers pass) it copies the input to a
// temporary file as it goes and reads the rows from that copy, so memory
// holds one element at a time either way. Close removes the copy; Next does
// so itself once it has returned io.EOF or an error. With NoPrescan it reads
// only up to the first object.
func NewReader(r io.Reader, opt Options) (*Reader, error) {
	opt = opt.withDefaults()
	if opt.NoPrescan {
		return firstObject(r, opt)
	}
	if s, ok := r.(io.Seeker); ok {
		if pos, err := s.Seek(0, io.SeekCurrent); err == nil {
			cols, err := prescan(r, opt)
			if err != nil {
				return nil, err
			}
			if _, err := s.Seek(pos, io.SeekStart); err != nil {
				return nil, fmt.Errorf("rewind after scanning the keys: %w", err)
			}
			rd, err := start(r, opt, true)
			if err != nil {
				return nil, err
			}
			for _, c := range cols {
				rd.addColumn(c.Name)
			}
			return rd, nil
		}
	}
	return spooled(r, opt)
}

// spooled collects the keys while copying r to a temporary file, then reads
// the rows from the copy.
func spooled(r io.Reader, opt Options) (*Reader, error) {
	tmp, err := os.CreateTemp(opt.TmpDir, "tidesift-json-*.json")
	if err != nil {
		return nil, fmt.Errorf("spool the JSON input to a temporary file (it cannot seek, and the keys of every object are needed first): %w", err)
	}
	drop := func() {
		tmp.Close()
		os.Remove(tmp.Name())
	}
	w := &spoolWriter{f: tmp}
	cols, err := prescan(io.TeeReader(r, w), opt)
	if w.err != nil {
		drop()
		return nil, fmt.Errorf("spool the JSON input to a temporary file: %w", w.err)
	}
	if err != nil {
		drop()
		return nil, err
	}
	if _, err := tmp.Seek(0, io.SeekStart); err != nil {
		drop()
		return nil, fmt.Errorf("rewind the spooled JSON input: %w", err)
	}
	rd, err := start(tmp, opt, true)
	if err != nil {
		drop()
		return nil, err
	}
	rd.spool = tmp
	for _, c := range cols {
		rd.addColumn(c.Name)
	}
	return rd, nil
}

// spoolWriter keeps the first write error, which a TeeReader would otherwise
// report as if the input had failed.
type spoolWriter struct {
	f   *os.File
	err error
}

func (w *spoolWriter) Write(p []byte) (int, error) {
	if w.err != nil {
		return 0, w.err
	}
	n, err := w.f.Write(p)
	w.err = err
	return n, err
}

// Close removes the spooled copy of the input, if any. Calling it again is
// harmless.
func (rd *Reader) Close() error {
	if rd.spool == nil {
		return nil
	}
	err := rd.spool.Close()
	if rerr := os.Remove(rd.spool.Name()); err == nil {
		err = rerr
	}
	rd.spool = nil
	return err
}

// firstObject is NewReader with the columns of the first object only.
func firstObject(r io.Reader, opt Options) (*Reader, error) {
	rd, err := start(r, opt, false)
	if err != nil {
		return nil, err
	}
	// Columns from the first object.
	if !rd.readObject() {
		if rd.err == io.EOF {
			return nil, ErrEmpty
		}
		return nil, rd.err
	}
	rd.pending, rd.prow = true, rd.row()
	rd.strict = true
	return rd, nil
}

// prescan reads every object once to collect the union of keys.
func prescan(r io.Reader, opt Options) ([]table.Column, error) {
	rd, err := start(r, opt, false)
	if err != nil {
		return nil, err
	}
	for {
		_, _, err := rd.Next()
		if err == io.EOF {
			break
		}
		if err != nil {
			return nil, err
		}
	}
	if len(rd.cols) == 0 {
		return nil, ErrEmpty
	}
	return rd.cols, nil
}

// start skips a byte-order mark and white space, finds whether the input is
// an array or a stream of objects, and sets up the guarded decoder.
func start(r io.Reader, opt Options, strict bool) (*Reader, error) {
	br := bufio.NewReader(r)
	if b, err := br.Peek(3); err == nil && bytes.Equal(b, []byte{0xEF, 0xBB, 0xBF}) {
		br.Discard(3)
	}
	line := 1
	var first byte
	for {
		c, err := br.ReadByte()
		if err == io.EOF {
			return nil, ErrEmpty
		}
		if err != nil {
			return nil, err
		}
		if c == '\n' {
			line++
		}
		if c == ' ' || c == '\t' || c == '\r' || c == '\n' {
			continue
		}
		first = c
		br.UnreadByte()
		break
	}
	rd := &Reader{opt: opt, strict: strict, index: map[string]int{}}
	switch first {
	case '[':
		rd.array = true
	case '{':
	default:
		return nil, fmt.Errorf("line %d: %w, found %q", line, ErrNotTable, first)
	}
	base := 0
	if rd.array {
		base = 1
	}
	rd.g = &guard{r: br, base: base, line: line, opt: opt, array: rd.array}
	rd.dec = stdjson.NewDecoder(rd.g)
	rd.dec.UseNumber()
	if rd.array {
		if _, err := rd.dec.Token(); err != nil { // the opening bracket
			return nil, err
		}
	}
	return rd, nil
}

func (rd *Reader) addColumn(name string) int {
	i := len(rd.cols)
	rd.cols = append(rd.cols, table.Column{Name: name})
	rd.index[name] = i
	rd.cells = append(rd.cells, "")
	rd.seen = append(rd.seen, 0)
	return i
}

// Columns returns the columns: the union of keys in order of first appearance.
func (rd *Reader) Columns() []table.Column { return rd.cols }

// row is the current element's row number: element index or start line.
func (rd *Reader) row() int {
	if rd.array {
		return rd.elem
	}
	return rd.g.lineOf(rd.elem)
}

func (rd *Reader) fail(key string, err error) bool {
	var le *LimitError
	if errors.As(err, &le) {
		// The guard reads ahead of the decoder; its position is the one that matters.
		rd.err = err
		return false
	}
	if err == io.EOF {
		err = io.ErrUnexpectedEOF
	}
	rd.err = &RowError{Row: rd.row(), Line: rd.g.lineOf(rd.elem), Key: key, Err: err, array: rd.array}
	return false
}

// readObject decodes the next element into rd.cells. It returns false at the
// end (rd.err == io.EOF) or on an error (rd.err).
func (rd *Reader) readObject() bool {
	if rd.array && !rd.dec.More() {
		// Closing bracket, then nothing but white space.
		if _, err := rd.dec.Token(); err != nil {
			if err == io.EOF { // where the next element or ']' should be
				rd.elem++
			}
			return rd.fail("", err)
		}
		if _, err := rd.dec.Token(); err != io.EOF {
			if err == nil {
				err = errors.New("unexpected data after the closing bracket of the array")
			}
			rd.elem++
			return rd.fail("", err)
		}
		rd.err = io.EOF
		return false
	}
	rd.raw = rd.raw[:0]
	err := rd.dec.Decode(&rd.raw)
	if err == io.EOF && !rd.array {
		rd.err = io.EOF
		return false
	}
	rd.elem++
	if err != nil {
		return rd.fail("", err)
	}
	return rd.parseObject(rd.raw)
}

// parseObject fills rd.cells from one element, which the decoder has checked
// is well-formed JSON: so the scan below can trust the syntax and only needs
// to tell objects, strings, numbers, literals and nested values apart.
func (rd *Reader) parseObject(raw []byte) bool {
	i := skipSpace(raw, 0)
	if raw[i] != '{' {
		return rd.fail("", fmt.Errorf("%w; found %s", ErrNotTable, describeByte(raw[i])))
	}
	rd.gen++
	for j := range rd.cells {
		rd.cells[j] = ""
	}
	i++
	for {
		i = skipSpace(raw, i)
		switch raw[i] {
		case '}':
			return true
		case ',':
			i = skipSpace(raw, i+1)
		}
		kb, next := stringAt(raw, i)
		i = skipSpace(raw, next)
		i = skipSpace(raw, i+1) // the colon
		// The key as bytes; the map lookup below does not allocate for it.
		var key []byte
		if bytes.IndexByte(kb, '\\') < 0 && utf8.Valid(kb) {
			key = bytes.TrimSpace(kb)
		} else {
			key = []byte(strings.TrimSpace(decodeString(kb)))
		}
		if len(key) == 0 {
			return rd.fail("", ErrEmptyKey)
		}
		var cell string
		switch c := raw[i]; c {
		case '"':
			vb, next := stringAt(raw, i)
			if bytes.IndexByte(vb, '\\') < 0 && utf8.Valid(vb) {
				cell = string(vb)
			} else {
				cell = decodeString(vb)
			}
			i = next
		case '{', '[':
			return rd.fail(string(key), ErrNested)
		case 'n':
			i += 4
		case 't':
			cell, i = "true", i+4
		case 'f':
			cell, i = "false", i+5
		default: // a number
			j := i
			for j < len(raw) && !isDelim(raw[j]) {
				j++
			}
			cell, i = string(raw[i:j]), j
		}
		col, ok := rd.index[string(key)]
		if !ok {
			if rd.strict {
				return rd.fail(string(key), ErrUnknownKey)
			}
			col = rd.addColumn(string(key))
		}
		if rd.seen[col] == rd.gen {
			return rd.fail(string(key), ErrDuplicateKey)
		}
		rd.seen[col] = rd.gen
		rd.cells[col] = cell
	}
}

func skipSpace(b []byte, i int) int {
	for i < len(b) && (b[i] == ' ' || b[i] == '\t' || b[i] == '\n' || b[i] == '\r') {
		i++
	}
	return i
}

func isDelim(c byte) bool {
	return c == ',' || c == '}' || c == ']' || c == ' ' || c == '\t' || c == '\n' || c == '\r'
}

// stringAt returns the raw bytes between the quotes of the string starting
// at b[i], and the index after its closing quote.
func stringAt(b []byte, i int) ([]byte, int) {
	j := i + 1
	for j < len(b) {
		switch b[j] {
		case '\\':
			j += 2
			continue
		case '"':
			return b[i+1 : j], j + 1
		}
		j++
	}
	return b[i+1:], len(b)
}

// decodeString decodes the body of a JSON string with escapes or invalid
// UTF-8 as encoding/json does (invalid bytes become U+FFFD).
func decodeString(body []byte) string {
	q := make([]byte, 0, len(body)+2)
	q = append(q, '"')
	q = append(q, body...)
	q = append(q, '"')
	var s string
	if err := stdjson.Unmarshal(q, &s); err != nil {
		return string(body) // cannot happen: the decoder checked the syntax
	}
	return s
}

func describeByte(c byte) string {
	switch c {
	case '[':
		return "an array"
	case '"':
		return "a string"
	case 'n':
		return "null"
	case 't', 'f':
		return "a boolean"
	}
	return "a number"
}

// Next returns the next row. See table.Reader.
func (rd *Reader) Next() ([]string, int, error) {
	if rd.pending {
		rd.pending = false
		return rd.cells, rd.prow, nil
	}
	if rd.done {
		return nil, 0, rd.err
	}
	if !rd.readObject() {
		rd.done = true
		rd.Close()
		return nil, 0, rd.err
	}
	return rd.cells, rd.row(), nil
}
