package importers

import (
	"math"
	"math/rand/v2"
	"strconv"
	"testing"
)

func sameAsStrconv(tb testing.TB, s string) {
	tb.Helper()
	got, ok := fastDecimal(s)
	if !ok {
		return
	}
	want, err := strconv.ParseFloat(s, 64)
	if err != nil {
		tb.Fatalf("fastDecimal(%q) = %v, but strconv refuses it: %v", s, got, err)
	}
	if math.Float64bits(got) != math.Float64bits(want) {
		tb.Fatalf("fastDecimal(%q) = %v (%#x), strconv %v (%#x)", s, got, math.Float64bits(got), want, math.Float64bits(want))
	}
}

func TestFastDecimal(t *testing.T) {
	for _, c := range []struct {
		s  string
		ok bool
	}{
		{"0", true}, {"-0", true}, {"1.5", true}, {"8.1e22", true}, {"0.0051", true}, {".5", true},
		{"5.", true}, {"+3", true}, {"1E-3", true}, {"410000", true}, {"9007199254740993", false},
		{"1e23", false}, {"1e-22", true}, {"1e-23", false}, {"1e-30", false}, {"", false}, {"-", false}, {".", false},
		{"1e", false}, {"1e+", false}, {"1x", false}, {"0x10", false}, {"1_0", false}, {"inf", false},
		{"NaN", false}, {"12345678901234567890", false}, {"0.00000000000000000000000001", false},
	} {
		_, ok := fastDecimal(c.s)
		if ok != c.ok {
			t.Errorf("fastDecimal(%q) ok = %v, want %v", c.s, ok, c.ok)
		}
		sameAsStrconv(t, c.s)
	}
	// Random decimals in the forms tables use, against strconv (seeded).
	rng := rand.New(rand.NewPCG(1, 1))
	for range 50000 {
		v := math.Exp(rng.NormFloat64()*20) * float64(1-2*rng.IntN(2))
		for _, f := range []byte{'g', 'e', 'f'} {
			sameAsStrconv(t, strconv.FormatFloat(v, f, rng.IntN(17)-1, 64))
		}
	}
}

// FuzzNumber checks that the fast path never disagrees with strconv.
func FuzzNumber(f *testing.F) {
	for _, s := range []string{"1.5", "8.1e22", "-0.0051", "9007199254740993", "1e-22", ".5e1"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) { sameAsStrconv(t, s) })
}
