package votable

import (
	"bufio"
	"fmt"
	"io"
)

// guard sits between the input and the XML decoder, which reads it one byte
// at a time (it is an io.ByteReader, so the decoder does no buffering of its
// own and the reader can take over the raw bytes of a BINARY2 stream). It
// follows the markup just enough (text, tags with quoted attributes, comments,
// CDATA sections, processing instructions) to refuse, before the decoder
// buffers it, any single piece longer than max bytes, and to refuse document
// type and entity declarations at their first bytes.
type guard struct {
	br   *bufio.Reader
	max  int
	line int

	st   gstate
	run  int  // bytes in the current piece
	q    byte // open quote inside a tag
	last [2]byte
	err  error
}

type gstate uint8

const (
	gText     gstate = iota
	gLt              // just after '<'
	gBang            // after "<!"
	gBangDash        // after "<!-"
	gTag
	gComment
	gCDATA
	gPI
)

func newGuard(r io.Reader, max int) *guard {
	return &guard{br: bufio.NewReaderSize(r, 64<<10), max: max, line: 1}
}

// pieceName names the current piece for the limit error.
func (g *guard) pieceName() string {
	switch g.st {
	case gText:
		return "text"
	case gComment:
		return "comment"
	case gCDATA:
		return "CDATA section"
	case gPI:
		return "processing instruction"
	}
	return "tag"
}

func (g *guard) ReadByte() (byte, error) {
	if g.err != nil {
		return 0, g.err
	}
	c, err := g.br.ReadByte()
	if err != nil {
		return 0, err
	}
	if c == '\n' {
		g.line++
	}
	g.run++
	if g.run > g.max {
		g.err = fmt.Errorf("line %d: %w: a %s longer than %d bytes", g.line, ErrTooLarge, g.pieceName(), g.max)
		return 0, g.err
	}
	switch g.st {
	case gText:
		if c == '<' {
			g.set(gLt)
		}
	case gLt:
		switch c {
		case '!':
			g.st = gBang
		case '?':
			g.set(gPI)
		default:
			g.set(gTag)
			g.tag(c)
		}
	case gBang:
		switch c {
		case '-':
			g.st = gBangDash
		case '[':
			g.set(gCDATA)
		default:
			g.err = fmt.Errorf("line %d: %w", g.line, ErrDeclaration)
			return 0, g.err
		}
	case gBangDash:
		if c == '-' {
			g.set(gComment)
		} else {
			g.set(gTag) // malformed; the decoder reports it
		}
	case gTag:
		g.tag(c)
	case gComment:
		if c == '>' && g.last == [2]byte{'-', '-'} {
			g.set(gText)
		}
	case gCDATA:
		if c == '>' && g.last == [2]byte{']', ']'} {
			g.set(gText)
		}
	case gPI:
		if c == '>' && g.last[1] == '?' {
			g.set(gText)
		}
	}
	g.last[0], g.last[1] = g.last[1], c
	return c, nil
}

func (g *guard) tag(c byte) {
	switch {
	case g.q != 0:
		if c == g.q {
			g.q = 0
		}
	case c == '"' || c == '\'':
		g.q = c
	case c == '>':
		g.set(gText)
	}
}

func (g *guard) set(s gstate) {
	g.st, g.run, g.last = s, 0, [2]byte{}
}

func (g *guard) Read(p []byte) (int, error) {
	for i := range p {
		c, err := g.ReadByte()
		if err != nil {
			return i, err
		}
		p[i] = c
	}
	return len(p), nil
}

// base64Text is an io.Reader of the decoded bytes of the base64 text that
// follows in the guard's input, up to (not including) the next '<'. It reads
// the raw bytes itself, so a stream of any length passes without the decoder
// holding it; white space is skipped.
type base64Text struct {
	g    *guard
	enc  []byte // undecoded base64 characters carried over (fewer than 4)
	out  []byte // decoded bytes not yet returned
	buf  []byte // backing store of out
	done bool
	err  error
}

func (b *base64Text) Read(p []byte) (int, error) {
	for len(b.out) == 0 {
		if b.err != nil {
			return 0, b.err
		}
		if b.done {
			if len(b.enc) != 0 {
				b.err = fmt.Errorf("line %d: %w: base64 stream ends in the middle of a group", b.g.line, ErrBadStream)
				return 0, b.err
			}
			return 0, io.EOF
		}
		b.fill(max(len(p), 4096))
	}
	n := copy(p, b.out)
	b.out = b.out[n:]
	return n, nil
}

// fill reads up to about want decoded bytes' worth of base64 characters.
func (b *base64Text) fill(want int) {
	g := b.g
	need := (want + 2) / 3 * 4
	for len(b.enc) < need && !b.done {
		if _, err := g.br.Peek(1); err != nil {
			if err == io.EOF {
				err = fmt.Errorf("line %d: %w: input ends inside a STREAM", g.line, ErrBadStream)
			}
			b.err = err
			return
		}
		chunk, _ := g.br.Peek(g.br.Buffered())
		i := 0
		for ; i < len(chunk) && len(b.enc) < need; i++ {
			c := chunk[i]
			switch c {
			case '<':
				b.done = true
			case '\n':
				g.line++
				continue
			case ' ', '\t', '\r':
				continue
			default:
				b.enc = append(b.enc, c)
				continue
			}
			break
		}
		g.br.Discard(i)
	}
	n := len(b.enc) / 4 * 4
	if b.done {
		n = len(b.enc)
		if n%4 != 0 {
			n = n / 4 * 4
		}
	}
	if n == 0 {
		return
	}
	if len(b.buf) < n/4*3 {
		b.buf = make([]byte, n/4*3)
	}
	m, err := base64Std.Decode(b.buf, b.enc[:n])
	if err != nil {
		b.err = fmt.Errorf("line %d: %w: %v", g.line, ErrBadStream, err)
		return
	}
	b.out = b.buf[:m]
	b.enc = append(b.enc[:0], b.enc[n:]...)
	// The guard is still in text state; the bytes passed around it start no new piece.
	g.run = 0
}
