// Package stats holds the order statistics the ranking needs: sample
// quantiles (Hyndman & Fan 1996 type 7, the default of R and NumPy), a
// selection algorithm that finds a few of them without sorting, the Monte
// Carlo standard errors of a median and of a proportion, and a stable radix
// ranking of float32 scores.
//
//	x := []float64{3, 1, 4, 1, 5, 9, 2, 6}
//	s := stats.Summarize(x)     // reorders x; s.P50 = 3.5, s.P05 = 1, s.P95 ≈ 7.95
//
// Type 7: for sorted x₁…xₙ and probability p, h = (n−1)p; the quantile is
// x_{⌊h⌋+1} + (h − ⌊h⌋)(x_{⌊h⌋+2} − x_{⌊h⌋+1}) (Hyndman & Fan 1996, Am.
// Stat. 50, 361, definition 7).
package stats
