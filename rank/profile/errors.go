package profile

import (
	"errors"
	"fmt"
	"strconv"
	"strings"

	toml "github.com/pelletier/go-toml/v2"
	"github.com/pelletier/go-toml/v2/unstable"
)

// Error is one problem in a profile, with its position when known.
type Error struct {
	Source       string // file or built-in name
	Line, Column int    // 1-based; 0 when not known
	Key          string // the offending key, e.g. "criterion[2].metric"; "" for the whole file
	Msg          string
	Excerpt      string // for syntax errors: the lines around the problem with a marker
}

// Error renders "FILE:LINE:COL: KEY: MESSAGE".
func (e *Error) Error() string {
	var b strings.Builder
	b.WriteString(e.Source)
	if e.Line > 0 {
		fmt.Fprintf(&b, ":%d:%d", e.Line, e.Column)
	}
	b.WriteString(": ")
	if e.Key != "" {
		b.WriteString(e.Key)
		b.WriteString(": ")
	}
	b.WriteString(e.Msg)
	return b.String()
}

// ErrorList is every problem Parse found in one profile, in file order.
type ErrorList []*Error

// Error joins the problems, one per line.
func (l ErrorList) Error() string {
	s := make([]string, len(l))
	for i, e := range l {
		s[i] = e.Error()
	}
	return strings.Join(s, "\n")
}

// Unwrap lets errors.As find each *Error.
func (l ErrorList) Unwrap() []error {
	out := make([]error, len(l))
	for i, e := range l {
		out[i] = e
	}
	return out
}

// decodeError turns go-toml's errors (whose Error() has no position) into
// positioned *Error values naming the key and, for an unknown key, the keys
// that table accepts.
func decodeError(src string, data []byte, err error) error {
	var sm *toml.StrictMissingError
	if errors.As(err, &sm) {
		var l ErrorList
		for i := range sm.Errors {
			de := &sm.Errors[i]
			line, col := de.Position()
			k := []string(de.Key())
			name := ""
			if len(k) > 0 {
				name = k[len(k)-1]
			}
			l = append(l, &Error{Source: src, Line: line, Column: col, Key: strings.Join(k, "."),
				Msg:     fmt.Sprintf("unknown key %q %s(valid: %s)", name, tableOf(k), strings.Join(validKeys[tableKind(k)], ", ")),
				Excerpt: de.String()})
		}
		return l
	}
	var de *toml.DecodeError
	if errors.As(err, &de) {
		line, col := de.Position()
		msg := strings.TrimPrefix(de.Error(), "toml: ")
		// go-toml names Go types in type errors; say what the file needed.
		if i := strings.Index(msg, "into struct field"); i >= 0 {
			msg = strings.TrimSpace(msg[:i]) + " here: " + wantOf(msg[i:])
		}
		return &Error{Source: src, Line: line, Column: col, Key: strings.Join(de.Key(), "."), Msg: msg, Excerpt: de.String()}
	}
	return &Error{Source: src, Msg: err.Error()}
}

func wantOf(goMsg string) string {
	switch {
	case strings.Contains(goMsg, "*string"), strings.Contains(goMsg, "of type string"):
		return "want a quoted string"
	case strings.Contains(goMsg, "int64"):
		return "want a whole number"
	case strings.Contains(goMsg, "float64"):
		return "want a number"
	}
	return "wrong kind of value"
}

// tableKind maps a key path to the validKeys entry of its table.
func tableKind(k []string) string {
	switch {
	case len(k) <= 1:
		return ""
	case k[0] == "model":
		return "model"
	case k[0] == "criterion":
		return "criterion"
	case k[0] == "priors":
		return "prior"
	}
	return ""
}

func tableOf(k []string) string {
	switch tableKind(k) {
	case "model":
		return "in [model] "
	case "criterion":
		return "in [[criterion]] "
	case "prior":
		return "in a prior "
	}
	return ""
}

// displayKey turns an index path "criterion.2.metric" into "criterion[2].metric".
func displayKey(k string) string {
	parts := strings.Split(k, ".")
	var b strings.Builder
	for i, p := range parts {
		if _, err := strconv.Atoi(p); err == nil && i > 0 {
			b.WriteString("[" + p + "]")
			continue
		}
		if i > 0 {
			b.WriteByte('.')
		}
		b.WriteString(p)
	}
	return b.String()
}

type position struct{ line, col int }

// indexPositions maps each key path of a syntactically valid document to the
// position of the key: "name", "model.melting_temperature_k",
// "criterion.2.metric" (array tables numbered from 1), "priors.k2_q",
// "priors.k2_q.dist" (inside an inline table or a [priors.k2_q] table).
func indexPositions(data []byte) map[string]position {
	out := map[string]position{}
	at := func(off uint32) position {
		line, col := 1, 1
		for _, c := range data[:min(int(off), len(data))] {
			if c == '\n' {
				line++
				col = 1
			} else {
				col++
			}
		}
		return position{line, col}
	}
	keyPath := func(it unstable.Iterator) (parts []string, first *unstable.Node) {
		for it.Next() {
			n := it.Node()
			if first == nil {
				first = n
			}
			parts = append(parts, string(n.Data))
		}
		return parts, first
	}
	var walk func(prefix string, n *unstable.Node)
	walk = func(prefix string, n *unstable.Node) {
		parts, first := keyPath(n.Key())
		path := strings.Join(append(splitNonEmpty(prefix), parts...), ".")
		if first != nil {
			if _, seen := out[path]; !seen {
				out[path] = at(first.Raw.Offset)
			}
		}
		if v := n.Value(); v != nil && v.Kind == unstable.InlineTable {
			it := v.Children()
			for it.Next() {
				if c := it.Node(); c.Kind == unstable.KeyValue {
					walk(path, c)
				}
			}
		}
	}
	counts := map[string]int{}
	prefix := ""
	var p unstable.Parser
	p.Reset(data)
	for p.NextExpression() {
		e := p.Expression()
		switch e.Kind {
		case unstable.Table, unstable.ArrayTable:
			parts, first := keyPath(e.Key())
			prefix = strings.Join(parts, ".")
			if e.Kind == unstable.ArrayTable {
				counts[prefix]++
				prefix += "." + strconv.Itoa(counts[prefix])
			}
			if first != nil {
				if _, seen := out[prefix]; !seen {
					out[prefix] = at(first.Raw.Offset)
				}
			}
		case unstable.KeyValue:
			walk(prefix, e)
		}
	}
	return out
}

func splitNonEmpty(s string) []string {
	if s == "" {
		return nil
	}
	return strings.Split(s, ".")
}

// leadingComments returns the comment block at the top of a document (up to
// the first line that is neither a comment nor blank), trailing blanks removed.
func leadingComments(data []byte) string {
	var keep []string
	for _, line := range strings.SplitAfter(string(data), "\n") {
		t := strings.TrimSpace(line)
		if t != "" && !strings.HasPrefix(t, "#") {
			break
		}
		keep = append(keep, strings.TrimRight(line, "\r\n"))
	}
	for len(keep) > 0 && strings.TrimSpace(keep[len(keep)-1]) == "" {
		keep = keep[:len(keep)-1]
	}
	return strings.Join(keep, "\n")
}
