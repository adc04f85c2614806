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
	edges := Edges(func(p float64) float64 { return -math.Pi + 2*math.Pi*p }, m)
	for j := range 3 {
		acc := NewAccumulator(edges)
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
	acc := NewAccumulator([]float64{0.5})
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

func TestClass(t *testing.T) {
	e := []float64{1, 2, 3}
	for _, c := range []struct {
		x    float64
		want int
	}{{0, 0}, {1, 1}, {1.5, 1}, {3, 3}, {9, 3}, {math.Inf(-1), 0}} {
		if got := Class(e, c.x); got != c.want {
			t.Errorf("Class(%g) = %d, want %d", c.x, got, c.want)
		}
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
