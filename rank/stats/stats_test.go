package stats

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

func TestQuantileType7(t *testing.T) {
	// Hyndman & Fan 1996 type 7 equals R's quantile(type = 7) and NumPy's
	// default: for 1…10, the 0.05 quantile is 1 + 0.45 = 1.45, the median 5.5,
	// the 0.95 quantile 9.55 (h = 9·p).
	x := []float64{1, 2, 3, 4, 5, 6, 7, 8, 9, 10}
	for _, c := range []struct{ p, want float64 }{{0, 1}, {0.05, 1.45}, {0.5, 5.5}, {0.95, 9.55}, {1, 10}} {
		if got := Quantile(x, c.p); math.Abs(got-c.want) > 1e-12 {
			t.Errorf("Q(%g) = %g, want %g", c.p, got, c.want)
		}
	}
	if !math.IsNaN(Quantile(nil, 0.5)) {
		t.Error("empty: want NaN")
	}
}

func TestSummarizeMatchesSort(t *testing.T) {
	r := rand.New(rand.NewPCG(1, 1))
	for _, n := range []int{1, 2, 3, 7, 100, 601, 602, 5000, 10007} {
		for _, kind := range []string{"normal", "ties", "constant", "heavy", "zeros"} {
			x := make([]float64, n)
			for i := range x {
				switch kind {
				case "normal":
					x[i] = r.NormFloat64()
				case "ties":
					x[i] = float64(r.IntN(4))
				case "constant":
					x[i] = 2.5
				case "heavy": // log-normal with σ = 20: values over ~50 decades, both signs
					x[i] = math.Exp(20*r.NormFloat64()) * float64(1-2*r.IntN(2))
				case "zeros": // an atom at ±0 and a continuous part
					x[i] = 0
					if r.IntN(3) == 0 {
						x[i] = math.Copysign(0, -1)
					} else if r.IntN(2) == 0 {
						x[i] = r.ExpFloat64()
					}
				}
			}
			sorted := slices.Clone(x)
			slices.Sort(sorted)
			s := Summarize(x)
			for _, c := range []struct{ got, p float64 }{{s.P05, 0.05}, {s.P50, 0.5}, {s.P95, 0.95}} {
				if want := Quantile(sorted, c.p); math.Abs(c.got-want) > 1e-12 {
					t.Errorf("n=%d %s: Q(%g) = %g, want %g", n, kind, c.p, c.got, want)
				}
			}
			if kind == "constant" && s.MedianSE != 0 {
				t.Errorf("constant: median SE %g", s.MedianSE)
			}
		}
	}
}

func TestSummarizeNaN(t *testing.T) {
	s := Summarize([]float64{math.NaN(), 1, 2, math.NaN(), 3})
	if s.N != 3 || s.P50 != 2 {
		t.Errorf("%+v", s)
	}
	if s := Summarize([]float64{math.NaN()}); s.N != 0 || !math.IsNaN(s.P50) {
		t.Errorf("all NaN: %+v", s)
	}
}

// TestMedianSE: for N(0,1) the asymptotic standard error of the median is
// 1/(2φ(0)√n) = √(π/2)/√n (e.g. Stuart & Ord, Kendall's Advanced Theory of
// Statistics vol. 1, §10.10), and the estimate shrinks as 1/√n.
func TestMedianSE(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 4))
	for _, n := range []int{1000, 16000} {
		var mean float64
		const reps = 40
		for range reps {
			x := make([]float64, n)
			for i := range x {
				x[i] = r.NormFloat64()
			}
			mean += Summarize(x).MedianSE / reps
		}
		want := math.Sqrt(math.Pi/2) / math.Sqrt(float64(n))
		if math.Abs(mean-want) > 0.05*want {
			t.Errorf("n=%d: mean SE %g, want %g ± 5%%", n, mean, want)
		}
	}
}

func TestBinomialSE(t *testing.T) {
	if got := BinomialSE(0.5, 10000); math.Abs(got-0.005) > 1e-15 {
		t.Errorf("%g", got)
	}
	if BinomialSE(0, 100) != 0 || BinomialSE(1, 100) != 0 {
		t.Error("at 0 and 1 the binomial SE is 0")
	}
}

func TestRanker(t *testing.T) {
	r := rand.New(rand.NewPCG(5, 6))
	var rk Ranker
	for _, n := range []int{1, 2, 5, 1000, 4099} {
		scores := make([]float32, n)
		for i := range scores {
			switch r.IntN(4) {
			case 0:
				scores[i] = 0 // many ties
			case 1:
				scores[i] = -r.Float32()
			default:
				scores[i] = r.Float32()
			}
		}
		ranks := make([]float32, n)
		rk.Ranks(scores, ranks)
		// Reference: sort indices by (score desc, index asc).
		idx := make([]int, n)
		for i := range idx {
			idx[i] = i
		}
		slices.SortStableFunc(idx, func(a, b int) int {
			switch {
			case scores[a] > scores[b]:
				return -1
			case scores[a] < scores[b]:
				return 1
			}
			return 0
		})
		for pos, i := range idx {
			if ranks[i] != float32(pos+1) {
				t.Fatalf("n=%d: rank of %d (score %g) = %g, want %d", n, i, scores[i], ranks[i], pos+1)
			}
		}
	}
}

func TestRankStats(t *testing.T) {
	ranks := []float32{1, 2, 2, 3, 5, 1, 1, 4, 2, 2}
	counts := make([]int32, 7)
	p05, p50, p95, top := RankStats(ranks, 6, 2, counts)
	sorted := []float64{1, 1, 1, 2, 2, 2, 2, 3, 4, 5}
	if p05 != Quantile(sorted, 0.05) || p50 != Quantile(sorted, 0.5) || p95 != Quantile(sorted, 0.95) || top != 7 {
		t.Errorf("got %g %g %g %d", p05, p50, p95, top)
	}
	for _, c := range counts {
		if c != 0 {
			t.Fatal("counts not cleared")
		}
	}
}

func TestSummarizeSE(t *testing.T) {
	// Against the definition on a sorted copy.
	r := rand.New(rand.NewPCG(8, 8))
	for _, n := range []int{64, 65, 1000, 10000} {
		x := make([]float64, n)
		for i := range x {
			x[i] = r.ExpFloat64()
		}
		sorted := slices.Clone(x)
		slices.Sort(sorted)
		c := int(math.Round(float64(n+1)/2 - MedianSEZ*math.Sqrt(float64(n)/4)))
		want := (sorted[n-c] - sorted[c-1]) / (2 * MedianSEZ)
		if got := Summarize(x).MedianSE; math.Abs(got-want) > 1e-15 {
			t.Errorf("n=%d: SE %g, want %g", n, got, want)
		}
		q := Quantiles3(slices.Clone(sorted))
		if q.MedianSE != 0 || q.P50 != Quantile(sorted, 0.5) {
			t.Errorf("Quantiles3: %+v", q)
		}
	}
}

func TestRanksTies(t *testing.T) {
	r := rand.New(rand.NewPCG(5, 7))
	var rk Ranker
	for _, n := range []int{1, 3, 70, 1000, 3001} {
		scores := make([]float32, n)
		tie := make([]uint32, n)
		for i := range scores {
			scores[i] = float32(r.IntN(5)) / 4 // many ties, in runs short and long
			if n == 70 {
				scores[i] = float32(r.IntN(30)) // runs of about 2
			}
			tie[i] = r.Uint32()
			if i%10 == 0 {
				tie[i] = 7 // some equal tie values too: index order
			}
		}
		ranks := make([]float32, n)
		rk.RanksTies(scores, func(i int) uint32 { return tie[i] }, ranks)
		idx := make([]int, n)
		for i := range idx {
			idx[i] = i
		}
		slices.SortStableFunc(idx, func(a, b int) int {
			switch {
			case scores[a] > scores[b]:
				return -1
			case scores[a] < scores[b]:
				return 1
			case tie[a] < tie[b]:
				return -1
			case tie[a] > tie[b]:
				return 1
			}
			return 0
		})
		for pos, i := range idx {
			if ranks[i] != float32(pos+1) {
				t.Fatalf("n=%d: rank of %d = %g, want %d", n, i, ranks[i], pos+1)
			}
		}
	}
}
