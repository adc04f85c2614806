package votable

import (
	"encoding/base64"
	"encoding/xml"
	"errors"
	"fmt"
	"io"
	"strconv"
	"strings"

	"tidesift/importers/table"
)

var base64Std = base64.StdEncoding

// Default limits; see Options.
const (
	DefaultMaxToken = 1 << 20
	DefaultMaxDepth = 64
)

// Errors returned by NewReader, Next and Tables, wrapped with the line (and
// row) where they arose. Test with errors.Is.
var (
	// ErrNotVOTable is returned when the root element is not VOTABLE.
	ErrNotVOTable = errors.New("not a VOTable document (expected a VOTABLE root element)")
	// ErrDeclaration is returned for any <!DOCTYPE, <!ENTITY or other
	// declaration: VOTables need none, and entity expansion is an attack.
	ErrDeclaration = errors.New("document type and entity declarations (<!DOCTYPE, <!ENTITY ...) are not allowed in a VOTable")
	// ErrTooLarge is returned for one text, tag, comment or CDATA section
	// longer than Options.MaxToken, or markup nested deeper than Options.MaxDepth.
	ErrTooLarge = errors.New("input exceeds a size limit")
	// ErrNoTable is returned when the document holds no TABLE.
	ErrNoTable = errors.New("the VOTable holds no TABLE")
	// ErrTableNotFound is returned when Options.Table matches no TABLE.
	ErrTableNotFound = errors.New("no such TABLE")
	// ErrUnsupported is returned for a serialisation or encoding this reader
	// does not decode (FITS, a gzip STREAM, an unknown datatype).
	ErrUnsupported = errors.New("not supported")
	// ErrRemoteStream is returned for a STREAM with an href: tidesift never
	// fetches data named by a file.
	ErrRemoteStream = errors.New("STREAM with href refused: tidesift does not fetch external or remote data; embed the data in the file (TABLEDATA or BINARY2 base64)")
	// ErrBadStream is returned for a BINARY or BINARY2 stream that does not
	// decode (bad base64, a truncated row, an impossible array length).
	ErrBadStream = errors.New("malformed binary stream")
	// ErrBadRow is returned for a TR with more TD cells than the table has FIELDs,
	// or markup inside a TD.
	ErrBadRow = errors.New("malformed table row")
)

// Options adjust NewReader. The zero value reads the first TABLE.
type Options struct {
	// Table selects the TABLE to read: its name, else its ID, else its
	// 1-based position in the document. "" reads the first TABLE.
	Table string
	// MaxToken bounds any single piece of markup (a text, a tag, a comment,
	// a CDATA section) in bytes (0: DefaultMaxToken). Base64 STREAM content
	// is read as a stream and is not bounded by it.
	MaxToken int
	// MaxDepth bounds the nesting of elements (0: DefaultMaxDepth).
	MaxDepth int

	listOnly bool // select no table; used by Tables
}

// TableInfo describes one TABLE of a document.
type TableInfo struct {
	Index         int    // 1-based position in the document
	Name          string // name attribute, "" if none
	ID            string // ID attribute, "" if none
	Resource      string // name (else ID) of the enclosing RESOURCE, "" if none
	Description   string // the TABLE's DESCRIPTION, trimmed
	Fields        int    // number of FIELDs
	Serialization string // "TABLEDATA", "BINARY2", "BINARY", "FITS", or "" without DATA
}

// String names the table for messages: 2 "moons" (ID t2).
func (t TableInfo) String() string {
	s := strconv.Itoa(t.Index)
	if t.Name != "" {
		s += " " + strconv.Quote(t.Name)
	}
	if t.ID != "" {
		s += " (ID " + t.ID + ")"
	}
	return s
}

func listTables(ts []TableInfo) string {
	var b strings.Builder
	for i, t := range ts {
		if i > 0 {
			b.WriteString(", ")
		}
		b.WriteString(t.String())
	}
	return b.String()
}

type mode uint8

const (
	modeNone mode = iota // the table has no DATA
	modeTableData
	modeBinary  // BINARY: no null flags
	modeBinary2 // BINARY2: a null-flag bitmap before each row
)

// Reader reads the rows of one TABLE. It implements table.Reader.
type Reader struct {
	opt Options
	g   *guard
	dec *xml.Decoder

	version  string
	tables   []TableInfo
	sel      int // index into tables of the selected table, -1 before
	resStack []string
	depth    int

	fields []field
	cols   []table.Column
	cells  []string
	mode   mode
	row    int
	bin    *binReader
	text   []byte

	warnings []string
	done     bool
	err      error
}

var _ table.Reader = (*Reader)(nil)

// NewReader parses r up to the first row of the selected TABLE. It returns an
// error for a document that is not a VOTable, that declares a DOCTYPE or
// entities, whose selected table uses FITS or a remote STREAM, or when no
// TABLE matches Options.Table (the message lists the tables present).
func NewReader(r io.Reader, opt Options) (*Reader, error) {
	if opt.MaxToken <= 0 {
		opt.MaxToken = DefaultMaxToken
	}
	if opt.MaxDepth <= 0 {
		opt.MaxDepth = DefaultMaxDepth
	}
	rd := &Reader{opt: opt, sel: -1}
	rd.g = newGuard(r, opt.MaxToken)
	// A UTF-8 byte-order mark is allowed before the XML declaration; the
	// decoder would take it for text.
	if b, err := rd.g.br.Peek(3); err == nil && string(b) == "\xEF\xBB\xBF" {
		rd.g.br.Discard(3)
	}
	rd.dec = xml.NewDecoder(rd.g)
	rd.dec.Strict = true
	if err := rd.root(); err != nil {
		return nil, err
	}
	found, err := rd.seek()
	if err != nil {
		return nil, err
	}
	if !found {
		if len(rd.tables) == 0 {
			return nil, ErrNoTable
		}
		if opt.listOnly {
			return rd, nil
		}
		return nil, fmt.Errorf("%w: %q; the document has %s (choose by name, ID or 1-based position)",
			ErrTableNotFound, opt.Table, listTables(rd.tables))
	}
	return rd, nil
}

// Tables lists the TABLEs of a VOTable document, reading it to the end.
func Tables(r io.Reader) ([]TableInfo, error) {
	rd, err := NewReader(r, Options{listOnly: true})
	if err != nil {
		if errors.Is(err, ErrNoTable) {
			return nil, nil
		}
		return nil, err
	}
	return rd.tables, nil
}

// Columns returns one column per FIELD of the selected table.
func (rd *Reader) Columns() []table.Column { return rd.cols }

// Table describes the selected table.
func (rd *Reader) Table() TableInfo { return rd.tables[rd.sel] }

// Tables lists the tables seen so far; after Next has returned io.EOF, all of
// the document's tables.
func (rd *Reader) Tables() []TableInfo { return rd.tables }

// Version is the VOTABLE element's version attribute ("1.4"), "" if absent.
func (rd *Reader) Version() string { return rd.version }

// Warnings returns notes for the user gathered by the end of the document:
// for now, that the document holds several tables and which one was read.
// It is complete after Next has returned io.EOF.
func (rd *Reader) Warnings() []string { return rd.warnings }

// errf wraps err with the current line unless it carries a position already.
func (rd *Reader) errf(err error) error {
	var se *xml.SyntaxError
	if errors.As(err, &se) || errors.Is(err, ErrTooLarge) || errors.Is(err, ErrDeclaration) || errors.Is(err, ErrBadStream) {
		return err
	}
	if err == io.EOF {
		err = fmt.Errorf("%w: the document ends before its VOTABLE element is closed", io.ErrUnexpectedEOF)
	}
	return fmt.Errorf("line %d: %w", rd.g.line, err)
}

// token returns the next token, refusing directives and deep nesting.
func (rd *Reader) token() (xml.Token, error) {
	tok, err := rd.dec.Token()
	if err != nil {
		return nil, err
	}
	switch tok.(type) {
	case xml.StartElement:
		rd.depth++
		if rd.depth > rd.opt.MaxDepth {
			return nil, fmt.Errorf("line %d: %w: elements nested deeper than %d", rd.g.line, ErrTooLarge, rd.opt.MaxDepth)
		}
	case xml.EndElement:
		rd.depth--
	case xml.Directive: // the guard refuses these first; kept as a second line
		return nil, fmt.Errorf("line %d: %w", rd.g.line, ErrDeclaration)
	}
	return tok, nil
}

func attr(se xml.StartElement, name string) (string, bool) {
	for _, a := range se.Attr {
		if a.Name.Local == name {
			return a.Value, true
		}
	}
	return "", false
}

func attrv(se xml.StartElement, name string) string {
	v, _ := attr(se, name)
	return v
}

// root reads up to the VOTABLE start element.
func (rd *Reader) root() error {
	for {
		tok, err := rd.token()
		if err == io.EOF {
			return fmt.Errorf("%w: the input is empty", ErrNotVOTable)
		}
		if err != nil {
			return rd.errf(err)
		}
		switch t := tok.(type) {
		case xml.StartElement:
			if t.Name.Local != "VOTABLE" {
				return fmt.Errorf("line %d: %w; found <%s>", rd.g.line, ErrNotVOTable, t.Name.Local)
			}
			rd.version = attrv(t, "version")
			return nil
		case xml.CharData:
			if len(strings.TrimSpace(string(t))) != 0 {
				return fmt.Errorf("line %d: %w; found text before the root element", rd.g.line, ErrNotVOTable)
			}
		}
	}
}

// selects reports whether the table t is the one Options.Table asks for.
func (rd *Reader) selects(t TableInfo) bool {
	if rd.opt.listOnly || rd.sel >= 0 {
		return false
	}
	want := rd.opt.Table
	if want == "" {
		return true
	}
	if t.Name == want || t.ID == want {
		return true
	}
	n, err := strconv.Atoi(want)
	return err == nil && n == t.Index
}

// seek walks the document until the selected table's data begins (true), or
// to the end of the document (false).
func (rd *Reader) seek() (bool, error) {
	for {
		tok, err := rd.token()
		if err == io.EOF {
			return false, rd.errf(err) // the root is still open
		}
		if err != nil {
			return false, rd.errf(err)
		}
		switch t := tok.(type) {
		case xml.StartElement:
			switch t.Name.Local {
			case "RESOURCE":
				name := attrv(t, "name")
				if name == "" {
					name = attrv(t, "ID")
				}
				rd.resStack = append(rd.resStack, name)
			case "TABLE":
				info := TableInfo{Index: len(rd.tables) + 1, Name: attrv(t, "name"), ID: attrv(t, "ID")}
				if n := len(rd.resStack); n > 0 {
					info.Resource = rd.resStack[n-1]
				}
				rd.tables = append(rd.tables, info)
				ti := &rd.tables[len(rd.tables)-1]
				if rd.selects(*ti) {
					rd.sel = len(rd.tables) - 1
					if err := rd.openTable(ti); err != nil {
						return false, err
					}
					return true, nil
				}
				if err := rd.skipTable(ti); err != nil {
					return false, err
				}
			case "STREAM":
				if err := rd.skipStream(); err != nil {
					return false, err
				}
			}
		case xml.EndElement:
			switch t.Name.Local {
			case "RESOURCE":
				if n := len(rd.resStack); n > 0 {
					rd.resStack = rd.resStack[:n-1]
				}
			case "VOTABLE":
				if rd.depth == 0 {
					return false, rd.end()
				}
			}
		}
	}
}

// end checks that nothing but white space, comments and processing
// instructions follows the root element.
func (rd *Reader) end() error {
	for {
		tok, err := rd.token()
		if err == io.EOF {
			return nil
		}
		if err != nil {
			return rd.errf(err)
		}
		switch t := tok.(type) {
		case xml.StartElement:
			return fmt.Errorf("line %d: %w; found <%s> after the VOTABLE element", rd.g.line, ErrNotVOTable, t.Name.Local)
		case xml.CharData:
			if len(strings.TrimSpace(string(t))) != 0 {
				return fmt.Errorf("line %d: %w; found text after the VOTABLE element", rd.g.line, ErrNotVOTable)
			}
		}
	}
}

// skipStream passes over the content of a STREAM element not being read,
// without letting the decoder hold it (it may be a large base64 text).
func (rd *Reader) skipStream() error {
	b := &base64Text{g: rd.g}
	for !b.done {
		if _, err := rd.g.br.Peek(1); err != nil {
			return rd.errf(err)
		}
		chunk, _ := rd.g.br.Peek(rd.g.br.Buffered())
		i := 0
		for ; i < len(chunk); i++ {
			if chunk[i] == '<' {
				b.done = true
				break
			}
			if chunk[i] == '\n' {
				rd.g.line++
			}
		}
		rd.g.br.Discard(i)
	}
	rd.g.run = 0
	return nil
}

// skipElement passes over the rest of the element just started.
func (rd *Reader) skipElement() error {
	depth := rd.depth
	for rd.depth >= depth {
		tok, err := rd.token()
		if err != nil {
			return rd.errf(err)
		}
		if se, ok := tok.(xml.StartElement); ok && se.Name.Local == "STREAM" {
			if err := rd.skipStream(); err != nil {
				return err
			}
		}
	}
	return nil
}

// text reads the character data of the element just started, up to its end.
func (rd *Reader) textOf() (string, error) {
	var b strings.Builder
	depth := rd.depth
	for rd.depth >= depth {
		tok, err := rd.token()
		if err != nil {
			return "", rd.errf(err)
		}
		if cd, ok := tok.(xml.CharData); ok && rd.depth == depth {
			if b.Len()+len(cd) > rd.opt.MaxToken {
				return "", fmt.Errorf("line %d: %w: text longer than %d bytes", rd.g.line, ErrTooLarge, rd.opt.MaxToken)
			}
			b.Write(cd)
		}
	}
	return strings.TrimSpace(b.String()), nil
}

// skipTable passes over a table not selected, noting its fields and
// serialisation for Tables.
func (rd *Reader) skipTable(ti *TableInfo) error {
	depth := rd.depth
	inData := false
	for rd.depth >= depth {
		tok, err := rd.token()
		if err != nil {
			return rd.errf(err)
		}
		se, ok := tok.(xml.StartElement)
		if !ok {
			if ee, ok := tok.(xml.EndElement); ok && ee.Name.Local == "DATA" {
				inData = false
			}
			continue
		}
		switch {
		case se.Name.Local == "STREAM":
			if err := rd.skipStream(); err != nil {
				return err
			}
		case rd.depth == depth+1 && se.Name.Local == "FIELD":
			ti.Fields++
			if err := rd.skipElement(); err != nil {
				return err
			}
		case rd.depth == depth+1 && se.Name.Local == "DESCRIPTION":
			if ti.Description, err = rd.textOf(); err != nil {
				return err
			}
		case rd.depth == depth+1 && se.Name.Local == "DATA":
			inData = true
		case inData && rd.depth == depth+2:
			ti.Serialization = se.Name.Local
			if se.Name.Local == "TABLEDATA" {
				if err := rd.skipElement(); err != nil {
					return err
				}
			}
		case rd.depth > depth+1 && !inData:
			if err := rd.skipElement(); err != nil {
				return err
			}
		}
	}
	return nil
}

// openTable reads the selected table's FIELDs up to the start of its data.
func (rd *Reader) openTable(ti *TableInfo) error {
	depth := rd.depth
	for {
		tok, err := rd.token()
		if err != nil {
			return rd.errf(err)
		}
		if _, ok := tok.(xml.EndElement); ok && rd.depth < depth {
			// The table ends without DATA: no rows.
			rd.mode = modeNone
			rd.setColumns()
			return nil
		}
		se, ok := tok.(xml.StartElement)
		if !ok {
			continue
		}
		switch se.Name.Local {
		case "FIELD":
			f, err := rd.parseField(se)
			if err != nil {
				return err
			}
			rd.fields = append(rd.fields, f)
			ti.Fields++
		case "DESCRIPTION":
			if ti.Description, err = rd.textOf(); err != nil {
				return err
			}
		case "DATA":
			rd.setColumns()
			return rd.openData(ti)
		default: // PARAM, GROUP, LINK, INFO, FIELDref, ...
			if err := rd.skipElement(); err != nil {
				return err
			}
		}
	}
}

func (rd *Reader) setColumns() {
	rd.cols = make([]table.Column, len(rd.fields))
	for i, f := range rd.fields {
		rd.cols[i] = f.col
	}
	rd.cells = make([]string, len(rd.fields))
}

// openData reads the serialisation element inside DATA.
func (rd *Reader) openData(ti *TableInfo) error {
	for {
		tok, err := rd.token()
		if err != nil {
			return rd.errf(err)
		}
		if _, ok := tok.(xml.EndElement); ok { // empty DATA
			rd.mode = modeNone
			return nil
		}
		se, ok := tok.(xml.StartElement)
		if !ok {
			continue
		}
		ti.Serialization = se.Name.Local
		switch se.Name.Local {
		case "TABLEDATA":
			rd.mode = modeTableData
			return nil
		case "BINARY", "BINARY2":
			rd.mode = modeBinary2
			if se.Name.Local == "BINARY" {
				rd.mode = modeBinary
			}
			return rd.openStream(se.Name.Local)
		case "FITS":
			return fmt.Errorf("line %d: table %s: FITS serialisation is %w; convert the table to TABLEDATA or BINARY2", rd.g.line, ti, ErrUnsupported)
		default:
			return fmt.Errorf("line %d: table %s: serialisation <%s> is %w (expected TABLEDATA, BINARY2 or BINARY)", rd.g.line, ti, se.Name.Local, ErrUnsupported)
		}
	}
}

// openStream reads up to the content of the STREAM inside BINARY/BINARY2.
func (rd *Reader) openStream(ser string) error {
	for {
		tok, err := rd.token()
		if err != nil {
			return rd.errf(err)
		}
		if _, ok := tok.(xml.EndElement); ok {
			return fmt.Errorf("line %d: %w: %s holds no STREAM", rd.g.line, ErrBadStream, ser)
		}
		se, ok := tok.(xml.StartElement)
		if !ok {
			continue
		}
		if se.Name.Local != "STREAM" {
			return fmt.Errorf("line %d: %w: expected STREAM in %s, found <%s>", rd.g.line, ErrBadStream, ser, se.Name.Local)
		}
		if href, ok := attr(se, "href"); ok {
			return fmt.Errorf("line %d: %w (href %q)", rd.g.line, ErrRemoteStream, href)
		}
		if enc := attrv(se, "encoding"); enc != "base64" {
			return fmt.Errorf("line %d: STREAM encoding %q is %w (expected encoding=\"base64\")", rd.g.line, enc, ErrUnsupported)
		}
		bin, err := newBinReader(rd.fields, &base64Text{g: rd.g}, rd.mode == modeBinary2, rd.opt.MaxToken)
		if err != nil {
			return fmt.Errorf("line %d: %w", rd.g.line, err)
		}
		rd.bin = bin
		return nil
	}
}

// Next returns the next row: the 1-based TR index (TABLEDATA) or row index
// (BINARY2). See table.Reader.
func (rd *Reader) Next() ([]string, int, error) {
	if rd.done {
		return nil, 0, rd.err
	}
	var err error
	switch rd.mode {
	case modeTableData:
		err = rd.nextTR()
	case modeBinary, modeBinary2:
		err = rd.bin.next(rd.cells)
		if err == nil {
			rd.row++
		} else if err != io.EOF {
			err = fmt.Errorf("row %d: %w", rd.row+1, err)
		}
	default:
		err = io.EOF
	}
	if err == io.EOF {
		err = rd.finish()
	}
	if err != nil {
		rd.done, rd.err = true, err
		return nil, 0, err
	}
	return rd.cells, rd.row, nil
}

// finish reads the rest of the document, listing its other tables, and
// returns io.EOF, or the error that stopped it.
func (rd *Reader) finish() error {
	if _, err := rd.seek(); err != nil {
		return err
	}
	if len(rd.tables) > 1 && rd.opt.Table == "" {
		rd.warnings = append(rd.warnings, fmt.Sprintf("the document has %d tables (%s); read table %s (choose another by name, ID or position)",
			len(rd.tables), listTables(rd.tables), rd.tables[rd.sel]))
	}
	return io.EOF
}

// nextTR reads one TR into rd.cells.
func (rd *Reader) nextTR() error {
	for {
		tok, err := rd.token()
		if err != nil {
			return rd.errf(err)
		}
		switch t := tok.(type) {
		case xml.StartElement:
			if t.Name.Local != "TR" {
				return fmt.Errorf("line %d: %w: expected TR in TABLEDATA, found <%s>", rd.g.line, ErrBadRow, t.Name.Local)
			}
			rd.row++
			return rd.readTR()
		case xml.EndElement: // TABLEDATA ends
			return io.EOF
		}
	}
}

func (rd *Reader) readTR() error {
	for i := range rd.cells {
		rd.cells[i] = ""
	}
	n := 0
	for {
		tok, err := rd.token()
		if err != nil {
			return rd.errf(err)
		}
		switch t := tok.(type) {
		case xml.EndElement: // TR
			return nil
		case xml.StartElement:
			if t.Name.Local != "TD" {
				return fmt.Errorf("line %d, TR %d: %w: expected TD, found <%s>", rd.g.line, rd.row, ErrBadRow, t.Name.Local)
			}
			if n >= len(rd.fields) {
				return fmt.Errorf("line %d, TR %d: %w: more TD cells than the %d FIELDs", rd.g.line, rd.row, ErrBadRow, len(rd.fields))
			}
			if err := rd.readTD(n); err != nil {
				return err
			}
			n++
		}
	}
}

func (rd *Reader) readTD(i int) error {
	rd.text = rd.text[:0]
	for {
		tok, err := rd.token()
		if err != nil {
			return rd.errf(err)
		}
		switch t := tok.(type) {
		case xml.CharData:
			if len(rd.text)+len(t) > rd.opt.MaxToken {
				return fmt.Errorf("line %d, TR %d: %w: TD longer than %d bytes", rd.g.line, rd.row, ErrTooLarge, rd.opt.MaxToken)
			}
			rd.text = append(rd.text, t...)
		case xml.StartElement:
			return fmt.Errorf("line %d, TR %d: %w: element <%s> inside a TD", rd.g.line, rd.row, ErrBadRow, t.Name.Local)
		case xml.EndElement:
			rd.cells[i] = rd.fields[i].cell(rd.text)
			return nil
		}
	}
}
