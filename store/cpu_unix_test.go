//go:build unix

package store

import "syscall"

// cpuSeconds is the process's user+system CPU time. Benchmarks report
// values per CPU-second beside values per second because the build machines
// are shared and wall time varies with their load.
func cpuSeconds() float64 {
	var ru syscall.Rusage
	if err := syscall.Getrusage(syscall.RUSAGE_SELF, &ru); err != nil {
		return 0
	}
	return float64(ru.Utime.Sec+ru.Stime.Sec) + float64(ru.Utime.Usec+ru.Stime.Usec)/1e6
}
