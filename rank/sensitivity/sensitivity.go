package sensitivity

import (
	"math"
	"sort"
)

// ClassCount is the number of classes M used for n samples: ⌊√n / 3⌋ clamped
// to [2, 50] (33 classes for 10,000 samples). This is our choice, balancing
// the noise bias ≈ (M−1)/n·(1 − S) against the resolution of E[Y | X]; the
// Ishigami test in this package checks it.
func ClassCount(n int) int {
	m := int(math.Sqrt(float64(n)) / 3)
	return max(2, min(50, m))
}

// Edges returns the M−1 inner class edges q(1/M), …, q((M−1)/M) of a
// distribution given by its quantile function.
func Edges(quantile func(p float64) float64, m int) []float64 {
	e := make([]float64, m-1)
	for i := range e {
		e[i] = quantile(float64(i+1) / float64(m))
	}
	return e
}

// Class returns the class of x for inner edges e: the number of edges ≤ x.
func Class(e []float64, x float64) int {
	lo, hi := 0, len(e)
	for lo < hi {
		mid := int(uint(lo+hi) >> 1)
		if e[mid] <= x {
			lo = mid + 1
		} else {
			hi = mid
		}
	}
	return lo
}

// Accumulator collects Σy and the count per class for one input.
type Accumulator struct {
	Edges []float64
	Sum   []float64
	Count []int64
}

// NewAccumulator returns an empty accumulator over the classes of edges.
func NewAccumulator(edges []float64) *Accumulator {
	m := len(edges) + 1
	return &Accumulator{Edges: edges, Sum: make([]float64, m), Count: make([]int64, m)}
}

// Reset empties the accumulator and gives it new edges (of the same count or fewer).
func (a *Accumulator) Reset(edges []float64) {
	m := len(edges) + 1
	if cap(a.Sum) < m {
		a.Sum = make([]float64, m)
		a.Count = make([]int64, m)
	}
	a.Edges, a.Sum, a.Count = edges, a.Sum[:m], a.Count[:m]
	clear(a.Sum)
	clear(a.Count)
}

// Add records one sample.
func (a *Accumulator) Add(x, y float64) {
	c := Class(a.Edges, x)
	a.Sum[c] += y
	a.Count[c]++
}

// Index returns the first-order index estimate given the mean and
// (population) variance of y over the same n samples. It returns 0 when
// varY is 0, and clips the estimate to [0, 1].
func (a *Accumulator) Index(meanY, varY float64) float64 {
	if !(varY > 0) {
		return 0
	}
	var between float64
	var n int64
	for m, c := range a.Count {
		if c == 0 {
			continue
		}
		d := a.Sum[m]/float64(c) - meanY
		between += float64(c) * d * d
		n += c
	}
	if n == 0 {
		return 0
	}
	return adjusted(between/float64(n)/varY, int(n), len(a.Count))
}

// adjusted applies Kelley's (1935, PNAS 21, 554) correction of the
// correlation ratio for its noise bias, ε² = 1 − (1 − η²)(n − 1)/(n − M):
// with an input that does not matter, η² averages (M − 1)/(n − 1) and ε² 0.
// The result is clipped to [0, 1].
func adjusted(eta2 float64, n, m int) float64 {
	if n <= m {
		return clip(eta2)
	}
	return clip(1 - (1-eta2)*float64(n-1)/float64(n-m))
}

func clip(s float64) float64 {
	switch {
	case s < 0, s != s:
		return 0
	case s > 1:
		return 1
	}
	return s
}

// FirstOrder estimates the first-order index of x on y from n paired samples
// with m classes of equal size formed by ranking x (ties keep sample order).
func FirstOrder(x, y []float64, m int) float64 {
	n := len(y)
	if n < 2 || len(x) != n || m < 1 {
		return 0
	}
	idx := make([]int, n)
	for i := range idx {
		idx[i] = i
	}
	sort.SliceStable(idx, func(i, j int) bool { return x[idx[i]] < x[idx[j]] })
	var mean float64
	for _, v := range y {
		mean += v
	}
	mean /= float64(n)
	var vr float64
	for _, v := range y {
		vr += (v - mean) * (v - mean)
	}
	vr /= float64(n)
	if !(vr > 0) {
		return 0
	}
	var between float64
	for c := range m {
		lo, hi := c*n/m, (c+1)*n/m
		if hi <= lo {
			continue
		}
		var s float64
		for _, i := range idx[lo:hi] {
			s += y[i]
		}
		d := s/float64(hi-lo) - mean
		between += float64(hi-lo) * d * d
	}
	return adjusted(between/float64(n)/vr, n, m)
}
