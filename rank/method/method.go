package method

import (
	_ "embed"
	"strings"
)

//go:embed method.md
var text string

// Text returns the whole method text: plain text with underlined headings,
// ending in a newline.
func Text() string { return text }

// Section is one headed part of the method text.
type Section struct {
	Title string // heading, e.g. "2. Tidal heating"
	Body  string // the text under it, trimmed of surrounding blank lines
}

// Sections splits the method text at its headings (a line followed by a line of
// dashes), for writers that lay the text out themselves, such as a workbook
// sheet. The document's title line (the first line) is not a section; Title()
// returns it.
func Sections() []Section {
	lines := strings.Split(strings.TrimRight(text, "\n"), "\n")
	var out []Section
	title := strings.TrimSpace(lines[0])
	start := 1
	flush := func(end int) {
		body := strings.Trim(strings.Join(lines[start:end], "\n"), "\n")
		if body != "" {
			out = append(out, Section{Title: title, Body: body})
		}
	}
	for i := 1; i+1 < len(lines); i++ {
		if isRule(lines[i+1]) && strings.TrimSpace(lines[i]) != "" {
			flush(i)
			title = strings.TrimSpace(lines[i])
			start = i + 2
			i++
		}
	}
	flush(len(lines))
	return out
}

func isRule(s string) bool {
	s = strings.TrimSpace(s)
	return len(s) >= 3 && strings.Trim(s, "-") == ""
}

// Title returns the document's title, its first line.
func Title() string {
	t, _, _ := strings.Cut(text, "\n")
	return strings.TrimSpace(t)
}
