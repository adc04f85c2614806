package stats

import (
	"math"
	"slices"
)

// Quantile returns the type-7 p-quantile of sorted (ascending, no NaN), or NaN
// when it is empty.
func Quantile(sorted []float64, p float64) float64 {
	n := len(sorted)
	if n == 0 {
		return math.NaN()
	}
	h := float64(n-1) * p
	lo := int(math.Floor(h))
	if lo < 0 {
		return sorted[0]
	}
	if lo >= n-1 {
		return sorted[n-1]
	}
	return sorted[lo] + (h-float64(lo))*(sorted[lo+1]-sorted[lo])
}

// Summary holds the quantiles and Monte Carlo standard error Summarize reports.
type Summary struct {
	N             int     // finite values summarised
	P05, P50, P95 float64 // type-7 quantiles
	MedianSE      float64 // standard error of P50 (McKean & Schrader 1984)
}

// MedianSEZ is z_{0.995} = Φ⁻¹(0.995), the normal quantile of the
// McKean–Schrader order-statistic interval.
const MedianSEZ = 2.5758293035489004

// Summarize returns the 5 %, 50 % and 95 % type-7 quantiles of the finite
// values of x and the standard error of the median, reordering x in place
// (NaN and ±Inf are ignored; x[N:] is left holding NaN). It selects the order
// statistics it needs (Floyd & Rivest 1975) instead of sorting: about four
// passes over x.
//
// The median's standard error is the McKean & Schrader (1984, Commun. Statist.
// Simul. Comput. 13, 751) estimate (x₍ₙ₋c₊₁₎ − x₍c₎)/(2z) with
// c = ⌊(n+1)/2 − z√(n/4)⌉ and z = z_{0.995}: the half-width of the
// distribution-free confidence interval of the median from order statistics,
// converted to a standard error. It estimates the asymptotic value
// 1/(2f(m)√n) (f the density at the median) without a density estimate, and is
// 0 when the median sits on an atom of the distribution (for example a score
// clamped at 0 in most samples), where the sample median is exact.
func Summarize(x []float64) Summary { return summarize(x, true) }

// Quantiles3 is Summarize without the median's standard error (MedianSE is 0),
// which saves two selections.
func Quantiles3(x []float64) Summary { return summarize(x, false) }

func summarize(x []float64, withSE bool) Summary {
	n := 0
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, v := range x {
		if !math.IsNaN(v) && !math.IsInf(v, 0) {
			x[n] = v
			n++
			lo = math.Min(lo, v)
			hi = math.Max(hi, v)
		}
	}
	for i := n; i < len(x); i++ {
		x[i] = math.NaN()
	}
	x = x[:n]
	switch {
	case n == 0:
		return Summary{P05: math.NaN(), P50: math.NaN(), P95: math.NaN(), MedianSE: math.NaN()}
	case lo == hi:
		return Summary{N: n, P05: lo, P50: lo, P95: lo}
	}
	k05, k50, k95 := qIndex(n, 0.05), qIndex(n, 0.5), qIndex(n, 0.95)
	c := int(math.Round(float64(n+1)/2 - MedianSEZ*math.Sqrt(float64(n)/4)))
	c = max(c, 1)
	if n < 64 {
		slices.Sort(x)
	} else {
		// Median first, then each quantile inside its side; the order
		// statistic after each is the minimum of what lies above it.
		Select(x, 0, n-1, k50)
		minTo(x, k50+1, n)
		if k05 < k50 {
			Select(x, 0, k50-1, k05)
			minTo(x, k05+1, k50)
		}
		if k95 > k50+1 {
			Select(x, k50+2, n-1, k95)
			minTo(x, k95+1, n)
		}
		if withSE {
			// For n ≥ 64, k05+1 < c−1 < k50 and k50+1 < n−c < k95.
			if c-1 > k05+1 && c-1 < k50 {
				Select(x, k05+2, k50-1, c-1)
			}
			if n-c > k50+1 && n-c < k95 {
				Select(x, k50+2, k95-1, n-c)
			}
		}
	}
	q := func(p float64, k int) float64 {
		h := float64(n-1) * p
		if k >= n-1 {
			return x[n-1]
		}
		return x[k] + (h-float64(k))*(x[k+1]-x[k])
	}
	s := Summary{N: n, P05: q(0.05, k05), P50: q(0.5, k50), P95: q(0.95, k95)}
	if withSE {
		s.MedianSE = math.Max(0, (x[n-c]-x[c-1])/(2*MedianSEZ))
	}
	// Interpolation can put p05 a rounding error above p50 when they are equal.
	s.P05 = math.Min(s.P05, s.P50)
	s.P95 = math.Max(s.P95, s.P50)
	return s
}

// qIndex is ⌊(n−1)p⌋, the lower order statistic of the type-7 p-quantile.
func qIndex(n int, p float64) int { return int(math.Floor(float64(n-1) * p)) }

// minTo moves the minimum of x[lo:hi] to x[lo].
func minTo(x []float64, lo, hi int) {
	if lo >= hi {
		return
	}
	m := lo
	for i := lo + 1; i < hi; i++ {
		if x[i] < x[m] {
			m = i
		}
	}
	x[lo], x[m] = x[m], x[lo]
}

// SelectMany reorders x so that x[k] holds the value it would hold if x were
// sorted, for every k in ks (ascending, distinct, in range), with everything
// between two selected positions lying between their values. x must hold no NaN.
func SelectMany(x []float64, ks []int) {
	selectMany(x, 0, len(x)-1, ks)
}

func selectMany(x []float64, left, right int, ks []int) {
	if len(ks) == 0 || left > right {
		return
	}
	m := len(ks) / 2
	k := ks[m]
	Select(x, left, right, k)
	selectMany(x, left, k-1, ks[:m])
	selectMany(x, k+1, right, ks[m+1:])
}

// Select rearranges x[left..right] (inclusive) so that x[k] is the element
// that would be there after sorting, smaller or equal elements before it and
// greater or equal after. It is the SELECT algorithm of Floyd & Rivest (1975,
// Commun. ACM 18, 173, Algorithm 489): recursive sampling narrows the range so
// that about n + min(k, n−k) comparisons suffice. x must hold no NaN.
func Select(x []float64, left, right, k int) {
	for right > left {
		if right-left > 600 {
			n := float64(right - left + 1)
			i := float64(k - left + 1)
			z := math.Log(n)
			s := 0.5 * math.Exp(2*z/3)
			sd := 0.5 * math.Sqrt(z*s*(n-s)/n)
			if i < n/2 {
				sd = -sd
			}
			nl := max(left, int(float64(k)-i*s/n+sd))
			nr := min(right, int(float64(k)+(n-i)*s/n+sd))
			Select(x, nl, nr, k)
		}
		t := x[k]
		i, j := left, right
		x[left], x[k] = x[k], x[left]
		if x[right] > t {
			x[right], x[left] = x[left], x[right]
		}
		for i < j {
			x[i], x[j] = x[j], x[i]
			i++
			j--
			for x[i] < t {
				i++
			}
			for x[j] > t {
				j--
			}
		}
		if x[left] == t {
			x[left], x[j] = x[j], x[left]
		} else {
			j++
			x[j], x[right] = x[right], x[j]
		}
		if j <= k {
			left = j + 1
		}
		if k <= j {
			right = j - 1
		}
	}
}

// BinomialSE is the Monte Carlo standard error √(p(1−p)/n) of a proportion p
// estimated from n independent samples (the binomial standard deviation of the
// sample proportion). It is 0 at p = 0 or 1, where it says nothing about how
// rare the event might still be.
func BinomialSE(p float64, n int) float64 {
	if n <= 0 {
		return math.NaN()
	}
	return math.Sqrt(math.Max(0, p*(1-p)) / float64(n))
}
