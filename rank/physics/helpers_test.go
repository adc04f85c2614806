package physics

import (
	"encoding/json"
	"math"
	"testing"
)

// approx fails tb unless got is within rel (relative) of want. NaN matches
// only NaN and ±Inf only the same infinity.
func approx(tb testing.TB, name string, got, want, rel float64) {
	tb.Helper()
	if !close(got, want, rel, 0) {
		tb.Errorf("%s = %.10g, want %.10g (relative tolerance %g)", name, got, want, rel)
	}
}

// approxAbs is approx with an absolute tolerance.
func approxAbs(tb testing.TB, name string, got, want, abs float64) {
	tb.Helper()
	if !close(got, want, 0, abs) {
		tb.Errorf("%s = %.10g, want %.10g (absolute tolerance %g)", name, got, want, abs)
	}
}

// close reports |got − want| ≤ max(rel·|want|, abs), with NaN ≡ NaN and equal
// infinities equal.
func close(got, want, rel, abs float64) bool {
	switch {
	case math.IsNaN(want):
		return math.IsNaN(got)
	case math.IsInf(want, 0):
		return got == want
	case math.IsNaN(got) || math.IsInf(got, 0):
		return false
	}
	return math.Abs(got-want) <= math.Max(rel*math.Abs(want), abs)
}

func TestClose(t *testing.T) {
	cases := []struct {
		got, want, rel, abs float64
		ok                  bool
	}{
		{1, 1, 0, 0, true},
		{1.01, 1, 0.02, 0, true},
		{1.03, 1, 0.02, 0, false},
		{0.001, 0, 0, 0.01, true},
		{math.NaN(), math.NaN(), 0, 0, true},
		{1, math.NaN(), 1, 1, false},
		{math.NaN(), 1, 1, 1, false},
		{math.Inf(1), math.Inf(1), 0, 0, true},
		{math.Inf(-1), math.Inf(1), 0, 0, false},
		{math.Inf(1), 1e300, 1, 0, false},
	}
	for _, c := range cases {
		if got := close(c.got, c.want, c.rel, c.abs); got != c.ok {
			t.Errorf("close(%g, %g, %g, %g) = %v, want %v", c.got, c.want, c.rel, c.abs, got, c.ok)
		}
	}
}

func jsonMarshal(v any) ([]byte, error) { return json.Marshal(v) }
