package uncertain

import (
	"fmt"
	"math"
	"math/rand/v2"

	"tidesift/schema"
)

// SplitNormal is the two-piece (split) normal distribution for an asymmetric
// error value +Upper −Lower: a normal of scale Lower below the mode and one of
// scale Upper above it, joined continuously at the mode (John 1982, Commun.
// Statist. Theory Meth. 11, 879; Wallis 2014, Statist. Sci. 29, 106). The
// catalog value is its mode. Truncated to the key's domain, it is a mixture
// of two truncated half-normals, sampled by choosing the half and then sampling
// that half exactly.
type SplitNormal struct {
	Mode, Lower, Upper float64
	dom                domain
	wLow               float64      // probability of the lower half after truncation
	low, up            *TruncNormal // nil when that half has no mass
	mean, vr           float64
}

// NewSplitNormal returns the split-normal with the given mode and lower/upper
// σ (both ≥ 0, magnitudes), truncated to the key's domain.
func NewSplitNormal(mode, lower, upper float64, info schema.KeyInfo) (Dist, error) {
	dom := domainOf(info)
	for _, v := range []float64{mode, lower, upper} {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return nil, fmt.Errorf("split-normal needs finite values, got %g +%g −%g", mode, upper, lower)
		}
	}
	if lower < 0 || upper < 0 {
		return nil, fmt.Errorf("split-normal needs σ ≥ 0 on both sides, got +%g −%g", upper, lower)
	}
	if lower == 0 && upper == 0 {
		return Fixed{V: dom.clamp(mode)}, nil
	}
	s := &SplitNormal{Mode: mode, Lower: lower, Upper: upper, dom: dom}
	var wl, wu float64
	if lower > 0 && mode > dom.lo {
		ld := domain{lo: dom.lo, loOpen: dom.loOpen, hi: math.Min(mode, dom.hi), hiOpen: mode >= dom.hi && dom.hiOpen}
		if ld.lo < ld.hi {
			t, err := newTrunc(mode, lower, ld)
			if err != nil {
				return nil, err
			}
			s.low = t
			// Prior weight of the lower half σ−/(σ−+σ+) times the share of that
			// half-normal left by the truncation, 2·(Φ(b)−Φ(a)).
			wl = lower / (lower + upper) * 2 * t.mass
		}
	}
	if upper > 0 && mode < dom.hi {
		ud := domain{lo: math.Max(mode, dom.lo), loOpen: mode <= dom.lo && dom.loOpen, hi: dom.hi, hiOpen: dom.hiOpen}
		if ud.lo < ud.hi {
			t, err := newTrunc(mode, upper, ud)
			if err != nil {
				return nil, err
			}
			s.up = t
			wu = upper / (lower + upper) * 2 * t.mass
		}
	}
	if !(wl+wu > 0) {
		return Fixed{V: dom.clamp(mode)}, nil
	}
	s.wLow = wl / (wl + wu)
	var m1, v1, m2, v2 float64
	if s.low != nil {
		m1, v1 = s.low.mean, s.low.vr
	}
	if s.up != nil {
		m2, v2 = s.up.mean, s.up.vr
	}
	w1, w2 := s.wLow, 1-s.wLow
	s.mean = w1*m1 + w2*m2
	s.vr = math.Max(0, w1*(v1+m1*m1)+w2*(v2+m2*m2)-s.mean*s.mean)
	return s, nil
}

// Sample draws one value inside the domain.
func (s *SplitNormal) Sample(r *rand.Rand) float64 {
	if s.up == nil || (s.low != nil && r.Float64() < s.wLow) {
		return s.low.Sample(r)
	}
	return s.up.Sample(r)
}

// Fill draws len(dst) values.
func (s *SplitNormal) Fill(r *rand.Rand, dst []float64) {
	for i := range dst {
		dst[i] = s.Sample(r)
	}
}

// Mean of the (truncated) mixture. Untruncated it equals
// Mode + √(2/π)(Upper − Lower) (Wallis 2014, eq. 2).
func (s *SplitNormal) Mean() float64 { return s.mean }

// Variance of the (truncated) mixture. Untruncated it equals
// (1 − 2/π)(Upper − Lower)² + Upper·Lower (Wallis 2014, eq. 3).
func (s *SplitNormal) Variance() float64 { return s.vr }

// Quantile inverts the mixture's CDF.
func (s *SplitNormal) Quantile(p float64) float64 {
	p = math.Min(1, math.Max(0, p))
	if s.up == nil || (s.low != nil && p <= s.wLow) {
		if s.wLow == 0 {
			return s.low.Quantile(0)
		}
		return s.low.Quantile(p / s.wLow)
	}
	if s.wLow >= 1 {
		return s.up.Quantile(0)
	}
	return s.up.Quantile((p - s.wLow) / (1 - s.wLow))
}

// Describe returns "split-normal Mode +Upper −Lower", with the domain when bounded.
func (s *SplitNormal) Describe() string {
	d := "split-normal " + num(s.Mode) + " +" + num(s.Upper) + " −" + num(s.Lower)
	if !math.IsInf(s.dom.lo, -1) || !math.IsInf(s.dom.hi, 1) {
		d += " truncated to " + s.dom.String()
	}
	return d
}

// Fixed reports false.
func (s *SplitNormal) Fixed() bool { return false }

// LogNormal is the distribution of exp(Y) with Y ~ N(ln Median, ln(Factor)²),
// truncated to the key's domain: a value known to within a multiplicative
// factor ×/÷ Factor (one geometric standard deviation).
type LogNormal struct {
	Median, Factor float64
	ln             *TruncNormal
	dom            domain
	mean, vr       float64
}

// NewLogNormal returns the log-normal with the given median (> 0) and ×/÷
// factor (≥ 1), truncated to the key's domain. factor = 1 gives a Fixed value.
func NewLogNormal(median, factor float64, info schema.KeyInfo) (Dist, error) {
	dom := domainOf(info)
	if !(median > 0) || math.IsInf(median, 0) || !(factor >= 1) || math.IsInf(factor, 0) {
		return nil, fmt.Errorf("log-normal needs a median > 0 and a factor ≥ 1, got %g ×/÷ %g", median, factor)
	}
	if factor == 1 {
		return Fixed{V: dom.clamp(median)}, nil
	}
	if !(dom.hi > 0) {
		return nil, fmt.Errorf("log-normal cannot live in the domain %s", dom)
	}
	ld := domain{lo: math.Inf(-1), hi: math.Log(dom.hi), hiOpen: dom.hiOpen}
	if dom.lo > 0 {
		ld.lo, ld.loOpen = math.Log(dom.lo), dom.loOpen
	}
	mu, sig := math.Log(median), math.Log(factor)
	t, err := newTrunc(mu, sig, ld)
	if err != nil {
		return nil, err
	}
	l := &LogNormal{Median: median, Factor: factor, ln: t, dom: dom}
	// Moments of the truncated log-normal: E[X^k] = exp(kμ + k²σ²/2)·
	// [Φ(β − kσ) − Φ(α − kσ)] / [Φ(β) − Φ(α)], with α, β the standardised log
	// bounds (JKB 1994 vol. 1, ch. 14; without truncation the ratio is 1 and
	// the mean is exp(μ + σ²/2), the variance (e^{σ²} − 1)e^{2μ+σ²}).
	alpha, beta := (ld.lo-mu)/sig, (ld.hi-mu)/sig
	z := massBetween(alpha, beta)
	m1 := math.Exp(mu+0.5*sig*sig) * massBetween(alpha-sig, beta-sig) / z
	m2 := math.Exp(2*mu+2*sig*sig) * massBetween(alpha-2*sig, beta-2*sig) / z
	if t.tail || !(z > 0) {
		m1 = math.Exp(t.mean)
		m2 = m1 * m1
	}
	l.mean = m1
	l.vr = math.Max(0, m2-m1*m1)
	return l, nil
}

// Sample draws one value inside the domain.
func (l *LogNormal) Sample(r *rand.Rand) float64 { return l.dom.clamp(math.Exp(l.ln.Sample(r))) }

// Fill draws len(dst) values.
func (l *LogNormal) Fill(r *rand.Rand, dst []float64) {
	for i := range dst {
		dst[i] = l.Sample(r)
	}
}

// Mean of the truncated log-normal.
func (l *LogNormal) Mean() float64 { return l.mean }

// Variance of the truncated log-normal.
func (l *LogNormal) Variance() float64 { return l.vr }

// Quantile is exp of the log-space quantile.
func (l *LogNormal) Quantile(p float64) float64 { return l.dom.clamp(math.Exp(l.ln.Quantile(p))) }

// Describe returns "log-normal Median ×/÷ Factor".
func (l *LogNormal) Describe() string {
	d := "log-normal " + num(l.Median) + " ×/÷ " + num(l.Factor)
	if !math.IsInf(l.dom.hi, 1) || l.dom.lo > 0 {
		d += " truncated to " + l.dom.String()
	}
	return d
}

// Fixed reports false.
func (l *LogNormal) Fixed() bool { return false }
