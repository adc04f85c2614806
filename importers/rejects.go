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

// safeCell neutralises spreadsheet formula injection in a text cell.
func safeCell(s string) string {
	if s == "" || !strings.ContainsAny(s[:1], "=+-@\t\r\x00") {
		return s
	}
	if _, err := strconv.ParseFloat(strings.TrimSpace(s), 64); err == nil {
		return s
	}
	return "'" + s
}
