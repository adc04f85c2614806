package importers

import (
	stdcsv "encoding/csv"
	"fmt"
	"io"
	"strconv"
	"strings"
)

// WriteRejects writes a rejects report as CSV: one line per refused row with
// the columns file, row, reason, then the row's cells as read (cell_1, …).
// Text that a spreadsheet would run as a formula (a leading =, +, -, @, tab,
// CR or NUL) is prefixed with a single quote; numbers are written unchanged.
func WriteRejects(w io.Writer, file string, rejects []Reject) error {
	width := 0
	for _, r := range rejects {
		width = max(width, len(r.Raw))
	}
	cw := stdcsv.NewWriter(w)
	head := make([]string, 0, 3+width)
	head = append(head, "file", "row", "reason")
	for i := 1; i <= width; i++ {
		head = append(head, "cell_"+strconv.Itoa(i))
	}
	if err := cw.Write(head); err != nil {
		return err
	}
	line := make([]string, 0, 3+width)
	for _, r := range rejects {
		line = append(line[:0], safeCell(file), strconv.Itoa(r.Row), safeCell(r.Reason))
		for _, c := range r.Raw {
			line = append(line, safeCell(c))
		}
		for len(line) < 3+width {
			line = append(line, "")
		}
		if err := cw.Write(line); err != nil {
			return err
		}
	}
	cw.Flush()
	if err := cw.Error(); err != nil {
		return fmt.Errorf("write rejects: %w", err)
	}
	return nil
}

// formulaLead reports whether a spreadsheet would read text starting with b
// as a formula or a command: '=', '+', '-', '@', tab, CR and NUL (OWASP "CSV
// injection" guidance, common practice); or '#', which starts a comment row.
// It is the same set as the export package's formulaLead (export/safe.go),
// which writes the apostrophe that unneutralise removes; change both together. importers may not import
// export (data flows the other way), hence the copy; TestNeutralisationRule
// in export checks that the two agree on every byte.
func formulaLead(b byte) bool {
	switch b {
	case '=', '+', '-', '@', '\t', '\r', 0, '#':
		return true
	}
	return false
}

// unneutralise undoes the apostrophe the export side puts before a text cell
// that starts with a formula lead (export.SafeText): "'=Kel" reads as "=Kel".
// Any other text is kept as it is, a leading apostrophe included ("'Ara").
func unneutralise(s string) string {
	if len(s) >= 2 && s[0] == '\'' && formulaLead(s[1]) {
		return s[1:]
	}
	return s
}

// safeCell neutralises spreadsheet formula injection in a text cell.
func safeCell(s string) string {
	if s == "" || !formulaLead(s[0]) {
		return s
	}
	if _, err := strconv.ParseFloat(strings.TrimSpace(s), 64); err == nil {
		return s
	}
	return "'" + s
}
