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

// Partition cuts the range of an input into M classes of equal width, on a
// linear scale or on a logarithmic one, with values beyond either end put in
// the end classes. Finding a class costs a multiply, not a search, which
// matters at 10⁸ samples × inputs. The estimator holds for any partition;
// classes of roughly equal probability make it most efficient, so the engine
// puts the ends at the 0.5 % and 99.5 % quantiles of each input's
// distribution and takes the log scale for log-normal and log-uniform inputs.
type Partition struct {
	M      int     // number of classes, ≥ 1
	Lo, Hi float64 // range covered by the classes (Lo < Hi, both > 0 on a log scale)
	Log    bool    // equal widths in log x (x ≤ 0 goes to the first class)
}

// key is the scale the classes are equal on. The log scale uses the bit
// pattern of the (positive) float as an integer, which is increasing in x and
// within 0.09 of 2⁵²·(log₂x + 1023) — a logarithm to well within a class width.
func (p Partition) key(x float64) float64 {
	if p.Log {
		if !(x > 0) {
			return 0
		}
		return float64(math.Float64bits(x))
	}
	return x
}

// Accumulator collects Σy and the count per class for one input.
type Accumulator struct {
	Part      Partition
	Sum       []float64
	Count     []int64
	lo, scale float64
}

// NewAccumulator returns an empty accumulator over the classes of p.
func NewAccumulator(p Partition) *Accumulator {
	a := &Accumulator{}
	a.Reset(p)
	return a
}

// Reset empties the accumulator and gives it a new partition.
func (a *Accumulator) Reset(p Partition) {
	p.M = max(p.M, 1)
	if cap(a.Sum) < p.M {
		a.Sum = make([]float64, p.M)
		a.Count = make([]int64, p.M)
	}
	a.Part, a.Sum, a.Count = p, a.Sum[:p.M], a.Count[:p.M]
	clear(a.Sum)
	clear(a.Count)
	a.lo = p.key(p.Lo)
	w := p.key(p.Hi) - a.lo
	a.scale = 0
	if w > 0 && !math.IsInf(w, 0) {
		a.scale = float64(p.M) / w
	}
}

// Class returns the class of x, 0 … M−1.
func (a *Accumulator) Class(x float64) int {
	t := (a.Part.key(x) - a.lo) * a.scale
	switch {
	case !(t > 0): // also NaN
		return 0
	case t >= float64(a.Part.M):
		return a.Part.M - 1
	}
	return int(t)
}

// Add records one sample.
func (a *Accumulator) Add(x, y float64) {
	c := a.Class(x)
	a.Sum[c] += y
	a.Count[c]++
}

// AddAll records the samples (xs[i], ys[i]), as len(xs) calls of Add would.
func (a *Accumulator) AddAll(xs, ys []float64) {
	// Class and Add, inlined by hand with the partition's scale branch
	// hoisted out of the loop; the classes and sums are exactly Add's.
	ys = ys[:len(xs)]
	sum := a.Sum
	count := a.Count[:len(sum)]
	m := a.Part.M
	fm := float64(m)
	lo, scale := a.lo, a.scale
	add := func(i int, t float64) {
		c := 0
		if t >= fm {
			c = m - 1
		} else if t > 0 {
			c = int(t)
		}
		sum[c] += ys[i]
		count[c]++
	}
	if a.Part.Log {
		for i, x := range xs {
			k := 0.0
			if x > 0 {
				// x > 0 has its sign bit clear, so int64 holds the bits
				// exactly and converts to the same float64 as uint64 does.
				k = float64(int64(math.Float64bits(x)))
			}
			add(i, (k-lo)*scale)
		}
		return
	}
	for i, x := range xs {
		add(i, (x-lo)*scale)
	}
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
