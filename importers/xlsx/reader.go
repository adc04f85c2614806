package xlsx

import (
	"archive/zip"
	"errors"
	"fmt"
	"io"
	"os"
	"strconv"
	"strings"

	"github.com/xuri/excelize/v2"

	"tidesift/importers/table"
	"tidesift/schema"
)

// Default limits; see Options.
const (
	// DefaultMaxUnzip bounds the total uncompressed size of a workbook's parts.
	DefaultMaxUnzip = 256 << 20
	// DefaultMaxUnzipXML bounds the part size held in memory; a larger
	// worksheet or shared-string part is unzipped to a temporary file and read
	// from there, so memory stays flat whatever the sheet's size.
	DefaultMaxUnzipXML = 16 << 20
	// DefaultScanRows is how many rows are searched for the header.
	DefaultScanRows = 100
)

// Errors returned by NewReader and Next. Test with errors.Is.
var (
	// ErrTooLarge is returned for a workbook whose parts would unzip to more
	// than Options.MaxUnzip bytes in all (a zip bomb, or simply too big).
	ErrTooLarge = errors.New("workbook too large")
	// ErrNotXLSX is returned for input that is not an XLSX (zip) workbook.
	ErrNotXLSX = errors.New("not an XLSX workbook")
	// ErrNoSheet is returned when Options.Sheet names no sheet.
	ErrNoSheet = errors.New("no such sheet")
	// ErrNoHeader is returned when no header row is found.
	ErrNoHeader = errors.New("no header row found")
	// ErrBeyondHeader is returned for a data cell to the right of the last
	// header cell: data without a column name.
	ErrBeyondHeader = errors.New("value in a column without a header")
)

// Options adjust NewReader. The zero value reads the first sheet and finds
// the header row.
type Options struct {
	// Sheet is the name of the sheet to read; "" reads the first sheet.
	Sheet string
	// HeaderRow is the 1-based sheet row holding the column names; 0 finds
	// it (see the package documentation).
	HeaderRow int
	// MaxUnzip bounds the total uncompressed size of the workbook's parts, and
	// the size of the input itself (0: DefaultMaxUnzip).
	MaxUnzip int64
	// MaxUnzipXML is the largest part held in memory (0: DefaultMaxUnzipXML,
	// never above MaxUnzip).
	MaxUnzipXML int64
	// TmpDir is where the input is spooled, when it is not a regular file, and
	// where large parts are unzipped ("" for the system default).
	TmpDir string
}

// Reader reads the rows of one sheet. It implements table.Reader. Temporary
// files (large parts) are removed when Next reaches the end or an error, or by
// Close, which a caller that stops early should call.
type Reader struct {
	f         *excelize.File
	rows      *excelize.Rows
	sheet     string
	sheets    []string
	header    int // sheet row of the header
	cols      []table.Column
	cells     []string
	sheetRow  int      // sheet row of the last row read from rows
	pending   []bufRow // rows read while finding the header, to return first
	done      bool
	err       error
	rawOption excelize.Options
}

type bufRow struct {
	n     int
	cells []string
}

var _ table.Reader = (*Reader)(nil)

// NewReader opens an XLSX workbook and positions the reader after the header
// row of the chosen sheet. An *os.File for a regular file is opened by name;
// any other reader is first copied to a temporary file (the zip format needs
// random access), at most Options.MaxUnzip bytes.
func NewReader(r io.Reader, opt Options) (*Reader, error) {
	if opt.MaxUnzip <= 0 {
		opt.MaxUnzip = DefaultMaxUnzip
	}
	if opt.MaxUnzipXML <= 0 {
		opt.MaxUnzipXML = DefaultMaxUnzipXML
	}
	opt.MaxUnzipXML = min(opt.MaxUnzipXML, opt.MaxUnzip)
	path, cleanup, err := localFile(r, opt)
	if err != nil {
		return nil, err
	}
	f, err := excelize.OpenFile(path, excelize.Options{
		UnzipSizeLimit:    opt.MaxUnzip,
		UnzipXMLSizeLimit: opt.MaxUnzipXML,
		RawCellValue:      true,
		TmpDir:            opt.TmpDir,
	})
	cleanup() // OpenFile has read what it needs and closed the file
	if err != nil {
		if f != nil {
			f.Close()
		}
		return nil, openError(err, opt)
	}
	rd := &Reader{f: f, rawOption: excelize.Options{RawCellValue: true}}
	if err := rd.start(opt); err != nil {
		rd.Close()
		return nil, err
	}
	return rd, nil
}

// localFile returns the path of a regular file holding the input, spooling it
// if needed; cleanup removes any spool.
func localFile(r io.Reader, opt Options) (path string, cleanup func(), err error) {
	if f, ok := r.(*os.File); ok {
		if st, err := f.Stat(); err == nil && st.Mode().IsRegular() {
			if off, err := f.Seek(0, io.SeekCurrent); err == nil && off == 0 {
				if st.Size() > opt.MaxUnzip {
					return "", nil, fmt.Errorf("%w: the file is %d bytes, above the %d-byte limit", ErrTooLarge, st.Size(), opt.MaxUnzip)
				}
				return f.Name(), func() {}, nil
			}
		}
	}
	tmp, err := os.CreateTemp(opt.TmpDir, "tidesift-xlsx-*.xlsx")
	if err != nil {
		return "", nil, fmt.Errorf("spool workbook: %w", err)
	}
	cleanup = func() {
		tmp.Close()
		os.Remove(tmp.Name())
	}
	n, err := io.Copy(tmp, io.LimitReader(r, opt.MaxUnzip+1))
	if err == nil && n > opt.MaxUnzip {
		err = fmt.Errorf("%w: the input is above the %d-byte limit", ErrTooLarge, opt.MaxUnzip)
	}
	if err == nil {
		err = tmp.Close()
	}
	if err != nil {
		cleanup()
		if errors.Is(err, ErrTooLarge) {
			return "", nil, err
		}
		return "", nil, fmt.Errorf("spool workbook: %w", err)
	}
	return tmp.Name(), cleanup, nil
}

func openError(err error, opt Options) error {
	msg := err.Error()
	switch {
	case strings.Contains(msg, "unzip size exceeds"):
		return fmt.Errorf("%w: its parts unzip to more than %d bytes (a zip bomb, or too big to import; split it or export CSV)", ErrTooLarge, opt.MaxUnzip)
	case errors.Is(err, zip.ErrFormat), errors.Is(err, zip.ErrAlgorithm), errors.Is(err, zip.ErrChecksum):
		return fmt.Errorf("%w: %v", ErrNotXLSX, err)
	case errors.Is(err, excelize.ErrWorkbookFileFormat):
		return fmt.Errorf("%w: %v (an encrypted or old binary .xls workbook? save it as .xlsx)", ErrNotXLSX, err)
	}
	return fmt.Errorf("%w: %v", ErrNotXLSX, err)
}

func (rd *Reader) start(opt Options) error {
	rd.sheets = rd.f.GetSheetList()
	if len(rd.sheets) == 0 {
		return fmt.Errorf("%w: the workbook has no sheets", ErrNoSheet)
	}
	rd.sheet = rd.sheets[0]
	if opt.Sheet != "" {
		rd.sheet = ""
		for _, s := range rd.sheets {
			if s == opt.Sheet {
				rd.sheet = s
			}
		}
		if rd.sheet == "" {
			for _, s := range rd.sheets {
				if strings.EqualFold(s, opt.Sheet) {
					rd.sheet = s
				}
			}
		}
		if rd.sheet == "" {
			return fmt.Errorf("%w: %q; the workbook has %s", ErrNoSheet, opt.Sheet, quoteList(rd.sheets))
		}
	}
	rows, err := rd.f.Rows(rd.sheet)
	if err != nil {
		return fmt.Errorf("sheet %q: %w", rd.sheet, err)
	}
	rd.rows = rows
	return rd.findHeader(opt)
}

func quoteList(ss []string) string {
	q := make([]string, len(ss))
	for i, s := range ss {
		q[i] = strconv.Quote(s)
	}
	return strings.Join(q, ", ")
}

// readRow reads the next sheet row (empty rows included); ok is false at the end.
func (rd *Reader) readRow() (cells []string, ok bool, err error) {
	if !rd.rows.Next() {
		if err := rd.rows.Error(); err != nil {
			return nil, false, fmt.Errorf("sheet %q, row %d: %w", rd.sheet, rd.sheetRow+1, err)
		}
		return nil, false, nil
	}
	rd.sheetRow++
	cells, err = rd.rows.Columns(rd.rawOption)
	if err != nil {
		return nil, false, fmt.Errorf("sheet %q, row %d: %w", rd.sheet, rd.sheetRow, err)
	}
	return cells, true, nil
}

// findHeader reads rows up to the header. With Options.HeaderRow it is that
// row. Otherwise it is the first row, among the first DefaultScanRows, that
// has a "name" cell and at least two other cells that look like canonical
// headers; failing that, the first row with at least two non-empty cells, all
// of them text.
func (rd *Reader) findHeader(opt Options) error {
	var scanned []bufRow
	fallback := -1
	for {
		cells, ok, err := rd.readRow()
		if err != nil {
			return err
		}
		if !ok {
			break
		}
		if opt.HeaderRow > 0 {
			if rd.sheetRow == opt.HeaderRow {
				rd.setHeader(rd.sheetRow, cells)
				return nil
			}
			continue
		}
		if looksLikeHeader(cells) {
			rd.setHeader(rd.sheetRow, cells)
			return nil
		}
		scanned = append(scanned, bufRow{rd.sheetRow, cells})
		if fallback < 0 && allText(cells) >= 2 {
			fallback = len(scanned) - 1
		}
		if rd.sheetRow >= DefaultScanRows {
			break
		}
	}
	if opt.HeaderRow > 0 {
		return fmt.Errorf("%w: sheet %q has no row %d", ErrNoHeader, rd.sheet, opt.HeaderRow)
	}
	if fallback < 0 {
		return fmt.Errorf("%w in the first %d rows of sheet %q: expected a row of column names with a \"name\" column (or give the header row)", ErrNoHeader, DefaultScanRows, rd.sheet)
	}
	h := scanned[fallback]
	rd.setHeader(h.n, h.cells)
	rd.pending = scanned[fallback+1:]
	return nil
}

// canonicalSuffixes are the companion-column suffixes of the canonical layout.
var canonicalSuffixes = []string{"_err_plus", "_err_minus", "_err", "_min", "_max", "_factor", "_source"}

// looksCanonical reports whether a header cell reads like a canonical column:
// a catalog key, optionally with a companion suffix and a "[unit]".
func looksCanonical(h string) bool {
	h = strings.ToLower(strings.TrimSpace(h))
	if i := strings.IndexByte(h, '['); i > 0 && strings.HasSuffix(h, "]") {
		h = strings.TrimSpace(h[:i])
	}
	switch h {
	case "planet", "star", "source", "alias":
		return true
	}
	for _, s := range canonicalSuffixes {
		if strings.HasSuffix(h, s) {
			h = strings.TrimSuffix(h, s)
			break
		}
	}
	_, ok := schema.LookupKey(h)
	return ok
}

func looksLikeHeader(cells []string) bool {
	name, others := false, 0
	for _, c := range cells {
		c = strings.TrimSpace(c)
		switch {
		case strings.EqualFold(c, "name"):
			name = true
		case c != "" && looksCanonical(c):
			others++
		}
	}
	return name && others >= 2
}

// allText counts the non-empty cells of a row, or returns 0 if any is a number.
func allText(cells []string) int {
	n := 0
	for _, c := range cells {
		c = strings.TrimSpace(c)
		if c == "" {
			continue
		}
		if _, err := strconv.ParseFloat(c, 64); err == nil {
			return 0
		}
		n++
	}
	return n
}

func (rd *Reader) setHeader(row int, cells []string) {
	rd.header = row
	last := -1
	for i, c := range cells {
		if strings.TrimSpace(c) != "" {
			last = i
		}
	}
	rd.cols = make([]table.Column, last+1)
	for i := range rd.cols {
		rd.cols[i].Name = strings.TrimSpace(cells[i])
	}
	rd.cells = make([]string, len(rd.cols))
}

// Columns returns the header row's cells, up to the last non-empty one.
func (rd *Reader) Columns() []table.Column { return rd.cols }

// Sheet is the name of the sheet being read.
func (rd *Reader) Sheet() string { return rd.sheet }

// Sheets lists the workbook's sheets in order.
func (rd *Reader) Sheets() []string { return rd.sheets }

// HeaderRow is the 1-based sheet row holding the column names.
func (rd *Reader) HeaderRow() int { return rd.header }

// Next returns the next non-empty row and its sheet row number. Empty rows
// (every cell empty), including trailing ones, are passed over. See
// table.Reader.
func (rd *Reader) Next() ([]string, int, error) {
	if rd.done {
		return nil, 0, rd.err
	}
	for {
		var (
			cells []string
			n     int
		)
		if len(rd.pending) > 0 {
			cells, n = rd.pending[0].cells, rd.pending[0].n
			rd.pending = rd.pending[1:]
		} else {
			c, ok, err := rd.readRow()
			if err != nil || !ok {
				if err == nil {
					err = io.EOF
				}
				rd.done, rd.err = true, err
				rd.Close()
				return nil, 0, err
			}
			cells, n = c, rd.sheetRow
		}
		empty := true
		for i := range rd.cells {
			rd.cells[i] = ""
		}
		for i, c := range cells {
			c = strings.TrimSpace(c)
			if c == "" {
				continue
			}
			empty = false
			if i >= len(rd.cells) {
				ref, _ := excelize.CoordinatesToCellName(i+1, n)
				rd.done, rd.err = true, fmt.Errorf("sheet %q, cell %s: %w (the header in row %d ends at column %d); add a header or clear the cell", rd.sheet, ref, ErrBeyondHeader, rd.header, len(rd.cols))
				rd.Close()
				return nil, 0, rd.err
			}
			rd.cells[i] = c
		}
		if !empty {
			return rd.cells, n, nil
		}
	}
}

// Close releases the workbook and removes its temporary files. Next calls it
// itself once it has returned io.EOF or an error, so a caller that reads to
// the end need not; calling it again is harmless.
func (rd *Reader) Close() error {
	var err error
	if rd.rows != nil {
		rd.rows.Close()
		rd.rows = nil
	}
	if rd.f != nil {
		err = rd.f.Close()
		rd.f = nil
	}
	return err
}
