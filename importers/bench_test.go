package importers

import (
	"bytes"
	stdcsv "encoding/csv"
	"flag"
	"fmt"
	"io"
	"math/rand/v2"
	"os"
	"path/filepath"
	"runtime"
	"testing"
	"time"

	"tidesift/schema"
)

// genCanonical writes an invented canonical CSV of n moons over n/8 planets,
// with a spread of units and uncertainty forms. Deterministic (PCG seed 1).
func genCanonical(n int) []byte {
	rng := rand.New(rand.NewPCG(1, 1))
	var b bytes.Buffer
	b.WriteString("name,planet,star,mass [earthMass],mass_err,radius [km],radius_err_plus,radius_err_minus," +
		"semi_major_axis [km],eccentricity,eccentricity_err,obliquity [deg],period [d],k2_q,k2_q_factor," +
		"bond_albedo,bond_albedo_min,bond_albedo_max,density [g/cm3],planet_mass [jupiterMass],star_distance [AU],source\n")
	for i := range n {
		p := i / 8
		// Planet values depend only on the planet, so rows agree.
		pr := rand.New(rand.NewPCG(uint64(p), 2))
		alb := 0.1 + 0.8*rng.Float64()
		fmt.Fprintf(&b, "Moon-%d,Planet-%d,Star-%d,%.5g,%.3g,%.6g,%.3g,%.3g,%.7g,%.4f,%.2g,%.3g,%.6g,%.3g,3,%.3f,%.3f,%.3f,%.4g,%.4g,%.4g,Invented generator\n",
			i, p, p/4,
			0.001+0.02*rng.Float64(), 0.0001*rng.Float64(),
			200+2500*rng.Float64(), 10*rng.Float64(), 10*rng.Float64(),
			1e5+2e6*rng.Float64(), 0.2*rng.Float64(), 0.001*rng.Float64(), 5*rng.Float64(),
			1+20*rng.Float64(), 0.001+0.05*rng.Float64(),
			alb, alb-0.05, alb+0.05, 1+2.5*rng.Float64(),
			0.1+3*pr.Float64(), 1+10*pr.Float64())
	}
	return b.Bytes()
}

// BenchmarkReadCSV parses, converts and validates a 100k-row invented
// canonical CSV (Read, records kept) and reports ns per row.
// Goal (issue 5): at least 300k rows/s, i.e. at most ~3300 ns/row.
func BenchmarkReadCSV(b *testing.B) {
	const n = 100_000
	data := genCanonical(n)
	b.SetBytes(int64(len(data)))
	b.ReportAllocs()
	b.ResetTimer()
	for b.Loop() {
		res, err := Read("bench.csv", bytes.NewReader(data), Options{})
		if err != nil {
			b.Fatal(err)
		}
		if len(res.Records) != n {
			b.Fatalf("%d records", len(res.Records))
		}
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/n, "ns/row")
}

// BenchmarkReadStreamCSV is the same file through ReadStream, records
// discarded: the importer's own cost without holding the records.
func BenchmarkReadStreamCSV(b *testing.B) {
	const n = 100_000
	data := genCanonical(n)
	b.SetBytes(int64(len(data)))
	b.ReportAllocs()
	b.ResetTimer()
	for b.Loop() {
		rows := 0
		if _, err := ReadStream("bench.csv", bytes.NewReader(data), Options{}, func(*schema.Record) error { rows++; return nil }); err != nil {
			b.Fatal(err)
		}
		if rows != n {
			b.Fatalf("%d rows", rows)
		}
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/n, "ns/row")
}

func TestGeneratedFileImports(t *testing.T) {
	res, err := Read("gen.csv", bytes.NewReader(genCanonical(2000)), Options{})
	if err != nil {
		t.Fatal(err)
	}
	if len(res.Records) != 2000 || len(res.Records[0].Params) != 11 {
		t.Errorf("%d records, %d params", len(res.Records), len(res.Records[0].Params))
	}
}

// BenchmarkBaselineEncodingCSV reads the same file with encoding/csv alone
// (ReuseRecord), the floor under BenchmarkReadCSV: on a shared machine the
// ratio of the two is steadier than either figure.
func BenchmarkBaselineEncodingCSV(b *testing.B) {
	const n = 100_000
	data := genCanonical(n)
	b.SetBytes(int64(len(data)))
	b.ReportAllocs()
	b.ResetTimer()
	for b.Loop() {
		r := stdcsv.NewReader(bytes.NewReader(data))
		r.ReuseRecord = true
		rows := 0
		for {
			_, err := r.Read()
			if err == io.EOF {
				break
			}
			if err != nil {
				b.Fatal(err)
			}
			rows++
		}
		if rows != n+1 {
			b.Fatalf("%d rows", rows)
		}
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/n, "ns/row")
}

var streamRows = flag.Int("stream-rows", 0, "rows for TestStreamMemory (0 skips it), e.g. 1000000")

// TestStreamMemory reports the importer's live heap while ReadStream reads a
// generated invented file of -stream-rows rows from disk, records discarded:
// the state that grows with the file (duplicate check, per-planet values).
//
//	go test ./importers -run TestStreamMemory -stream-rows 1000000 -v
func TestStreamMemory(t *testing.T) {
	n := *streamRows
	if n == 0 {
		t.Skip("set -stream-rows to run")
	}
	path := filepath.Join(t.TempDir(), "gen.csv")
	if err := os.WriteFile(path, genCanonical(n), 0o644); err != nil {
		t.Fatal(err)
	}
	runtime.GC()
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows := 0
	start := time.Now()
	_, err = ReadStream("gen.csv", f, Options{}, func(*schema.Record) error {
		rows++
		if rows%(n/4) == 0 {
			var m runtime.MemStats
			runtime.GC()
			runtime.ReadMemStats(&m)
			t.Logf("after %d rows: live heap %d MiB (%.0f B/row)", rows, m.HeapAlloc>>20, float64(m.HeapAlloc)/float64(rows))
		}
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	t.Logf("%d rows in %v (including %d forced GCs)", rows, time.Since(start), 4)
}
