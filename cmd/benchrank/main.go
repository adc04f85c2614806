// Command benchrank times the ranking engine on invented synthetic catalogs,
// and writes such catalogs in the canonical CSV layout for end-to-end timings
// through `tidesift import` and `tidesift rank`.
//
//	go run ./cmd/benchrank -n 1000,2000,5000,10000 -samples 10000
//	go run ./cmd/benchrank -n 10000 -csv bench/out/targets-10000.csv   # write only
//	go run ./cmd/benchrank -n 10000 -cpuprofile cpu.prof               # then go tool pprof
//
// For each N it builds the catalog in memory (package rank/synth; every
// value is made up), runs rank.Run under the chosen built-in profile and
// prints the wall time, the CPU time (user + system), the cost per target ×
// sample, and the process's peak resident memory so far (VmHWM, Linux). Run
// one N per process (-n 10000) for a clean peak-memory figure.
//
// default.pgo beside this file is a CPU profile of `benchrank -n 2000`; go
// build uses it for profile-guided optimisation (inlining of the hot calls in
// the sample loop; results are unchanged). Refresh it after large changes to
// the engine with
//
//	go run ./cmd/benchrank -n 2000 -cpuprofile cmd/benchrank/default.pgo
package main

import (
	"context"
	"flag"
	"fmt"
	"os"
	"runtime"
	"runtime/pprof"
	"strconv"
	"strings"
	"syscall"
	"time"

	"tidesift/rank"
	"tidesift/rank/profile"
	"tidesift/rank/synth"
)

func main() {
	sizes := flag.String("n", "1000", "comma-separated target counts")
	samples := flag.Int("samples", rank.DefaultSamples, "Monte Carlo samples per target")
	seed := flag.Uint64("seed", 1, "seed of the catalog and of the sampling")
	workers := flag.Int("workers", 0, "goroutines (0: GOMAXPROCS)")
	prof := flag.String("profile", "ocean", "built-in profile")
	csvOut := flag.String("csv", "", "write the catalog of the (single) -n to this CSV file and exit")
	cpuProf := flag.String("cpuprofile", "", "write a CPU profile of the runs to this file")
	flag.Parse()
	if err := run(*sizes, *samples, *seed, *workers, *prof, *csvOut, *cpuProf); err != nil {
		fmt.Fprintln(os.Stderr, "benchrank:", err)
		os.Exit(1)
	}
}

func run(sizes string, samples int, seed uint64, workers int, profName, csvOut, cpuProf string) error {
	var ns []int
	for _, s := range strings.Split(sizes, ",") {
		n, err := strconv.Atoi(strings.TrimSpace(s))
		if err != nil || n < 1 {
			return fmt.Errorf("-n: %q is not a positive whole number", s)
		}
		ns = append(ns, n)
	}
	if csvOut != "" {
		if len(ns) != 1 {
			return fmt.Errorf("-csv writes one catalog: give a single -n")
		}
		f, err := os.Create(csvOut)
		if err != nil {
			return err
		}
		if err := synth.WriteCSV(f, synth.Catalog(ns[0], seed)); err != nil {
			f.Close()
			return err
		}
		return f.Close()
	}
	p, err := profile.Builtin(profName)
	if err != nil {
		return err
	}
	if cpuProf != "" {
		f, err := os.Create(cpuProf)
		if err != nil {
			return err
		}
		defer f.Close()
		if err := pprof.StartCPUProfile(f); err != nil {
			return err
		}
		defer pprof.StopCPUProfile()
	}
	fmt.Printf("# benchrank: profile %s, %d samples, GOMAXPROCS %d, %s/%s; invented synthetic catalogs\n",
		profName, samples, runtime.GOMAXPROCS(0), runtime.GOOS, runtime.GOARCH)
	fmt.Printf("%8s %8s %9s %9s %12s %10s\n", "targets", "samples", "wall_s", "cpu_s", "ns/cell_cpu", "peak_MiB")
	for _, n := range ns {
		cat := synth.Catalog(n, seed)
		runtime.GC()
		c0 := cpuTime()
		t0 := time.Now()
		res, err := rank.Run(context.Background(), cat, p, rank.Options{Samples: samples, Seed: seed, Workers: workers})
		if err != nil {
			return err
		}
		wall := time.Since(t0).Seconds()
		cpu := cpuTime() - c0
		fmt.Printf("%8d %8d %9.2f %9.2f %12.0f %10.0f\n", len(res.Targets), samples, wall, cpu,
			cpu*1e9/float64(len(res.Targets))/float64(samples), peakMiB())
		runtime.KeepAlive(res)
	}
	return nil
}

// cpuTime is the process's user + system CPU time in seconds.
func cpuTime() float64 {
	var ru syscall.Rusage
	if err := syscall.Getrusage(syscall.RUSAGE_SELF, &ru); err != nil {
		return 0
	}
	return float64(ru.Utime.Sec+ru.Stime.Sec) + float64(ru.Utime.Usec+ru.Stime.Usec)/1e6
}

// peakMiB is the peak resident set size (VmHWM from /proc/self/status), or
// the Go runtime's view of memory obtained from the OS when /proc is absent.
func peakMiB() float64 {
	if b, err := os.ReadFile("/proc/self/status"); err == nil {
		for _, line := range strings.Split(string(b), "\n") {
			if f := strings.Fields(line); len(f) >= 2 && f[0] == "VmHWM:" {
				if kb, err := strconv.ParseFloat(f[1], 64); err == nil {
					return kb / 1024
				}
			}
		}
	}
	var ms runtime.MemStats
	runtime.ReadMemStats(&ms)
	return float64(ms.Sys) / (1 << 20)
}
