package importers

// Format dispatch lives in this file and nowhere else:
//
//   - detectFormat(name, head) picks a format name from the file name and its
//     first bytes;
//   - openTable(format, r, opt) makes the table.Reader for a format name.
//
// A new format reader (json, xlsx, votable) is wired in by adding one case to
// each function below; nothing else in the package needs to change. A reader
// may return errors from Next that implement `Recoverable() bool` (returning
// true) for a problem confined to one row; Read then records it against the
// row and goes on. Any other error from Next ends the file. A reader may also
// implement `HeaderRow() int` so header problems name the right line,
// `Warnings() []string` for notes that do not stop the import (read once Next
// has returned io.EOF, passed on in Result.Warnings), and io.Closer to
// release files or handles it holds (ReadStream closes it however reading
// ends).

import (
	"bytes"
	"fmt"
	"io"
	"path"
	"strings"

	"tidesift/importers/csv"
	"tidesift/importers/json"
	"tidesift/importers/table"
	"tidesift/importers/votable"
	"tidesift/importers/xlsx"
)

// Formats lists the format names Options.Format accepts.
var Formats = []string{"csv", "tsv", "json", "xlsx", "votable"}

// detectFormat returns the format of a file from its content's signature
// (zip for XLSX, XML for VOTable, a leading '[' or '{' for JSON), then its
// extension, then a guess between CSV and TSV from the first line.
func detectFormat(name string, head []byte) string {
	h := bytes.TrimPrefix(head, []byte("\xef\xbb\xbf"))
	if bytes.HasPrefix(h, []byte("PK\x03\x04")) {
		return "xlsx"
	}
	t := bytes.TrimLeft(h, " \t\r\n")
	if bytes.HasPrefix(t, []byte("<")) {
		return "votable"
	}
	switch strings.ToLower(path.Ext(strings.ReplaceAll(name, "\\", "/"))) {
	case ".csv":
		return "csv"
	case ".tsv", ".tab":
		return "tsv"
	case ".json", ".jsonl", ".ndjson":
		return "json"
	case ".xlsx":
		return "xlsx"
	case ".vot", ".votable", ".xml":
		return "votable"
	}
	if bytes.HasPrefix(t, []byte("[")) || bytes.HasPrefix(t, []byte("{")) {
		return "json"
	}
	// First non-comment line: tabs and no commas means TSV.
	for _, line := range bytes.Split(h, []byte("\n")) {
		if len(bytes.TrimSpace(line)) == 0 || line[0] == '#' {
			continue
		}
		if bytes.IndexByte(line, '\t') >= 0 && bytes.IndexByte(line, ',') < 0 {
			return "tsv"
		}
		break
	}
	return "csv"
}

// openTable returns the reader of one format over r.
func openTable(format string, r io.Reader, opt Options) (table.Reader, error) {
	switch format {
	case "csv":
		return csv.NewReader(r, csv.Options{Comma: ',', MaxRecordBytes: opt.MaxRecordBytes})
	case "tsv":
		return csv.NewReader(r, csv.Options{Comma: '\t', MaxRecordBytes: opt.MaxRecordBytes})
	case "json":
		return json.NewReader(r, json.Options{MaxElement: opt.MaxRecordBytes})
	case "xlsx":
		return xlsx.NewReader(r, xlsx.Options{Sheet: opt.Sheet})
	case "votable":
		return votable.NewReader(r, votable.Options{Table: opt.Table})
	}
	return nil, fmt.Errorf("%w %q (want one of %s)", ErrUnknownFormat, format, strings.Join(Formats, ", "))
}
