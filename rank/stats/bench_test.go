package stats

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

// BenchmarkSummarize: one 10,000-sample buffer of a log-normal metric.
func BenchmarkSummarize(b *testing.B) {
	r := rand.New(rand.NewPCG(1, 1))
	src := make([]float64, 10000)
	for i := range src {
		src[i] = math.Exp(3 * r.NormFloat64())
	}
	x := make([]float64, len(src))
	var z Summarizer
	for b.Loop() {
		copy(x, src)
		z.Summarize(x, true)
	}
}

func BenchmarkSortBaseline(b *testing.B) {
	r := rand.New(rand.NewPCG(1, 1))
	src := make([]float64, 10000)
	for i := range src {
		src[i] = math.Exp(3 * r.NormFloat64())
	}
	x := make([]float64, len(src))
	for b.Loop() {
		copy(x, src)
		slices.Sort(x)
	}
}

func BenchmarkSelectMedian(b *testing.B) {
	r := rand.New(rand.NewPCG(1, 1))
	src := make([]float64, 10000)
	for i := range src {
		src[i] = math.Exp(3 * r.NormFloat64())
	}
	x := make([]float64, len(src))
	for b.Loop() {
		copy(x, src)
		Select(x, 0, len(x)-1, 5000)
	}
}
