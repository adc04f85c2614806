package importers

import (
	"errors"
	"fmt"
	"strings"

	"tidesift/importers/units"
)

// Sentinel errors of Read, each wrapped in a *ParseError that says where. Test
// with errors.Is. Value-domain problems wrap the schema sentinels instead:
// schema.ErrNotFinite (Inf, or a number beyond the float64 range),
// schema.ErrOutOfDomain (e.g. eccentricity ≥ 1, mass ≤ 0, a factor < 1),
// schema.ErrNegativeUncertainty and schema.ErrMinAboveMax.
var (
	// ErrUnknownColumn: a header that is neither a canonical key, a companion
	// of one, a text column, nor named by the column map.
	ErrUnknownColumn = errors.New("unknown column")
	// ErrDuplicateColumn: two columns that fill the same key and role.
	ErrDuplicateColumn = errors.New("duplicate column")
	// ErrUnknownUnit: a unit the units package does not know (units.ErrUnknownUnit).
	ErrUnknownUnit = units.ErrUnknownUnit
	// ErrWrongUnit: a known unit of the wrong dimension for its key, e.g. km
	// for a mass (units.ErrIncompatible).
	ErrWrongUnit = units.ErrIncompatible
	// ErrMissingUnit: a column without a unit whose key has one (every key
	// but the dimensionless ones). Give it as "key [unit]" or in the map.
	ErrMissingUnit = errors.New("missing unit")
	// ErrNotNumber: a cell that should hold a number and holds other text.
	ErrNotNumber = errors.New("not a number")
	// ErrMissingName: a row without a moon name or planet name, a file
	// without a name or planet column, or star values without a star name.
	ErrMissingName = errors.New("missing name")
	// ErrDuplicateMoon: two rows of one file for the same (planet, name).
	ErrDuplicateMoon = errors.New("duplicate moon")
	// ErrPlanetConflict: one planet (or star) given different values, or
	// different stars, on two rows.
	ErrPlanetConflict = errors.New("conflicting values for one body")
	// ErrUncertaintyForm: an incomplete uncertainty (err_plus without
	// err_minus, min without max), several forms at once, or an uncertainty
	// without its value.
	ErrUncertaintyForm = errors.New("malformed uncertainty")
	// ErrValueOutsideRange: a value outside its own [key_min, key_max].
	ErrValueOutsideRange = errors.New("value outside its own range")
	// ErrUnknownFormat: a format name Read does not know or has no reader for.
	ErrUnknownFormat = errors.New("unknown format")
	// ErrBadMap: a column map that does not fit the file (a mapped column
	// the file lacks, an unknown key or role).
	ErrBadMap = errors.New("column map does not fit")
	// ErrTableSyntax: the file cannot be read as a table at all (quoting,
	// encoding, size limits); reading stops there.
	ErrTableSyntax = errors.New("unreadable table")
)

// hintMap is the hint given for column problems.
const hintMap = "map foreign columns with `--map FILE`; `--suggest-map FILE` writes a starter map"

// ParseError is one problem in one file, with its position. Row is the
// 1-based line (or record, for formats without lines) as a user would find it
// in the file; 0 when the problem is not tied to a row. Column is the column's
// header as written; Key the canonical key it maps to, if any; Value the
// offending text.
type ParseError struct {
	File   string
	Row    int
	Column string
	Key    string
	Value  string
	Err    error
	Hint   string // what to try, if there is an obvious step
}

// Error reads like
// `moons.csv: row 4, column "mass [kg]": value "abc": not a number; expected ...`.
func (e *ParseError) Error() string {
	var b strings.Builder
	b.WriteString(e.File)
	switch {
	case e.Row > 0 && e.Column != "":
		fmt.Fprintf(&b, ": row %d, column %q", e.Row, e.Column)
	case e.Row > 0:
		fmt.Fprintf(&b, ": row %d", e.Row)
	case e.Column != "":
		fmt.Fprintf(&b, ": column %q", e.Column)
	}
	b.WriteString(": ")
	if e.Value != "" {
		fmt.Fprintf(&b, "value %q: ", clip(e.Value))
	}
	b.WriteString(e.Err.Error())
	if e.Hint != "" {
		b.WriteString(" (hint: " + e.Hint + ")")
	}
	return b.String()
}

// Unwrap returns the cause, which wraps a sentinel.
func (e *ParseError) Unwrap() error { return e.Err }

func clip(s string) string {
	const max = 80
	if len(s) <= max {
		return s
	}
	cut := max
	for cut > 0 && s[cut]&0xC0 == 0x80 { // do not split a UTF-8 sequence
		cut--
	}
	return s[:cut] + "…"
}

// ErrorList is every problem Read found in one file, up to a limit. Errs holds
// *ParseError values; Omitted counts the problems past the limit.
type ErrorList struct {
	File    string
	Errs    []error
	Omitted int
}

// Error lists the problems one per line, with "... and N more" past the limit.
func (l *ErrorList) Error() string {
	if len(l.Errs) == 1 && l.Omitted == 0 {
		return l.Errs[0].Error()
	}
	var b strings.Builder
	n := len(l.Errs) + l.Omitted
	fmt.Fprintf(&b, "%s: %d problems; nothing was imported:", l.File, n)
	for _, e := range l.Errs {
		b.WriteString("\n  ")
		b.WriteString(e.Error())
	}
	if l.Omitted > 0 {
		fmt.Fprintf(&b, "\n  ... and %d more", l.Omitted)
	}
	return b.String()
}

// Unwrap returns the listed problems, so errors.Is and errors.As see each.
func (l *ErrorList) Unwrap() []error { return l.Errs }

// Len is the number of problems found, including those past the limit.
func (l *ErrorList) Len() int { return len(l.Errs) + l.Omitted }

type collector struct {
	list ErrorList
	max  int
}

func (c *collector) add(e error) {
	if len(c.list.Errs) < c.max {
		c.list.Errs = append(c.list.Errs, e)
	} else {
		c.list.Omitted++
	}
}

func (c *collector) err() error {
	if len(c.list.Errs) == 0 && c.list.Omitted == 0 {
		return nil
	}
	l := c.list
	return &l
}
