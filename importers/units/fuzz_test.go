package units

import (
	"math"
	"strconv"
	"testing"
)

// FuzzParseUnit checks that Parse never panics, that what it accepts has a
// finite positive factor, and that a unit built from a known symbol, an
// allowed prefix and an exponent parses back to the factor computed here.
func FuzzParseUnit(f *testing.F) {
	for _, s := range []string{"km", "kg/m3", "g.cm**-3", "mW/m**2", "1.898E27kg", "10+3km", "(km/s)2", "Mjup", "µm", "m**(1/2)", ""} {
		f.Add(s, uint8(0), uint8(0), int8(1))
	}
	f.Add("", uint8(7), uint8(3), int8(-3))
	syms := Symbols()
	f.Fuzz(func(t *testing.T, s string, si, pi uint8, e int8) {
		if u, err := Parse(s); err == nil {
			if !(u.Factor > 0) || math.IsInf(u.Factor, 0) {
				t.Fatalf("Parse(%q) = factor %v", s, u.Factor)
			}
		}

		sym := syms[int(si)%len(syms)]
		base := symbols[sym]
		name, p10 := sym, 0
		if pi > 0 {
			p := prefixes[int(pi)%len(prefixes)]
			if !base.alias && prefixAllowed(base.prefixes, p.sym) {
				if _, clash := symbols[p.sym+sym]; !clash {
					name, p10 = p.sym+sym, p.p10
				}
			}
		}
		exp := int(e)%5 + 0
		if exp == 0 {
			exp = 1
		}
		text := name
		if exp != 1 {
			text += strconv.Itoa(exp)
		}
		u, err := Parse(text)
		if err != nil {
			t.Fatalf("Parse(%q) of a generated known unit: %v", text, err)
		}
		one := base.term().unit().Factor * math.Pow10(p10)
		want := math.Pow(one, float64(exp))
		if d := math.Abs(u.Factor-want) / want; d > 1e-12 {
			t.Fatalf("Parse(%q) = %g, want %g", text, u.Factor, want)
		}
		if u.Dim != (Dim{}).mul(base.dim, int8(exp)) {
			t.Fatalf("Parse(%q).Dim = %v", text, u.Dim)
		}
	})
}
