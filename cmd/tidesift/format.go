package main

import (
	"encoding/json"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
	"text/tabwriter"

	"tidesift/importers/units"
	"tidesift/schema"
)

// formatFlag is a --format flag restricted to a list of choices, so a bad
// value is refused while the flags are parsed, naming the choices.
type formatFlag struct {
	value   string
	choices []string
}

// newFormatFlag returns a flag whose default is def (which need not be a
// choice, e.g. "" for "detect") and which accepts only choices.
func newFormatFlag(def string, choices ...string) *formatFlag {
	return &formatFlag{value: def, choices: choices}
}

func (f *formatFlag) String() string { return f.value }
func (f *formatFlag) Type() string   { return "format" }
func (f *formatFlag) Set(s string) error {
	for _, c := range f.choices {
		if s == c {
			f.value = s
			return nil
		}
	}
	return fmt.Errorf("want %s", orList(f.choices))
}

// orList renders choices as "a, b or c".
func orList(choices []string) string {
	switch len(choices) {
	case 0:
		return ""
	case 1:
		return choices[0]
	}
	return strings.Join(choices[:len(choices)-1], ", ") + " or " + choices[len(choices)-1]
}

// displayUnits are the units tables show each key in (VOUnits spellings); JSON
// and CSV output stay in SI. A key not listed is shown in its SI unit.
var displayUnits = map[string]string{
	"radius":          "km",
	"semi_major_axis": "km",
	"obliquity":       "deg",
	"period":          "d",
	"planet_mass":     "jupiterMass",
	"planet_radius":   "jupiterRad",
	"star_distance":   "AU",
	"star_luminosity": "solLum",
	"star_mass":       "solMass",
}

// displayUnit returns the unit label a table shows key in and the factor that
// takes a value in that unit to SI.
func displayUnit(key string) (string, float64) {
	if u, ok := displayUnits[key]; ok {
		if pu, err := units.Parse(u); err == nil {
			return u, pu.Factor
		}
	}
	info, _ := schema.LookupKey(key)
	return info.Unit, 1
}

// num renders v with up to sig significant digits, compactly: "400000",
// "1.4335", "8e22", "1.2e-5".
func num(v float64, sig int) string {
	if math.IsNaN(v) {
		return "-"
	}
	s := strconv.FormatFloat(v, 'g', sig, 64)
	if i := strings.IndexByte(s, 'e'); i >= 0 {
		mant, exp := s[:i], s[i+1:]
		sign := ""
		if exp[0] == '-' {
			sign = "-"
		}
		exp = strings.TrimLeft(exp[1:], "0")
		s = mant + "e" + sign + exp
	}
	return s
}

// sig3 renders an uncertainty: rounded to three significant digits, written
// out in full below 10⁶ ("1300", not "1.3e3").
func sig3(v float64) string {
	r, _ := strconv.ParseFloat(strconv.FormatFloat(v, 'g', 3, 64), 64)
	return num(r, 6)
}

// uncText renders an uncertainty in the display unit (values divided by f).
func uncText(u schema.Uncertainty, f float64) string {
	switch u.Kind {
	case schema.UncSymmetric:
		return "± " + sig3(u.Sigma/f)
	case schema.UncAsymmetric:
		return "+" + sig3(u.Plus/f) + " -" + sig3(u.Minus/f)
	case schema.UncRange:
		return "[" + num(u.Min/f, 4) + ", " + num(u.Max/f, 4) + "]"
	case schema.UncFactor:
		return "×/÷ " + sig3(u.Factor)
	}
	return ""
}

// paramText renders a parameter in its display unit as "value unc", without
// the unit, e.g. "1750 ± 2".
func paramText(p schema.Param) string { return keyedText(p.Key, p) }

// keyedText is paramText for a parameter whose Key field may be unset.
func keyedText(key string, p schema.Param) string {
	_, f := displayUnit(key)
	s := num(p.Value/f, 6)
	if u := uncText(p.Unc, f); u != "" {
		s += " " + u
	}
	return s
}

// newTable returns a tabwriter for aligned plain-text tables.
func newTable(w io.Writer) *tabwriter.Writer {
	return tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
}

// writeJSON writes v as indented JSON followed by a newline.
func writeJSON(w io.Writer, v any) error {
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	enc.SetEscapeHTML(false)
	return enc.Encode(v)
}

// inputJSON is one input of a moon in JSON output: the value in the SI unit
// of its key, its uncertainty in the same unit, source, revision and status.
type inputJSON struct {
	Key         string             `json:"key"`
	Value       float64            `json:"value"`
	Uncertainty schema.Uncertainty `json:"uncertainty"`
	Unit        string             `json:"unit"`
	Source      string             `json:"source"`
	Revision    int64              `json:"revision"`
	Status      schema.Status      `json:"status"`
}

// inputsJSON lists params in the order of schema.Keys.
func inputsJSON(params map[string]schema.Param) []inputJSON {
	out := make([]inputJSON, 0, len(params))
	for _, k := range schema.SortedKeys(params) {
		p := params[k]
		info, _ := schema.LookupKey(k)
		out = append(out, inputJSON{
			Key: k, Value: p.Value, Uncertainty: p.Unc, Unit: info.Unit,
			Source: p.Source, Revision: p.Revision, Status: p.Status,
		})
	}
	return out
}

// csvFloat renders a number for CSV: shortest exact form, empty for NaN.
func csvFloat(v float64) string {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return ""
	}
	return strconv.FormatFloat(v, 'g', -1, 64)
}

// plural renders a count with its noun, e.g. "1 problem", "3 problems".
func plural(n int, noun string) string {
	if n == 1 {
		return "1 " + noun
	}
	return strconv.Itoa(n) + " " + noun + "s"
}
