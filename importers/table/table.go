// Package table is the neutral form every file-format reader of tidesift turns
// its bytes into: a list of column descriptions and a stream of rows of text
// cells. The importers package maps columns to canonical keys and units,
// converts and validates; format readers (csv, json, xlsx, votable) only parse.
//
// A reader streams: it holds one row at a time, never the whole file.
//
//	r, err := csv.NewReader(f, csv.Options{})
//	cols := r.Columns()
//	for {
//		cells, row, err := r.Next()
//		if err == io.EOF {
//			break
//		}
//		...
//	}
package table

// Column describes one column of a table as the file declares it.
type Column struct {
	Name        string // header text or field name, trimmed (may include a "[unit]" suffix in the canonical layout)
	Unit        string // unit declared by the format (VOTable FIELD unit), "" if none
	UCD         string // VOTable unified content descriptor, "" if none
	Datatype    string // VOTable datatype, "" if none
	Description string // free text from the file, "" if none
}

// Reader is a stream of rows from one table.
type Reader interface {
	// Columns returns the table's columns. It is valid after the reader is made.
	Columns() []Column
	// Next returns the cells of the next data row, one per column ("" for a
	// missing or null cell), and the row's position for messages: the 1-based
	// line or record number in the file as a user would find it. At the end it
	// returns io.EOF. The returned slice may be reused by the next call.
	Next() (cells []string, row int, err error)
}
