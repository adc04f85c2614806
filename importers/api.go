package importers

// API skeleton agreed between packages. The importers helper replaces the bodies
// (and may move these declarations into other files) but keeps the signatures.

import (
	"io"

	"tidesift/schema"
)

// Options adjust Read.
type Options struct {
	Format      string // "" (detect), "csv", "tsv", "json", "xlsx", "votable"
	MaxErrors   int    // stop collecting after this many problems (0: 50)
	SkipInvalid bool   // keep good rows, report bad ones in Result.Rejects
}

// Result is what a file yielded.
type Result struct {
	File    string          // display name
	SHA256  string          // hex SHA-256 of the bytes read
	Records []schema.Record // in file order
	Rejects []Reject        // rows refused under SkipInvalid
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
func Read(name string, r io.Reader, opt Options) (*Result, error) { panic("not implemented") }

// ReadFile opens path and calls Read.
func ReadFile(path string, opt Options) (*Result, error) { panic("not implemented") }
