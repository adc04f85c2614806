package uncertain

import (
	"fmt"
	"math"
	"math/rand/v2"

	"tidesift/schema"
)

const invSqrt2Pi = 0.3989422804014327 // 1/√(2π)

// NormalPDF is the standard normal density φ(x).
func NormalPDF(x float64) float64 { return invSqrt2Pi * math.Exp(-0.5*x*x) }

// NormalCDF is the standard normal distribution function Φ(x), computed from
// erfc so that the lower tail keeps full relative precision (Φ(−30) ≈ 4.9e-198).
func NormalCDF(x float64) float64 { return 0.5 * math.Erfc(-x/math.Sqrt2) }

// NormalQuantile is the standard normal quantile Φ⁻¹(p) for 0 < p < 1 (−Inf at
// 0, +Inf at 1). A starting value from math.Erfinv (or, below 1e-10, the
// asymptotic expansion Φ⁻¹(p) ≈ −√(t − ln t − ln 2π), t = −2 ln p; Abramowitz &
// Stegun 1964, 26.2.23 ff.) is polished by Halley steps on Φ(x) − p, so the
// result has close to full double precision in both tails. (math.Erfcinv is
// Erfinv(1−x) and loses the tail below about 1e-16.)
func NormalQuantile(p float64) float64 {
	switch {
	case p != p:
		return math.NaN()
	case p <= 0:
		return math.Inf(-1)
	case p >= 1:
		return math.Inf(1)
	case p > 0.5:
		return -lowerQuantile(1 - p) // 1−p is exact for p ≥ 1/2 (Sterbenz)
	}
	return lowerQuantile(p)
}

// lowerQuantile is Φ⁻¹(p) for 0 < p ≤ 1/2.
func lowerQuantile(p float64) float64 {
	var x float64
	if p > 1e-10 {
		x = math.Sqrt2 * math.Erfinv(2*p-1)
	} else {
		t := -2 * math.Log(p)
		x = -math.Sqrt(t - math.Log(t) - math.Log(2*math.Pi))
	}
	for range 8 {
		f := NormalPDF(x)
		if f == 0 {
			break
		}
		d := (NormalCDF(x) - p) / f // Newton step
		dx := d / (1 + 0.5*x*d)     // Halley's correction for Φ'' = −xφ
		x -= dx
		if math.Abs(dx) <= 1e-15*math.Abs(x)+1e-300 {
			break
		}
	}
	return x
}

// massBetween is Φ(b) − Φ(a) for a ≤ b, evaluated in whichever tail keeps precision.
func massBetween(a, b float64) float64 {
	if a > 0 {
		return NormalCDF(-a) - NormalCDF(-b)
	}
	return NormalCDF(b) - NormalCDF(a)
}

// xphi is x·φ(x), zero at ±Inf.
func xphi(x float64) float64 {
	if math.IsInf(x, 0) {
		return 0
	}
	return x * NormalPDF(x)
}

// TruncNormal is the normal distribution N(Mu, Sigma²) truncated to a domain.
// With most of the mass inside the domain it samples by rejection (at most 32
// tries; the fallback below is exact too, so the mixture is exactly the
// truncated law); otherwise by inversion, U uniform on [Φ(α), Φ(β)] and
// X = Mu + Sigma Φ⁻¹(U), computed on the side of the mean nearer the domain so
// that far-tail truncations keep their precision. When even that underflows
// (domain beyond about 37σ) it uses the exact exponential-tail rejection
// sampler of the limiting density ∝ exp(−|β|y − y²/2).
type TruncNormal struct {
	Mu, Sigma float64
	dom       domain
	a, b      float64 // standardised bounds, flipped so that a ≤ 0 when flip
	flip      bool
	pa, mass  float64 // Φ(a) and Φ(b) − Φ(a), flipped coordinates
	reject    bool
	tail      bool
	mean, vr  float64
}

// NewNormal returns N(mu, sigma²) truncated to the key's domain (a zero
// KeyInfo means the whole real line). sigma = 0 gives a Fixed value.
func NewNormal(mu, sigma float64, info schema.KeyInfo) (Dist, error) {
	t, err := newTrunc(mu, sigma, domainOf(info))
	if err != nil {
		return nil, err
	}
	if t == nil {
		return Fixed{V: domainOf(info).clamp(mu)}, nil
	}
	return t, nil
}

func newTrunc(mu, sigma float64, dom domain) (*TruncNormal, error) {
	if math.IsNaN(mu) || math.IsInf(mu, 0) || math.IsNaN(sigma) || math.IsInf(sigma, 0) || sigma < 0 {
		return nil, fmt.Errorf("normal needs a finite mean and σ ≥ 0, got %g ± %g", mu, sigma)
	}
	if !(dom.lo < dom.hi) {
		return nil, fmt.Errorf("normal truncated to an empty domain %s", dom)
	}
	if sigma == 0 {
		return nil, nil
	}
	t := &TruncNormal{Mu: mu, Sigma: sigma, dom: dom}
	alpha, beta := (dom.lo-mu)/sigma, (dom.hi-mu)/sigma
	t.a, t.b = alpha, beta
	if alpha > 0 {
		t.flip = true
		t.a, t.b = -beta, -alpha
	}
	t.pa = NormalCDF(t.a)
	t.mass = massBetween(t.a, t.b)
	t.reject = t.mass >= 0.3
	var ms, vs float64 // standardised mean and variance, flipped coordinates
	if !(t.mass > 1e-300) || NormalCDF(t.b) < 1e-290 {
		// Far-tail limit: Z ≈ b − Y, Y ~ Exp(|b|): mean b − 1/|b|, variance 1/b².
		t.tail = true
		t.reject = false
		ms = t.b - 1/math.Abs(t.b)
		vs = 1 / (t.b * t.b)
	} else {
		// Johnson, Kotz & Balakrishnan 1994, Continuous Univariate Distributions
		// vol. 1 (2nd ed.), eqs. 13.134–13.135.
		pda, pdb := NormalPDF(t.a), NormalPDF(t.b)
		if math.IsInf(t.a, 0) {
			pda = 0
		}
		if math.IsInf(t.b, 0) {
			pdb = 0
		}
		ms = (pda - pdb) / t.mass
		vs = 1 + (xphi(t.a)-xphi(t.b))/t.mass - ms*ms
	}
	if vs < 0 {
		vs = 0
	}
	if t.flip {
		ms = -ms
	}
	t.mean = mu + sigma*ms
	t.vr = sigma * sigma * vs
	return t, nil
}

// Sample draws one value inside the domain.
func (t *TruncNormal) Sample(r *rand.Rand) float64 {
	if t.reject {
		for range 32 {
			x := t.Mu + t.Sigma*r.NormFloat64()
			if t.dom.contains(x) {
				return x
			}
		}
	}
	if t.tail {
		return t.fromStd(t.tailDraw(r))
	}
	return t.fromStd(NormalQuantile(t.pa + t.mass*r.Float64()))
}

// tailDraw samples the standardised flipped variable on [a, b] when b is far in
// the lower tail: Y = b − Z has density ∝ exp(−|b|y)·exp(−y²/2) on [0, b−a];
// propose Y ~ Exp(|b|), accept with probability exp(−Y²/2).
func (t *TruncNormal) tailDraw(r *rand.Rand) float64 {
	rate := math.Abs(t.b)
	for range 100 {
		y := r.ExpFloat64() / rate
		if t.b-y < t.a {
			continue
		}
		if r.Float64() < math.Exp(-0.5*y*y) {
			return t.b - y
		}
	}
	return t.b
}

func (t *TruncNormal) fromStd(z float64) float64 {
	if t.flip {
		z = -z
	}
	return t.dom.clamp(t.Mu + t.Sigma*z)
}

// Fill draws len(dst) values, exactly as len(dst) calls of Sample would; the
// common case (a draw strictly inside the domain on the first try) is inlined.
func (t *TruncNormal) Fill(r *rand.Rand, dst []float64) {
	if !t.reject {
		for i := range dst {
			dst[i] = t.Sample(r)
		}
		return
	}
	mu, sg, lo, hi := t.Mu, t.Sigma, t.dom.lo, t.dom.hi
	for i := range dst {
		x := mu + sg*r.NormFloat64()
		if x > lo && x < hi {
			dst[i] = x
			continue
		}
		dst[i] = t.retry(r, x)
	}
}

// retry finishes a Sample whose first rejection draw was x.
func (t *TruncNormal) retry(r *rand.Rand, x float64) float64 {
	if t.dom.contains(x) {
		return x
	}
	for range 31 {
		x = t.Mu + t.Sigma*r.NormFloat64()
		if t.dom.contains(x) {
			return x
		}
	}
	if t.tail {
		return t.fromStd(t.tailDraw(r))
	}
	return t.fromStd(NormalQuantile(t.pa + t.mass*r.Float64()))
}

// Mean is the mean of the truncated law (JKB 1994, eq. 13.134).
func (t *TruncNormal) Mean() float64 { return t.mean }

// Variance is the variance of the truncated law (JKB 1994, eq. 13.135).
func (t *TruncNormal) Variance() float64 { return t.vr }

// Quantile inverts the truncated CDF.
func (t *TruncNormal) Quantile(p float64) float64 {
	p = math.Min(1, math.Max(0, p))
	q := p
	if t.flip {
		q = 1 - p
	}
	if t.tail {
		// Exponential-tail limit: P(Y > y) = exp(−|b|y).
		y := -math.Log1p(-(1 - q)) / math.Abs(t.b)
		return t.fromStd(math.Max(t.a, t.b-y))
	}
	z := NormalQuantile(t.pa + t.mass*q)
	z = math.Min(t.b, math.Max(t.a, z))
	return t.fromStd(z)
}

// Describe returns "normal Mu ± Sigma", with the domain when it is bounded.
func (t *TruncNormal) Describe() string {
	s := "normal " + num(t.Mu) + " ± " + num(t.Sigma)
	if !math.IsInf(t.dom.lo, -1) || !math.IsInf(t.dom.hi, 1) {
		s += " truncated to " + t.dom.String()
	}
	return s
}

// Fixed reports false.
func (t *TruncNormal) Fixed() bool { return false }
