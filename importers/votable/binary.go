package votable

import (
	"bufio"
	"encoding/binary"
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
	"unicode/utf16"
	"unicode/utf8"
)

// binReader decodes rows of the BINARY and BINARY2 serialisations as VOTable
// 1.4 defines them: per row, for BINARY2 a null-flag bitmap of
// ceil(nfields/8) bytes, most significant bit first for the first field; then
// each field in order, big-endian, a variable-length array preceded by its
// element count as a 4-byte integer.
type binReader struct {
	fields   []field
	r        *bufio.Reader
	flags    []byte
	buf      []byte
	nulls    bool // BINARY2
	maxBytes int
	sb       strings.Builder
}

func newBinReader(fields []field, src io.Reader, nulls bool, maxBytes int) (*binReader, error) {
	for _, f := range fields {
		if f.kind == kUnknown {
			if f.col.Datatype == "" {
				return nil, fmt.Errorf("FIELD %q: %w: a binary stream needs a datatype on every FIELD", f.col.Name, ErrBadStream)
			}
			return nil, fmt.Errorf("FIELD %q: datatype %q is %w", f.col.Name, f.col.Datatype, ErrUnsupported)
		}
	}
	b := &binReader{fields: fields, r: bufio.NewReaderSize(src, 64<<10), nulls: nulls, maxBytes: maxBytes}
	if nulls {
		b.flags = make([]byte, (len(fields)+7)/8)
	}
	return b, nil
}

// next decodes one row into cells; io.EOF when the stream ends between rows.
func (b *binReader) next(cells []string) error {
	if _, err := b.r.Peek(1); err != nil {
		return err // io.EOF at a row boundary is the normal end
	}
	if len(b.fields) == 0 {
		return fmt.Errorf("%w: data in a table without FIELDs", ErrBadStream)
	}
	if b.nulls {
		if err := b.read(b.flags); err != nil {
			return fmt.Errorf("null flags: %w", err)
		}
	}
	for i := range b.fields {
		f := &b.fields[i]
		n := f.count
		if f.variable {
			var c [4]byte
			if err := b.read(c[:]); err != nil {
				return fmt.Errorf("FIELD %q: array length: %w", f.col.Name, err)
			}
			v := binary.BigEndian.Uint32(c[:])
			if v > maxElements {
				return fmt.Errorf("FIELD %q: %w: array length %d exceeds %d", f.col.Name, ErrBadStream, v, maxElements)
			}
			n = int(v)
		}
		size := n * f.kind.size()
		if f.kind == kBit {
			size = (n + 7) / 8
		}
		if size > b.maxBytes {
			return fmt.Errorf("FIELD %q: %w: a value of %d bytes exceeds the %d-byte limit", f.col.Name, ErrBadStream, size, b.maxBytes)
		}
		if cap(b.buf) < size {
			b.buf = make([]byte, size)
		}
		v := b.buf[:size]
		if err := b.read(v); err != nil {
			return fmt.Errorf("FIELD %q: %w", f.col.Name, err)
		}
		if b.nulls && b.flags[i/8]&(0x80>>(i%8)) != 0 {
			cells[i] = ""
			continue
		}
		cells[i] = b.render(f, v, n)
	}
	return nil
}

func (b *binReader) read(p []byte) error {
	if _, err := io.ReadFull(b.r, p); err != nil {
		if errors.Is(err, io.EOF) || errors.Is(err, io.ErrUnexpectedEOF) {
			return fmt.Errorf("%w: the stream ends inside a row", ErrBadStream)
		}
		return err
	}
	return nil
}

// render formats n elements of kind f.kind held in v. Text kinds become their
// characters up to the first NUL; numbers their shortest decimal form, arrays
// space-separated as TABLEDATA writes them. A single NaN, or a single value
// equal to the FIELD's null, is "".
func (b *binReader) render(f *field, v []byte, n int) string {
	switch f.kind {
	case kChar:
		if i := indexByte(v, 0); i >= 0 {
			v = v[:i]
		}
		s := strings.TrimSpace(string(v))
		if !utf8.ValidString(s) {
			s = strings.ToValidUTF8(s, "\uFFFD")
		}
		return b.nullText(f, s)
	case kUnicodeChar:
		u := make([]uint16, 0, n)
		for i := 0; i+1 < len(v); i += 2 {
			c := binary.BigEndian.Uint16(v[i:])
			if c == 0 {
				break
			}
			u = append(u, c)
		}
		return b.nullText(f, strings.TrimSpace(string(utf16.Decode(u))))
	case kBit:
		var s strings.Builder
		for i := range n {
			if v[i/8]&(0x80>>(i%8)) != 0 {
				s.WriteByte('1')
			} else {
				s.WriteByte('0')
			}
		}
		return s.String()
	}
	if n == 1 {
		s, isNaN := element(f.kind, v)
		if isNaN {
			return ""
		}
		return b.nullText(f, s)
	}
	b.sb.Reset()
	step := f.kind.size()
	for i := range n {
		if i > 0 {
			b.sb.WriteByte(' ')
		}
		s, _ := element(f.kind, v[i*step:(i+1)*step])
		b.sb.WriteString(s)
	}
	return b.sb.String()
}

func (b *binReader) nullText(f *field, s string) string {
	if f.hasNull && s == f.null {
		return ""
	}
	return s
}

func indexByte(v []byte, c byte) int {
	for i, x := range v {
		if x == c {
			return i
		}
	}
	return -1
}

// element formats one big-endian element; isNaN reports a NaN float (or a
// complex with a NaN part) and a null boolean.
func element(k kind, v []byte) (s string, isNaN bool) {
	be := binary.BigEndian
	switch k {
	case kBoolean:
		switch v[0] {
		case 'T', 't', '1':
			return "T", false
		case 'F', 'f', '0':
			return "F", false
		}
		return "?", true
	case kUnsignedByte:
		return strconv.FormatUint(uint64(v[0]), 10), false
	case kShort:
		return strconv.FormatInt(int64(int16(be.Uint16(v))), 10), false
	case kInt:
		return strconv.FormatInt(int64(int32(be.Uint32(v))), 10), false
	case kLong:
		return strconv.FormatInt(int64(be.Uint64(v)), 10), false
	case kFloat:
		x := math.Float32frombits(be.Uint32(v))
		return strconv.FormatFloat(float64(x), 'g', -1, 32), x != x
	case kDouble:
		x := math.Float64frombits(be.Uint64(v))
		return strconv.FormatFloat(x, 'g', -1, 64), math.IsNaN(x)
	case kFloatComplex:
		re, _ := element(kFloat, v[:4])
		im, _ := element(kFloat, v[4:])
		return re + " " + im, re == "NaN" || im == "NaN"
	case kDoubleComplex:
		re, _ := element(kDouble, v[:8])
		im, _ := element(kDouble, v[8:])
		return re + " " + im, re == "NaN" || im == "NaN"
	}
	return "", false
}
