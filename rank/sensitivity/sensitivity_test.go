package sensitivity

import (
	"math"
	"math/rand/v2"
	"testing"
)

// ishigami is the Ishigami & Homma (1990) test function,
// f = sin x₁ + a sin² x₂ + b x₃⁴ sin x₁ with xᵢ ~ U(−π, π). For a = 7, b = 0.1
// the first-order indices are S₁ ≈ 0.3139, S₂ ≈ 0.4424, S₃ = 0 (Ishigami &
// Homma 1990, Proc. ISUMA '90, 398; analytic values as tabulated by Saltelli
// et al. 2008, Global Sensitivity Analysis: The Primer, §4.7).
func ishigami(x1, x2, x3 float64) float64 {
	const a, b = 7, 0.1
	s2 := math.Sin(x2)
	return math.Sin(x1) + a*s2*s2 + b*x3*x3*x3*x3*math.Sin(x1)
}

// Analytic indices from the variance decomposition (Saltelli et al. 2008):
// V = a²/8 + bπ⁴/5 + b²π⁸/18 + 1/2, V₁ = (1 + bπ⁴/5)²/2, V₂ = a²/8, V₃ = 0.
func ishigamiIndices() [3]float64 {
	const a, b = 7.0, 0.1
	pi4 := math.Pow(math.Pi, 4)
	v := a*a/8 + b*pi4/5 + b*b*pi4*pi4/18 + 0.5
	v1 := 0.5 * (1 + b*pi4/5) * (1 + b*pi4/5)
	return [3]float64{v1 / v, a * a / 8 / v, 0}
}

func TestIshigami(t *testing.T) {
	want := ishigamiIndices()
	if math.Abs(want[0]-0.314) > 5e-4 || math.Abs(want[1]-0.442) > 5e-4 {
		t.Fatalf("analytic indices %v", want)
	}
	const n = 20000
	r := rand.New(rand.NewPCG(1, 1))
	x := [3][]float64{make([]float64, n), make([]float64, n), make([]float64, n)}
	y := make([]float64, n)
	for i := range n {
		for j := range 3 {
			x[j][i] = -math.Pi + 2*math.Pi*r.Float64()
		}
		y[i] = ishigami(x[0][i], x[1][i], x[2][i])
	}
	m := ClassCount(n)
	// Stored-sample estimator.
	for j := range 3 {
		if got := FirstOrder(x[j], y, m); math.Abs(got-want[j]) > 0.03 {
			t.Errorf("FirstOrder S%d = %.4f, want %.4f ± 0.03", j+1, got, want[j])
		}
	}
	// Streaming estimator with edges from the uniform quantile function, as
	// the engine uses it.
	var mean, vr float64
	for _, v := range y {
		mean += v
	}
	mean /= n
	for _, v := range y {
		vr += (v - mean) * (v - mean)
	}
	vr /= n
	part := Partition{M: m, Lo: -math.Pi, Hi: math.Pi}
	for j := range 3 {
		acc := NewAccumulator(part)
		for i := range n {
			acc.Add(x[j][i], y[i])
		}
		if got := acc.Index(mean, vr); math.Abs(got-want[j]) > 0.03 {
			t.Errorf("Accumulator S%d = %.4f, want %.4f ± 0.03", j+1, got, want[j])
		}
	}
}

func TestDegenerate(t *testing.T) {
	y := []float64{1, 1, 1, 1}
	if FirstOrder([]float64{1, 2, 3, 4}, y, 2) != 0 {
		t.Error("constant output: want 0")
	}
	acc := NewAccumulator(Partition{M: 2, Lo: 0, Hi: 1})
	acc.Add(0, 1)
	if acc.Index(1, 0) != 0 {
		t.Error("zero variance: want 0")
	}
	// y = x exactly: S = 1 up to the within-class variance 1/M².
	n := 10000
	x := make([]float64, n)
	for i := range x {
		x[i] = float64(i)
	}
	if s := FirstOrder(x, x, 50); s < 0.99 || s > 1 {
		t.Errorf("y = x: S = %g", s)
	}
}

func TestPartitionClass(t *testing.T) {
	lin := NewAccumulator(Partition{M: 4, Lo: 0, Hi: 4})
	lg := NewAccumulator(Partition{M: 4, Lo: 1, Hi: 1e4, Log: true})
	cases := []struct {
		a    *Accumulator
		x    float64
		want int
	}{
		{lin, -1, 0}, {lin, 0, 0}, {lin, 0.99, 0}, {lin, 1, 1}, {lin, 3.5, 3}, {lin, 4, 3}, {lin, 99, 3}, {lin, math.NaN(), 0},
		{lg, 0, 0}, {lg, -5, 0}, {lg, 2, 0}, {lg, 50, 1}, {lg, 500, 2}, {lg, 5000, 3}, {lg, 1e9, 3}, {lg, math.Inf(1), 3},
	}
	for _, c := range cases {
		if got := c.a.Class(c.x); got != c.want {
			t.Errorf("%+v: Class(%g) = %d, want %d", c.a.Part, c.x, got, c.want)
		}
	}
}

// TestLogPartition: for a log-normal input the log-scale partition agrees
// with the rank-based estimator. y = ln x + noise with V(ln x) = 1 and noise
// variance 1/3 has S = 0.75 exactly.
func TestLogPartition(t *testing.T) {
	const n = 20000
	r := rand.New(rand.NewPCG(4, 4))
	x, y := make([]float64, n), make([]float64, n)
	for i := range n {
		z := r.NormFloat64()
		x[i] = math.Exp(z)
		y[i] = z + (r.Float64()-0.5)*2 // uniform(−1, 1): variance 1/3
	}
	m := ClassCount(n)
	a := NewAccumulator(Partition{M: m, Lo: math.Exp(-2.576), Hi: math.Exp(2.576), Log: true})
	a.AddAll(x, y)
	var mean, vr float64
	for _, v := range y {
		mean += v
	}
	mean /= n
	for _, v := range y {
		vr += (v - mean) * (v - mean)
	}
	vr /= n
	got, ref := a.Index(mean, vr), FirstOrder(x, y, m)
	if math.Abs(got-0.75) > 0.03 || math.Abs(ref-0.75) > 0.03 {
		t.Errorf("log partition %.4f, ranks %.4f, want 0.75 ± 0.03", got, ref)
	}
}

// TestIrrelevantInputNearZero: an input independent of y gets ≈ 0 after the
// noise-bias adjustment (without it, about (M−1)/n).
func TestIrrelevantInputNearZero(t *testing.T) {
	const n = 10000
	r := rand.New(rand.NewPCG(9, 9))
	x, y := make([]float64, n), make([]float64, n)
	var mean float64
	for i := range n {
		x[i], y[i] = r.Float64(), r.NormFloat64()
	}
	m := ClassCount(n)
	var sum float64
	for range 20 {
		for i := range n {
			y[i] = r.NormFloat64()
		}
		sum += FirstOrder(x, y, m)
	}
	mean = sum / 20
	if mean > 0.5*float64(m-1)/n {
		t.Errorf("mean share of an irrelevant input %g, want ≈ 0 (unadjusted bias %g)", mean, float64(m-1)/n)
	}
}

func TestAddAllMatchesAdd(t *testing.T) {
	r := rand.New(rand.NewPCG(2, 3))
	for _, p := range []Partition{{M: 1, Lo: 0, Hi: 1}, {M: 7, Lo: -2, Hi: 2}, {M: 33, Lo: 0.1, Hi: 10, Log: true}} {
		xs, ys := make([]float64, 5000), make([]float64, 5000)
		for i := range xs {
			xs[i] = math.Exp(r.NormFloat64())
			ys[i] = r.Float64()
		}
		a, b := NewAccumulator(p), NewAccumulator(p)
		for i := range xs {
			a.Add(xs[i], ys[i])
		}
		b.AddAll(xs, ys)
		for c := range a.Count {
			if a.Count[c] != b.Count[c] || math.Abs(a.Sum[c]-b.Sum[c]) > 1e-9 {
				t.Fatalf("%+v class %d: Add %d/%g, AddAll %d/%g", p, c, a.Count[c], a.Sum[c], b.Count[c], b.Sum[c])
			}
		}
	}
}

// TestAddAllSpecialValues: AddAll's hand-inlined loop gives exactly the classes
// and sums of repeated Add calls, on linear and log partitions, including
// values outside the partition, zero, negative, infinite and NaN.
func TestAddAllSpecialValues(t *testing.T) {
	r := rand.New(rand.NewPCG(2, 2))
	xs, ys := make([]float64, 5000), make([]float64, 5000)
	for i := range xs {
		switch i % 10 {
		case 0:
			xs[i] = math.NaN()
		case 1:
			xs[i] = math.Inf(1 - 2*(i/10%2))
		case 2:
			xs[i] = -r.Float64()
		case 3:
			xs[i] = 0
		default:
			xs[i] = math.Exp(3 * r.NormFloat64())
		}
		ys[i] = r.NormFloat64()
	}
	for _, p := range []Partition{{M: 7, Lo: 0.1, Hi: 10}, {M: 7, Lo: 0.1, Hi: 10, Log: true}, {M: 1, Lo: 0, Hi: 1}} {
		a, b := NewAccumulator(p), NewAccumulator(p)
		a.AddAll(xs, ys)
		for i := range xs {
			b.Add(xs[i], ys[i])
		}
		for m := range a.Sum {
			if a.Count[m] != b.Count[m] || math.Float64bits(a.Sum[m]) != math.Float64bits(b.Sum[m]) {
				t.Fatalf("%+v class %d: AddAll %d, %v; Add %d, %v", p, m, a.Count[m], a.Sum[m], b.Count[m], b.Sum[m])
			}
		}
	}
}
