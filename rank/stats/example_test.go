package stats_test

import (
	"fmt"

	"tidesift/rank/stats"
)

func ExampleSummarize() {
	x := []float64{3, 1, 4, 1, 5, 9, 2, 6}
	s := stats.Summarize(x)
	// Type 7: h = 7p; the median interpolates between 3 and 4.
	fmt.Printf("p05 %.2f  p50 %.2f  p95 %.2f\n", s.P05, s.P50, s.P95)
	// Output: p05 1.00  p50 3.50  p95 7.95
}
