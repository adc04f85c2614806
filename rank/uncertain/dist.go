package uncertain

import (
	"fmt"
	"math"
	"math/rand/v2"
	"strconv"

	"tidesift/schema"
)

// Dist is a univariate distribution of one input, in the SI unit of its key.
// Implementations are immutable after construction and safe for concurrent use
// (each goroutine passes its own *rand.Rand).
type Dist interface {
	// Sample draws one value. It never returns a value outside the domain the
	// distribution was built for, and never NaN.
	Sample(r *rand.Rand) float64
	// Fill draws len(dst) values, exactly as len(dst) calls of Sample would.
	Fill(r *rand.Rand, dst []float64)
	// Mean is the expectation of the distribution actually sampled (after truncation).
	Mean() float64
	// Variance is the variance of the distribution actually sampled.
	Variance() float64
	// Quantile returns the p-quantile, 0 ≤ p ≤ 1 (the inverse CDF).
	Quantile(p float64) float64
	// Describe is a short human description, such as "log-uniform 1e-05…0.1".
	Describe() string
	// Fixed reports whether the distribution is a point mass (no uncertainty).
	Fixed() bool
}

// Median returns the 0.5-quantile of d.
func Median(d Dist) float64 { return d.Quantile(0.5) }

// num formats a number for Describe: four significant digits, no trailing zeros.
func num(x float64) string { return strconv.FormatFloat(x, 'g', 4, 64) }

// domain is a physical domain with optionally open ends.
type domain struct {
	lo, hi         float64
	loOpen, hiOpen bool
}

func domainOf(info schema.KeyInfo) domain {
	lo, hi := info.Min, info.Max
	if lo == 0 && hi == 0 && !info.MinOpen && !info.MaxOpen {
		// A zero KeyInfo: the whole real line.
		lo, hi = math.Inf(-1), math.Inf(1)
	}
	return domain{lo: lo, hi: hi, loOpen: info.MinOpen, hiOpen: info.MaxOpen}
}

var realLine = domain{lo: math.Inf(-1), hi: math.Inf(1)}

func (d domain) contains(x float64) bool {
	if x != x {
		return false
	}
	if x < d.lo || (d.loOpen && x == d.lo) {
		return false
	}
	if x > d.hi || (d.hiOpen && x == d.hi) {
		return false
	}
	return true
}

// clamp moves x (which should already lie in the domain, up to rounding) into
// the domain: onto a closed end, or one ulp inside an open end.
func (d domain) clamp(x float64) float64 {
	if x != x {
		// Only reachable by a bug upstream; stay in the domain regardless.
		x = d.lo
	}
	if x < d.lo || (x == d.lo && d.loOpen) {
		x = d.lo
		if d.loOpen {
			x = math.Nextafter(d.lo, math.Inf(1))
		}
	}
	if x > d.hi || (x == d.hi && d.hiOpen) {
		x = d.hi
		if d.hiOpen {
			x = math.Nextafter(d.hi, math.Inf(-1))
		}
	}
	return x
}

// String renders the domain as an interval.
func (d domain) String() string {
	lo, hi := "[", "]"
	if d.loOpen || math.IsInf(d.lo, -1) {
		lo = "("
	}
	if d.hiOpen || math.IsInf(d.hi, 1) {
		hi = ")"
	}
	return fmt.Sprintf("%s%s, %s%s", lo, num(d.lo), num(d.hi), hi)
}

// Fixed is a point mass: an input given without uncertainty.
type Fixed struct{ V float64 }

// NewFixed returns the point mass at v.
func NewFixed(v float64) Fixed { return Fixed{V: v} }

// Sample returns V.
func (f Fixed) Sample(*rand.Rand) float64 { return f.V }

// Fill sets every element of dst to V; it draws nothing from r.
func (f Fixed) Fill(_ *rand.Rand, dst []float64) {
	for i := range dst {
		dst[i] = f.V
	}
}

// Mean returns V.
func (f Fixed) Mean() float64 { return f.V }

// Variance returns 0.
func (f Fixed) Variance() float64 { return 0 }

// Quantile returns V for every p.
func (f Fixed) Quantile(float64) float64 { return f.V }

// Describe returns "fixed V".
func (f Fixed) Describe() string { return "fixed " + num(f.V) }

// Fixed reports true.
func (f Fixed) Fixed() bool { return true }

// Uniform is the uniform distribution on [Lo, Hi] (restricted to its domain).
type Uniform struct {
	Lo, Hi float64
	dom    domain
}

// NewUniform returns the uniform distribution on [lo, hi] ∩ the key's domain.
func NewUniform(lo, hi float64, info schema.KeyInfo) (Dist, error) {
	dom := domainOf(info)
	if !(lo <= hi) || math.IsInf(lo, 0) || math.IsInf(hi, 0) {
		return nil, fmt.Errorf("uniform needs finite min ≤ max, got %g…%g", lo, hi)
	}
	lo, hi = math.Max(lo, dom.lo), math.Min(hi, dom.hi)
	if lo > hi {
		return nil, fmt.Errorf("uniform range %g…%g lies outside the domain %s", lo, hi, dom)
	}
	if lo == hi {
		return Fixed{V: dom.clamp(lo)}, nil
	}
	return Uniform{Lo: lo, Hi: hi, dom: dom}, nil
}

// Sample draws Lo + (Hi−Lo)·U.
func (u Uniform) Sample(r *rand.Rand) float64 {
	return u.dom.clamp(u.Lo + (u.Hi-u.Lo)*r.Float64())
}

// Fill draws len(dst) values.
func (u Uniform) Fill(r *rand.Rand, dst []float64) {
	for i := range dst {
		dst[i] = u.Sample(r)
	}
}

// Mean is (Lo+Hi)/2.
func (u Uniform) Mean() float64 { return 0.5 * (u.Lo + u.Hi) }

// Variance is (Hi−Lo)²/12 (Johnson, Kotz & Balakrishnan 1995, Continuous
// Univariate Distributions vol. 2, ch. 26).
func (u Uniform) Variance() float64 { w := u.Hi - u.Lo; return w * w / 12 }

// Quantile is Lo + p(Hi−Lo).
func (u Uniform) Quantile(p float64) float64 { return u.dom.clamp(u.Lo + p*(u.Hi-u.Lo)) }

// Describe returns "uniform Lo…Hi".
func (u Uniform) Describe() string { return "uniform " + num(u.Lo) + "…" + num(u.Hi) }

// Fixed reports false.
func (u Uniform) Fixed() bool { return false }

// LogUniform is the distribution whose logarithm is uniform on [ln Lo, ln Hi]:
// every decade between Lo and Hi is equally likely. It is the usual prior for a
// positive scale parameter known only to within orders of magnitude, such as k2/Q.
type LogUniform struct {
	Lo, Hi   float64
	lnLo, lw float64
	dom      domain
}

// NewLogUniform returns the log-uniform distribution on [lo, hi] ∩ the key's
// domain; 0 < lo ≤ hi.
func NewLogUniform(lo, hi float64, info schema.KeyInfo) (Dist, error) {
	dom := domainOf(info)
	if !(lo > 0) || !(lo <= hi) || math.IsInf(hi, 0) {
		return nil, fmt.Errorf("log-uniform needs 0 < min ≤ max < ∞, got %g…%g", lo, hi)
	}
	if hi > dom.hi {
		hi = dom.hi
	}
	if lo < dom.lo {
		lo = dom.lo
	}
	if !(lo > 0) || lo > hi {
		return nil, fmt.Errorf("log-uniform range lies outside the domain %s", dom)
	}
	if lo == hi {
		return Fixed{V: dom.clamp(lo)}, nil
	}
	return LogUniform{Lo: lo, Hi: hi, lnLo: math.Log(lo), lw: math.Log(hi / lo), dom: dom}, nil
}

// Sample draws exp(ln Lo + U·ln(Hi/Lo)).
func (l LogUniform) Sample(r *rand.Rand) float64 {
	return l.dom.clamp(math.Exp(l.lnLo + l.lw*r.Float64()))
}

// Fill draws len(dst) values.
func (l LogUniform) Fill(r *rand.Rand, dst []float64) {
	for i := range dst {
		dst[i] = l.Sample(r)
	}
}

// Mean is (Hi−Lo)/ln(Hi/Lo) (the reciprocal distribution; Hamming 1970, Bell
// Syst. Tech. J. 49, 1609, and any table of the log-uniform law).
func (l LogUniform) Mean() float64 { return (l.Hi - l.Lo) / l.lw }

// Variance is (Hi²−Lo²)/(2 ln(Hi/Lo)) − Mean².
func (l LogUniform) Variance() float64 {
	m := l.Mean()
	return (l.Hi*l.Hi-l.Lo*l.Lo)/(2*l.lw) - m*m
}

// Quantile is Lo·(Hi/Lo)^p.
func (l LogUniform) Quantile(p float64) float64 { return l.dom.clamp(math.Exp(l.lnLo + p*l.lw)) }

// Describe returns "log-uniform Lo…Hi".
func (l LogUniform) Describe() string { return "log-uniform " + num(l.Lo) + "…" + num(l.Hi) }

// Fixed reports false.
func (l LogUniform) Fixed() bool { return false }
