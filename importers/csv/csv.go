// Package csv reads comma- and tab-separated tables (RFC 4180 quoting) as a
// stream of rows for tidesift's importers. It implements table.Reader on top
// of encoding/csv and adds the safety checks a file from elsewhere needs.
//
// What it accepts and refuses:
//
//   - The first record that is not a comment is the header; its cells,
//     trimmed, are the column names.
//   - A UTF-8 byte-order mark at the start is dropped. Line endings may be
//     LF, CRLF, or a lone CR (old Mac files), mixed freely; a lone CR is read
//     as a line end, also inside a quoted field.
//   - Lines whose first character is '#' are comments and skipped (a data row
//     can still hold a '#' anywhere else, or quote a leading one: "#1").
//   - Blank lines are skipped.
//   - Quotes follow RFC 4180 strictly (no lazy quotes): a stray '"' in an
//     unquoted field is an error naming the line and column.
//   - Every row must have as many fields as the header: a *RowError naming the
//     line otherwise.
//   - Every field must be valid UTF-8: a *RowError naming the line and the
//     column otherwise.
//   - A record (one row, which may span lines inside quotes) may hold at most
//     Options.MaxRecordBytes bytes (default 1 MiB): a 10 MB field is refused
//     with an error while reading, before it is held in memory.
//
// A *RowError is recoverable (Recoverable reports true): the caller may record
// it against its row and call Next again. Any other error ends the stream.
//
// Example:
//
//	r, err := csv.NewReader(f, csv.Options{Comma: '\t'})
//	if err != nil { ... }
//	for {
//		cells, line, err := r.Next()
//		if err == io.EOF { break }
//		...
//	}
package csv

import (
	"bytes"
	stdcsv "encoding/csv"
	"errors"
	"fmt"
	"io"
	"strings"
	"unicode/utf8"

	"tidesift/importers/table"
)

// DefaultMaxRecordBytes is the default cap on the size of one record.
const DefaultMaxRecordBytes = 1 << 20

// Sentinel errors, tested with errors.Is.
var (
	// ErrRecordTooLong: a record (and so a field) longer than MaxRecordBytes.
	ErrRecordTooLong = errors.New("record too long")
	// ErrFieldCount: a row with a different number of fields than the header.
	ErrFieldCount = errors.New("wrong number of fields")
	// ErrInvalidUTF8: a field that is not valid UTF-8.
	ErrInvalidUTF8 = errors.New("invalid UTF-8")
	// ErrNoHeader: the input holds no header record.
	ErrNoHeader = errors.New("no header row")
	// ErrSyntax: a quoting error (wraps the encoding/csv error).
	ErrSyntax = errors.New("CSV syntax error")
)

// Options adjust NewReader.
type Options struct {
	Comma          rune // field separator; 0 means ','. Use '\t' for TSV.
	MaxRecordBytes int  // cap on one record's bytes; 0 means DefaultMaxRecordBytes
	NoComments     bool // read lines starting with '#' as data instead of skipping them
}

// RowError is a problem confined to one row; reading can go on after it.
type RowError struct {
	Line   int    // 1-based line where the row starts
	Column int    // 1-based field number, 0 when the whole row is at fault
	Err    error  // ErrFieldCount or ErrInvalidUTF8, with detail
	Name   string // column name when Column > 0
}

func (e *RowError) Error() string {
	if e.Column > 0 {
		return fmt.Sprintf("line %d, column %d (%q): %v", e.Line, e.Column, e.Name, e.Err)
	}
	return fmt.Sprintf("line %d: %v", e.Line, e.Err)
}

// Unwrap returns the sentinel-wrapping cause.
func (e *RowError) Unwrap() error { return e.Err }

// Recoverable reports that the stream can continue after this error.
func (e *RowError) Recoverable() bool { return true }

// Reader is a streaming table.Reader over CSV or TSV.
type Reader struct {
	cr    *stdcsv.Reader
	guard *guard
	cols  []table.Column
	n     int

	headerLine int
}

var _ table.Reader = (*Reader)(nil)

// NewReader reads the header from r and returns a reader positioned at the
// first data row.
func NewReader(r io.Reader, opt Options) (*Reader, error) {
	if opt.Comma == 0 {
		opt.Comma = ','
	}
	if opt.MaxRecordBytes <= 0 {
		opt.MaxRecordBytes = DefaultMaxRecordBytes
	}
	g := &guard{r: r, max: opt.MaxRecordBytes, line: 1, bomCheck: true, comments: !opt.NoComments}
	cr := stdcsv.NewReader(g)
	cr.Comma = opt.Comma
	if !opt.NoComments {
		cr.Comment = '#'
	}
	cr.ReuseRecord = true
	cr.LazyQuotes = false
	cr.FieldsPerRecord = -1 // checked here, to word the message and go on after it
	rd := &Reader{cr: cr, guard: g}
	head, err := cr.Read()
	if err == io.EOF {
		return nil, fmt.Errorf("%w: the input is empty", ErrNoHeader)
	}
	if err != nil {
		return nil, rd.wrap(err)
	}
	rd.headerLine, _ = cr.FieldPos(0)
	rd.n = len(head)
	rd.cols = make([]table.Column, len(head))
	for i, h := range head {
		if !utf8.ValidString(h) {
			return nil, &RowError{Line: 1, Column: i + 1, Err: fmt.Errorf("%w in header field %d", ErrInvalidUTF8, i+1)}
		}
		rd.cols[i].Name = strings.TrimSpace(h)
	}
	return rd, nil
}

// Columns returns the header's columns (names only; CSV declares no units
// other than the "[unit]" suffix the importers read from the name).
func (r *Reader) Columns() []table.Column { return r.cols }

// HeaderRow is the line the header is on (after any comment lines).
func (r *Reader) HeaderRow() int { return r.headerLine }

// Next returns the next row's fields and the line it starts on. The slice is
// reused by the next call.
func (r *Reader) Next() ([]string, int, error) {
	rec, err := r.cr.Read()
	if err == io.EOF {
		return nil, 0, io.EOF
	}
	if err != nil {
		return nil, 0, r.wrap(err)
	}
	line, _ := r.cr.FieldPos(0)
	if len(rec) != r.n {
		return rec, line, &RowError{Line: line, Err: fmt.Errorf("%w: %d fields, the header has %d", ErrFieldCount, len(rec), r.n)}
	}
	for i, f := range rec {
		if r.guard.high && !utf8.ValidString(f) {
			return rec, line, &RowError{Line: line, Column: i + 1, Name: r.cols[i].Name,
				Err: fmt.Errorf("%w (the file must be UTF-8 text)", ErrInvalidUTF8)}
		}
	}
	return rec, line, nil
}

func (r *Reader) wrap(err error) error {
	var tl *tooLong
	if errors.As(err, &tl) {
		return tl
	}
	var pe *stdcsv.ParseError
	if errors.As(err, &pe) {
		return fmt.Errorf("%w: line %d, column %d: %v", ErrSyntax, pe.Line, pe.Column, pe.Err)
	}
	return err
}

type tooLong struct {
	line, max int
}

func (e *tooLong) Error() string {
	return fmt.Sprintf("line %d: a row or field longer than %s; tidesift refuses records this large (is this really a table?)", e.line, human(e.max))
}

func (e *tooLong) Unwrap() error { return ErrRecordTooLong }

func human(n int) string {
	if n >= 1<<20 && n%(1<<20) == 0 {
		return fmt.Sprintf("%d MiB", n>>20)
	}
	if n >= 1<<10 && n%(1<<10) == 0 {
		return fmt.Sprintf("%d KiB", n>>10)
	}
	return fmt.Sprintf("%d bytes", n)
}

// guard sits between the source and encoding/csv. It drops a leading BOM,
// turns a lone CR into LF, and tracks the size of the current record (a
// quote-aware count, so a newline inside a quoted field does not reset it),
// failing as soon as one record exceeds max. It never buffers more than one
// read's worth of bytes.
type guard struct {
	r         io.Reader
	max       int
	bomCheck  bool
	inQuote   bool
	size      int  // bytes of the current record so far
	line      int  // current physical line (1-based)
	recLine   int  // line where the current record started
	pendCR    bool // last byte seen was a CR, not yet known whether LF follows
	comments  bool // '#' lines are comments
	inComment bool
	high      bool // a byte ≥ 0x80 has passed: fields need a UTF-8 check
	err       error
}

// special are the bytes guard looks at one by one.
var special = [256]bool{'\r': true, '\n': true, '"': true}

func (g *guard) Read(p []byte) (int, error) {
	for {
		if g.err != nil {
			return 0, g.err
		}
		if len(p) == 0 {
			return 0, nil
		}
		n, err := g.r.Read(p)
		b := p[:n]
		if g.bomCheck && n > 0 {
			// A BOM split across reads is vanishingly rare; only a whole one is dropped.
			b = bytes.TrimPrefix(b, []byte("\xef\xbb\xbf"))
			g.bomCheck = false
		}
		off := n - len(b) // 3 after a dropped BOM, else 0
		// Rewrite in place: CRLF and lone CR become LF (output never outgrows
		// input). Runs of ordinary bytes are counted and moved in one step.
		w := 0
		for i := 0; i < len(b); {
			c := b[i]
			if !special[c] {
				if g.size == 0 {
					g.recLine = g.line
					// encoding/csv skips a comment line whole, quotes included.
					g.inComment = g.comments && c == '#' && !g.inQuote
				}
				j := i
				var acc byte
				for j < len(b) && !special[b[j]] {
					acc |= b[j]
					j++
				}
				g.pendCR = false
				if acc >= utf8.RuneSelf {
					g.high = true
				}
				g.size += j - i
				if g.size > g.max {
					g.err = &tooLong{line: g.recLine, max: g.max}
					return 0, g.err
				}
				if w != off+i {
					copy(p[w:], b[i:j])
				}
				w += j - i
				i = j
				continue
			}
			i++
			switch c {
			case '\r':
				p[w] = '\n'
				w++
				g.pendCR = true
				if !g.endLine() {
					return 0, g.err
				}
				continue
			case '\n':
				if g.pendCR {
					g.pendCR = false
					continue
				}
				p[w] = '\n'
				w++
				if !g.endLine() {
					return 0, g.err
				}
				continue
			}
			// a quote
			if !g.inComment {
				g.inQuote = !g.inQuote
			}
			g.pendCR = false
			if g.size == 0 {
				g.recLine = g.line
			}
			g.size++
			if g.size > g.max {
				g.err = &tooLong{line: g.recLine, max: g.max}
				return 0, g.err
			}
			p[w] = c
			w++
		}
		if w > 0 || err != nil {
			return w, err
		}
	}
}

// endLine ends a physical line; it reports false when a quoted record
// spanning lines has grown past the cap.
func (g *guard) endLine() bool {
	g.line++
	g.inComment = false
	if !g.inQuote {
		g.size = 0
		return true
	}
	g.size++
	if g.size > g.max {
		g.err = &tooLong{line: g.recLine, max: g.max}
		return false
	}
	return true
}
