package stats

import (
	"math"
	"math/bits"
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
// (NaN and ±Inf are ignored; x[N:] is left holding NaN). It allocates scratch
// space; a Summarizer reuses its own.
//
// The median's standard error is the McKean & Schrader (1984, Commun. Statist.
// Simul. Comput. 13, 751) estimate (x₍ₙ₋c₊₁₎ − x₍c₎)/(2z) with
// c = ⌊(n+1)/2 − z√(n/4)⌉ and z = z_{0.995}: the half-width of the
// distribution-free confidence interval of the median from order statistics,
// converted to a standard error. It estimates the asymptotic value
// 1/(2f(m)√n) (f the density at the median) without a density estimate, and is
// 0 when the median sits on an atom of the distribution (for example a score
// clamped at 0 in most samples), where the sample median is exact.
func Summarize(x []float64) Summary { return new(Summarizer).Summarize(x, true) }

// Quantiles3 is Summarize without the median's standard error (MedianSE is 0).
func Quantiles3(x []float64) Summary { return new(Summarizer).Summarize(x, false) }

// Summarizer computes Summaries with reusable scratch space. It is not safe
// for concurrent use.
//
// It finds the few order statistics it needs exactly, in two passes instead of
// a sort: a histogram of the values' order-preserving integer keys (at most
// 4,096 bins between the smallest and largest key; the keys of positive
// floats grow like their logarithm, so heavy-tailed samples spread over the
// bins), then a gather of the values in the bins that hold the wanted ranks,
// and a selection (Floyd & Rivest 1975) among those few.
type Summarizer struct {
	scratch []float64
	bins    []uint16 // each value's histogram bin, kept between the two passes
	counts  [histBins + 1]int32
	mark    [histBins + 1]int32
}

const histBins = 4096

// fkey maps a float64 to a uint64 with the same order.
func fkey(v float64) uint64 {
	b := math.Float64bits(v)
	if b>>63 != 0 {
		return ^b
	}
	return b | 1<<63
}

// Summarize is the package-level Summarize (withSE true) or Quantiles3
// (withSE false), reusing z's scratch space.
func (z *Summarizer) Summarize(x []float64, withSE bool) Summary {
	n := 0
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, v := range x {
		if v-v == 0 { // finite: NaN−NaN and Inf−Inf are NaN
			v += 0 // −0 becomes +0, so that float order and key order agree
			x[n] = v
			n++
			if v < lo {
				lo = v
			}
			if v > hi {
				hi = v
			}
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
	var want [8]int
	nw := 0
	for _, k := range [...]int{k05, k05 + 1, k50, k50 + 1, k95, k95 + 1} {
		want[nw] = min(k, n-1)
		nw++
	}
	if withSE {
		want[nw], want[nw+1] = c-1, n-c
		nw += 2
	}
	var val [8]float64
	if n < 64 {
		slices.Sort(x)
		for i := range nw {
			val[i] = x[want[i]]
		}
	} else {
		z.orderStats(x, lo, hi, want[:nw], val[:nw])
	}
	q := func(p float64, i int) float64 {
		h := float64(n-1) * p
		a, b := val[i], val[i+1]
		return a + (h-math.Floor(h))*(b-a)
	}
	s := Summary{N: n, P05: q(0.05, 0), P50: q(0.5, 2), P95: q(0.95, 4)}
	if withSE {
		s.MedianSE = math.Max(0, (val[7]-val[6])/(2*MedianSEZ))
	}
	// Interpolation can put p05 a rounding error above p50 when they are equal.
	s.P05 = math.Min(s.P05, s.P50)
	s.P95 = math.Max(s.P95, s.P50)
	return s
}

// orderStats sets val[i] to the order statistic want[i] (0-based) of x,
// whose finite values lie in [lo, hi], lo < hi.
func (z *Summarizer) orderStats(x []float64, lo, hi float64, want []int, val []float64) {
	kmin := fkey(lo)
	span := fkey(hi) - kmin
	shift := uint(max(0, bits.Len64(span)-12)) // span>>shift < 4096
	nb := int(span>>shift) + 1
	counts := z.counts[:nb]
	clear(counts)
	if cap(z.bins) < len(x) {
		z.bins = make([]uint16, len(x))
	}
	bins := z.bins[:len(x)]
	for i, v := range x {
		b := uint16((fkey(v) - kmin) >> shift)
		bins[i] = b
		counts[b]++
	}
	// Bin and rank within the bin of each wanted order statistic.
	var bin, rank [8]int
	cum, b := 0, 0
	var orderBuf [8]int
	order := orderBuf[:len(want)]
	for i := range order {
		order[i] = i
		for j := i; j > 0 && want[order[j]] < want[order[j-1]]; j-- {
			order[j], order[j-1] = order[j-1], order[j]
		}
	}
	for _, i := range order {
		for cum+int(counts[b]) <= want[i] {
			cum += int(counts[b])
			b++
		}
		bin[i], rank[i] = b, want[i]-cum
	}
	// Gather the wanted bins' values, each bin's contiguous in scratch.
	mark := z.mark[:nb]
	var start [8]int
	total := 0
	nbins := 0
	for _, i := range order {
		if mark[bin[i]] == 0 {
			nbins++
			mark[bin[i]] = int32(nbins)
			start[nbins-1] = total
			total += int(counts[bin[i]])
		}
	}
	if cap(z.scratch) < total {
		z.scratch = make([]float64, total)
	}
	g := z.scratch[:total]
	var fill [8]int
	copy(fill[:], start[:])
	for i, v := range x {
		if m := mark[bins[i]]; m != 0 {
			g[fill[m-1]] = v
			fill[m-1]++
		}
	}
	for _, i := range order {
		m := int(mark[bin[i]]) - 1
		sub := g[start[m] : start[m]+int(counts[bin[i]])]
		Select(sub, 0, len(sub)-1, rank[i])
		val[i] = sub[rank[i]]
	}
	for _, i := range order {
		mark[bin[i]] = 0
	}
}

// qIndex is ⌊(n−1)p⌋, the lower order statistic of the type-7 p-quantile.
func qIndex(n int, p float64) int { return int(math.Floor(float64(n-1) * p)) }

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
