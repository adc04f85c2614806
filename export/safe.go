package export

import "strings"

// formulaLead reports whether a spreadsheet program would read text starting
// with b as a formula or a command (OWASP "CSV injection" guidance, common
// practice): '=', '+', '-', '@', tab, carriage return, and NUL; or whether a
// CSV reader would skip a row starting with it as a comment ('#', which the
// importers' CSV reader skips), so that a name like "#Kel" survives a round
// trip through the canonical CSV.
func formulaLead(b byte) bool {
	switch b {
	case '=', '+', '-', '@', '\t', '\r', 0, '#':
		return true
	}
	return false
}

// SafeText returns s as a text cell that no spreadsheet evaluates: text that
// begins with a formula lead character gets a leading apostrophe. Invalid
// UTF-8 is replaced by U+FFFD so the cell survives XML and CSV alike. Use it
// for text cells only; numbers are never passed through it.
func SafeText(s string) string {
	s = strings.ToValidUTF8(s, "\uFFFD")
	if s != "" && formulaLead(s[0]) {
		return "'" + s
	}
	return s
}

// UnsafeText undoes SafeText's apostrophe, for readers of our own output
// (tests, round trips). Text that did not need one is returned unchanged.
func UnsafeText(s string) string {
	if len(s) >= 2 && s[0] == '\'' && formulaLead(s[1]) {
		return s[1:]
	}
	return s
}
