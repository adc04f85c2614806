package votable

import (
	"encoding/xml"
	"fmt"
	"strconv"
	"strings"

	"tidesift/importers/table"
)

// kind is a VOTable primitive datatype (the table of primitives of VOTable 1.4).
type kind uint8

const (
	kUnknown kind = iota
	kBoolean
	kBit
	kUnsignedByte
	kShort
	kInt
	kLong
	kChar
	kUnicodeChar
	kFloat
	kDouble
	kFloatComplex
	kDoubleComplex
)

var kinds = map[string]kind{
	"boolean": kBoolean, "bit": kBit, "unsignedByte": kUnsignedByte,
	"short": kShort, "int": kInt, "long": kLong,
	"char": kChar, "unicodeChar": kUnicodeChar,
	"float": kFloat, "double": kDouble,
	"floatComplex": kFloatComplex, "doubleComplex": kDoubleComplex,
}

// size is the number of bytes of one element in the binary serialisations
// (bit is packed and handled apart).
func (k kind) size() int {
	switch k {
	case kBoolean, kUnsignedByte, kChar:
		return 1
	case kShort, kUnicodeChar:
		return 2
	case kInt, kFloat:
		return 4
	case kLong, kDouble, kFloatComplex:
		return 8
	case kDoubleComplex:
		return 16
	}
	return 0
}

func (k kind) isFloat() bool {
	return k == kFloat || k == kDouble || k == kFloatComplex || k == kDoubleComplex
}

// maxElements bounds an array's element count (fixed or variable), so a
// corrupt length cannot make the reader allocate without bound.
const maxElements = 1 << 24

// field is one FIELD of the selected table.
type field struct {
	col      table.Column
	kind     kind
	count    int  // elements per value for a fixed arraysize (1 without one)
	variable bool // arraysize ends in '*': a 4-byte count precedes each value
	null     string
	hasNull  bool
}

// parseField reads a FIELD element, including its DESCRIPTION and VALUES.
func (rd *Reader) parseField(se xml.StartElement) (field, error) {
	f := field{count: 1}
	f.col.Name = strings.TrimSpace(attrv(se, "name"))
	if f.col.Name == "" {
		f.col.Name = strings.TrimSpace(attrv(se, "ID"))
	}
	f.col.Unit = strings.TrimSpace(attrv(se, "unit"))
	f.col.UCD = strings.TrimSpace(attrv(se, "ucd"))
	f.col.Datatype = strings.TrimSpace(attrv(se, "datatype"))
	f.kind = kinds[f.col.Datatype]
	if as, ok := attr(se, "arraysize"); ok {
		var err error
		if f.count, f.variable, err = parseArraysize(as); err != nil {
			return f, fmt.Errorf("line %d: FIELD %q: %w", rd.g.line, f.col.Name, err)
		}
	}
	depth := rd.depth
	for rd.depth >= depth {
		tok, err := rd.token()
		if err != nil {
			return f, rd.errf(err)
		}
		c, ok := tok.(xml.StartElement)
		if !ok || rd.depth != depth+1 {
			continue
		}
		switch c.Name.Local {
		case "DESCRIPTION":
			if f.col.Description, err = rd.textOf(); err != nil {
				return f, err
			}
		case "VALUES":
			if v, ok := attr(c, "null"); ok {
				f.null, f.hasNull = strings.TrimSpace(v), true
			}
			if err := rd.skipElement(); err != nil {
				return f, err
			}
		default:
			if err := rd.skipElement(); err != nil {
				return f, err
			}
		}
	}
	return f, nil
}

// parseArraysize reads "8", "*", "8*", "3x2", "3x*": the fixed element count
// (the product of the fixed dimensions) and whether the last one varies.
func parseArraysize(s string) (count int, variable bool, err error) {
	s = strings.TrimSpace(s)
	if s == "" {
		return 1, false, nil
	}
	count = 1
	dims := strings.Split(s, "x")
	for i, d := range dims {
		if i == len(dims)-1 && strings.HasSuffix(d, "*") {
			variable = true
			d = strings.TrimSuffix(d, "*")
			if d == "" {
				continue
			}
		}
		n, err := strconv.Atoi(d)
		if err != nil || n <= 0 {
			return 0, false, fmt.Errorf("arraysize %q: expected dimensions like 8, *, 8* or 3x2", s)
		}
		if count > maxElements/n {
			return 0, false, fmt.Errorf("arraysize %q: more than %d elements", s, maxElements)
		}
		count *= n
	}
	return count, variable, nil
}

// cell turns the text of a TD into a cell: "" for an empty TD, the FIELD's
// null value, or NaN in a floating-point field; else the text, trimmed of
// surrounding white space (as the canonical CSV is).
func (f *field) cell(text []byte) string {
	if len(text) == 0 {
		return ""
	}
	s := string(text)
	t := strings.TrimSpace(s)
	if t == "" || (f.hasNull && t == f.null) {
		return ""
	}
	if f.kind.isFloat() && strings.EqualFold(t, "nan") {
		return ""
	}
	return t
}
