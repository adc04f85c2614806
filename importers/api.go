package importers

import (
	"bufio"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"hash"
	"io"
	"os"

	"tidesift/schema"
)

// Options adjust Read.
type Options struct {
	Format      string // "" (detect), "csv", "tsv", "json", "xlsx", "votable"
	MaxErrors   int    // stop collecting after this many problems (0: 50)
	SkipInvalid bool   // keep good rows, report bad ones in Result.Rejects

	// Map maps a foreign layout's columns onto canonical keys (see LoadMap).
	// Nil reads the canonical layout only.
	Map *Map
	// Table selects one table of a multi-table file (VOTable TABLE name or
	// 1-based index); "" is the first. Overrides the map's table.
	Table string
	// Sheet selects a workbook sheet by name; "" is the first. Overrides the
	// map's sheet.
	Sheet string
	// MaxRecordBytes caps one row's size in bytes for text formats
	// (0: 1 MiB); a longer row or field is refused while reading.
	MaxRecordBytes int
}

func (o Options) maxErrors() int {
	if o.MaxErrors <= 0 {
		return 50
	}
	return o.MaxErrors
}

// Result is what a file yielded.
type Result struct {
	File    string          // display name
	SHA256  string          // hex SHA-256 of the bytes read
	Records []schema.Record // in file order
	Rejects []Reject        // rows refused under SkipInvalid

	Format  string   // the format read ("csv", "tsv", …)
	Columns []string // the file's column headers, as written
	Rows    int      // data rows read, accepted or not

	// Warnings are notes for the user that do not stop the import, in the
	// order found: for now, that a VOTable holds tables besides the one read
	// (and how to choose another). A caller should print them.
	Warnings []string
}

// Reject is a row refused under SkipInvalid.
type Reject struct {
	Row    int
	Raw    []string
	Reason string
}

// Read reads one file: detects its format, maps its columns, converts units to
// SI and validates every value. Without SkipInvalid, any problem makes Read
// return an error listing all problems found (an *ErrorList of *ParseError).
func Read(name string, r io.Reader, opt Options) (*Result, error) {
	var recs []schema.Record
	res, err := ReadStream(name, r, opt, func(rec *schema.Record) error {
		recs = append(recs, *rec)
		return nil
	})
	if err != nil {
		return nil, err
	}
	res.Records = recs
	return res, nil
}

// ReadStream is Read for files too large to hold as records: it calls emit
// with each accepted record, in file order, instead of collecting them.
// Result.Records stays empty. The *Record itself is reused after emit
// returns; a shallow copy (*rec) may be kept, as its slices and strings are
// never reused.
//
// Problems found after a record was emitted (a later duplicate, a later row's
// conflicting planet value, a syntax error further on) still fail the whole
// file: a caller that writes as it goes must do so in one transaction and roll
// it back when ReadStream returns an error. An error from emit stops reading
// and is returned as is.
func ReadStream(name string, r io.Reader, opt Options, emit func(*schema.Record) error) (*Result, error) {
	h := sha256.New()
	br := bufio.NewReaderSize(io.TeeReader(r, h), 64<<10)
	head, _ := br.Peek(4096)
	format := opt.Format
	if format == "" && opt.Map != nil {
		format = opt.Map.Format
	}
	if format == "" {
		format = detectFormat(name, head)
	}
	if opt.Table == "" && opt.Map != nil {
		opt.Table = opt.Map.Table
	}
	if opt.Sheet == "" && opt.Map != nil {
		opt.Sheet = opt.Map.Sheet
	}
	tr, err := openTable(format, br, opt)
	if err != nil {
		if errors.Is(err, ErrUnknownFormat) {
			return nil, &ErrorList{File: name, Errs: []error{&ParseError{File: name, Err: err}}}
		}
		return nil, &ErrorList{File: name, Errs: []error{&ParseError{File: name, Err: fmt.Errorf("%w: %w", ErrTableSyntax, err)}}}
	}
	// A reader holding files or handles (xlsx) releases them at its end;
	// this covers every early stop: an error from emit, a header problem, a
	// syntax error.
	if c, ok := tr.(io.Closer); ok {
		defer c.Close()
	}
	res := &Result{File: name, Format: format}
	if err := readTable(name, tr, opt, res, emit); err != nil {
		return nil, err
	}
	// Hash every byte even if the reader stopped before the end (trailing
	// whitespace, a JSON closing bracket).
	if _, err := io.Copy(io.Discard, br); err != nil {
		return nil, fmt.Errorf("read %s: %w", name, err)
	}
	res.SHA256 = hexSum(h)
	return res, nil
}

func hexSum(h hash.Hash) string { return hex.EncodeToString(h.Sum(nil)) }

// ReadFile opens path and calls Read, with path as the display name.
func ReadFile(path string, opt Options) (*Result, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	return Read(path, f, opt)
}
