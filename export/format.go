package export

import (
	"math"
	"strconv"
	"strings"

	"tidesift/rank"
)

// siPrefixes are the SI prefixes (BIPM, The International System of Units,
// 9th edition 2019, table 7) by power of ten, for the units scaled with them.
var siPrefixes = map[int]string{
	-6: "µ", -3: "m", 0: "", 3: "k", 6: "M", 9: "G", 12: "T", 15: "P", 18: "E", 21: "Z", 24: "Y",
}

// FormatRange renders a median with its 5–95 % range as readable text, for
// example "93 (75–112) TW". The unit is the SI unit of the quantity as the
// Result holds it ("W", "W/m2", "m", "m/s", "K", "N", "" for a pure number);
// the text is scaled to a readable unit: SI prefixes for W (kW … TW …), mW/m²
// for heat fluxes below 1 W/m², km for lengths and km/s for speeds of 1000 or
// more, K as is, and a shared power of ten ("×10²⁰ N") for other quantities
// outside [0.001, 10⁶).
//
// The values share one number of decimals: two significant figures on the
// median, or three (four at most, for a narrow range on a large value) where
// fewer would make p05, p50 and p95 look equal although they differ. A range
// with no visible width at four figures is shown as a single value. NaN is "n/a"; ±Inf is "∞"/"−∞".
func FormatRange(q rank.Quantiles, unit string) string {
	vals := [3]float64{q.P05, q.P50, q.P95}
	ref := refMagnitude(vals)
	scale, shown := displayUnit(unit, ref)
	for i := range vals {
		vals[i] /= scale
	}
	ref /= scale
	exp := 0
	if ref != 0 && (ref >= 1e6 || ref < 1e-3) {
		exp = int(math.Floor(math.Log10(ref)))
		p := math.Pow(10, float64(exp))
		for i := range vals {
			vals[i] /= p
		}
		ref /= p
	}
	d0, dmax := 0, 0
	if ref != 0 {
		mag := int(math.Floor(math.Log10(ref)))
		d0 = max(0, 1-mag)
		dmax = max(0, 3-mag)
	}
	var s [3]string
	for d := d0; d <= dmax; d++ {
		for i, v := range vals {
			s[i] = formatFixed(v, d)
		}
		if distinguishable(vals, s) {
			break
		}
	}
	var b strings.Builder
	if s[0] == s[1] && s[1] == s[2] {
		if !isFinite(vals[1]) {
			return s[1] // "n/a" needs no unit
		}
		b.WriteString(formatFixed(vals[1], d0))
	} else {
		b.WriteString(s[1])
		b.WriteString(" (")
		b.WriteString(s[0])
		b.WriteString("–")
		b.WriteString(s[2])
		b.WriteString(")")
	}
	if exp != 0 {
		b.WriteString(" ×10")
		b.WriteString(superscript(exp))
	}
	if shown != "" {
		b.WriteString(" ")
		b.WriteString(shown)
	}
	return b.String()
}

// refMagnitude is the magnitude the scaling and the significant figures are
// chosen on: the median's, or the larger finite bound's when the median is 0
// or not finite.
func refMagnitude(v [3]float64) float64 {
	if m := math.Abs(v[1]); isFinite(m) && m != 0 {
		return m
	}
	ref := 0.0
	for _, x := range [...]float64{v[0], v[2]} {
		if a := math.Abs(x); isFinite(a) && a > ref {
			ref = a
		}
	}
	return ref
}

// distinguishable reports whether every pair of adjacent values that differs
// also differs in its rendering.
func distinguishable(v [3]float64, s [3]string) bool {
	return (v[0] == v[1] || s[0] != s[1]) && (v[1] == v[2] || s[1] != s[2])
}

// displayUnit picks the unit a quantity is shown in and the factor (SI value
// per shown unit) for a reference magnitude ref in SI.
func displayUnit(unit string, ref float64) (scale float64, shown string) {
	unit = strings.ToValidUTF8(strings.TrimSpace(unit), "\uFFFD")
	switch unit {
	case "W":
		e := 0
		if ref > 0 && isFinite(ref) {
			e = int(math.Floor(math.Log10(ref)/3)) * 3
		}
		e = min(max(e, -6), 24)
		return math.Pow(10, float64(e)), siPrefixes[e] + "W"
	case "W/m2", "W/m²", "W/m^2", "W m-2", "W.m-2", "W.m**-2":
		if ref < 1 {
			return 1e-3, "mW/m²"
		}
		return 1, "W/m²"
	case "m":
		if ref >= 1000 {
			return 1000, "km"
		}
		return 1, "m"
	case "m/s", "m s-1", "m.s-1":
		if ref >= 1000 {
			return 1000, "km/s"
		}
		return 1, "m/s"
	}
	return 1, prettyUnit(unit)
}

// prettyUnit writes the powers in a VOUnits spelling as superscripts for
// display ("kg/m3" → "kg/m³").
func prettyUnit(u string) string { return unitPowers.Replace(u) }

var unitPowers = strings.NewReplacer("m3", "m³", "m2", "m²", "s2", "s²", "**-2", "⁻²", "**-1", "⁻¹")

// formatFixed formats v with d decimals; NaN and ±Inf get their own marks and
// a rounded negative zero loses its sign.
func formatFixed(v float64, d int) string {
	switch {
	case math.IsNaN(v):
		return "n/a"
	case math.IsInf(v, 1):
		return "∞"
	case math.IsInf(v, -1):
		return "−∞"
	}
	s := strconv.FormatFloat(v, 'f', d, 64)
	if strings.Trim(s, "-0.") == "" {
		s = strings.TrimPrefix(s, "-")
	}
	return s
}

var superDigits = [...]string{"⁰", "¹", "²", "³", "⁴", "⁵", "⁶", "⁷", "⁸", "⁹"}

func superscript(n int) string {
	var b strings.Builder
	if n < 0 {
		b.WriteString("⁻")
		n = -n
	}
	for _, c := range strconv.Itoa(n) {
		b.WriteString(superDigits[c-'0'])
	}
	return b.String()
}

func isFinite(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }
