package json

import (
	"fmt"
	"io"
)

// LimitError reports input refused because it exceeds one of the Options
// limits. It names where the guard was when it stopped.
type LimitError struct {
	What  string // "nesting depth", "string length", "element size"
	Limit int
	Row   int // element index (array) or start line (stream) of the element
	Line  int // line of the offending byte
	array bool
}

func (e *LimitError) Error() string {
	where := fmt.Sprintf("line %d", e.Line)
	if e.array && e.Row > 0 {
		where = fmt.Sprintf("element %d (line %d)", e.Row, e.Line)
	}
	unit := " bytes"
	if e.What == "nesting depth" {
		unit = ""
	}
	return fmt.Sprintf("%s: %s exceeds the limit of %d%s", where, e.What, e.Limit, unit)
}

// guard sits between the input and the JSON decoder. It follows the byte
// stream just enough (strings, escapes, brackets) to bound nesting depth,
// string length and element size before the decoder buffers them, and it
// records the line on which each top-level element starts. The decoder reads
// ahead of what it has returned, so the guard is always ahead too; the bytes
// before a violation are passed on, so earlier elements are still read.
type guard struct {
	r     io.Reader
	opt   Options
	base  int // depth at which elements start: 1 in an array, 0 in a stream
	array bool

	depth   int
	inStr   bool
	esc     bool
	inTok   bool // inside a bare literal (number, true, ...) at element level
	strLen  int
	elemLen int
	line    int

	elems  int   // elements started
	first  int   // element number of starts[0]
	starts []int // start lines of elements from first on
	err    error
}

func (g *guard) startElement() {
	g.elems++
	if len(g.starts) == 0 {
		g.first = g.elems
	}
	g.starts = append(g.starts, g.line)
	g.elemLen = 0
}

// lineOf returns the start line of element n (1-based) and forgets earlier
// ones; n must not decrease between calls. It returns 0 if unknown.
func (g *guard) lineOf(n int) int {
	for len(g.starts) > 0 && g.first < n {
		g.starts = g.starts[1:]
		g.first++
	}
	if len(g.starts) == 0 || g.first != n {
		return 0
	}
	return g.starts[0]
}

func (g *guard) limit(what string, lim int) error {
	return &LimitError{What: what, Limit: lim, Row: g.rowNow(), Line: g.line, array: g.array}
}

func (g *guard) rowNow() int {
	if g.array {
		return g.elems
	}
	if len(g.starts) > 0 {
		return g.starts[len(g.starts)-1]
	}
	return g.line
}

func (g *guard) Read(p []byte) (int, error) {
	if g.err != nil {
		return 0, g.err
	}
	n, err := g.r.Read(p)
	for i := 0; i < n; i++ {
		c := p[i]
		if c == '\n' {
			g.line++
		}
		if g.depth > g.base {
			g.elemLen++
			if g.elemLen > g.opt.MaxElement {
				g.err = g.limit("element size", g.opt.MaxElement)
				return i, g.err
			}
		}
		if g.inStr {
			switch {
			case g.esc:
				g.esc = false
			case c == '\\':
				g.esc = true
			case c == '"':
				g.inStr = false
				continue
			}
			g.strLen++
			if g.strLen > g.opt.MaxString {
				g.err = g.limit("string length", g.opt.MaxString)
				return i, g.err
			}
			continue
		}
		switch c {
		case ' ', '\t', '\r', '\n', ',', ':':
			g.inTok = false
		case '"':
			if g.depth == g.base && !g.inTok {
				g.startElement()
			}
			g.inStr, g.strLen, g.inTok = true, 0, false
		case '{', '[':
			if g.depth == g.base {
				g.startElement()
				g.elemLen = 1
			}
			g.inTok = false
			g.depth++
			if g.depth > g.opt.MaxDepth {
				g.err = g.limit("nesting depth", g.opt.MaxDepth)
				return i, g.err
			}
		case '}', ']':
			g.inTok = false
			if g.depth > 0 {
				g.depth--
			}
		default:
			if g.depth == g.base && !g.inTok {
				g.startElement()
				g.inTok = true
			}
		}
	}
	return n, err
}
