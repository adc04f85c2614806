//go:build !unix

package store

// cpuSeconds is unavailable here; benchmarks then omit the per-CPU figure.
func cpuSeconds() float64 { return 0 }
