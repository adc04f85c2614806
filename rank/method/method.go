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
func Sections() []Section { return SectionsOf(text) }

// SectionsOf splits any text in the layout of Text (such as the result of
// WithUncertainty) at its headings, as Sections does.
func SectionsOf(doc string) []Section {
	lines := strings.Split(strings.TrimRight(doc, "\n"), "\n")
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

// UncertaintyHeading is the heading of the section that WithUncertainty
// replaces.
const UncertaintyHeading = "Uncertainty and ranking"

// WithUncertainty returns the method text with its "Uncertainty and ranking"
// section (heading, rule and body) replaced by section, which carries its own
// heading in the same layout — the Monte Carlo engine's own description
// (rank.MethodText) — so that the printed method states exactly what the
// engine does. An empty section leaves the text unchanged.
func WithUncertainty(section string) string {
	section = strings.Trim(section, "\n")
	if section == "" {
		return text
	}
	lines := strings.Split(text, "\n")
	heading := func(k int) bool {
		return k+1 < len(lines) && strings.TrimSpace(lines[k]) != "" && isRule(lines[k+1])
	}
	h := -1
	for k := range lines {
		if strings.TrimSpace(lines[k]) == UncertaintyHeading && heading(k) {
			h = k
			break
		}
	}
	if h < 0 {
		return strings.TrimRight(text, "\n") + "\n\n\n" + section + "\n"
	}
	end := len(lines)
	for k := h + 2; k < len(lines); k++ {
		if heading(k) {
			end = k
			break
		}
	}
	tail := ""
	if end < len(lines) {
		tail = "\n\n\n" + strings.Join(lines[end:], "\n")
	} else {
		tail = "\n"
	}
	return strings.Join(lines[:h], "\n") + "\n" + section + tail
}
