// Command gencsv writes an invented synthetic catalog of N moons in tidesift's
// canonical CSV layout, for benchmarks. Every value is random and made up; the
// source column says so. The output is deterministic for a given -seed.
//
//	go run ./bench/gencsv -n 1000000 -o bench/out/moons-1m.csv
//
// Moons are grouped ten to a planet and each planet has its own star, so the
// planet and star columns repeat (and agree) as the canonical layout asks.
package main

import (
	"bufio"
	"flag"
	"fmt"
	"io"
	"math"
	"math/rand/v2"
	"os"
	"strconv"
)

func main() {
	n := flag.Int("n", 1000, "number of moons")
	perPlanet := flag.Int("per-planet", 10, "moons per planet")
	seed := flag.Uint64("seed", 1, "random seed")
	out := flag.String("o", "", "output file (default: standard output)")
	flag.Parse()
	if *n < 1 || *perPlanet < 1 {
		fmt.Fprintln(os.Stderr, "gencsv: -n and -per-planet must be at least 1")
		os.Exit(2)
	}
	w := io.Writer(os.Stdout)
	if *out != "" {
		f, err := os.Create(*out)
		if err != nil {
			fmt.Fprintln(os.Stderr, "gencsv:", err)
			os.Exit(1)
		}
		defer f.Close()
		w = f
	}
	if err := generate(w, *n, *perPlanet, *seed); err != nil {
		fmt.Fprintln(os.Stderr, "gencsv:", err)
		os.Exit(1)
	}
}

const header = "name,planet,star,source," +
	"mass [kg],mass_err,radius [km],radius_err,semi_major_axis [km],semi_major_axis_err," +
	"eccentricity,eccentricity_err,period [d],k2_q,k2_q_factor,bond_albedo,bond_albedo_err," +
	"planet_mass [jupiterMass],planet_mass_err,planet_radius [jupiterRad],star_distance [AU],star_distance_err," +
	"star_luminosity [solLum],star_luminosity_err,star_mass [solMass]\n"

// G (CODATA 2018) and the nominal Jovian GM (IAU 2015 Resolution B3), so the
// invented periods follow Kepler's third law.
const (
	G         = 6.67430e-11
	gmJupiter = 1.2668653e17
)

func generate(w io.Writer, n, perPlanet int, seed uint64) error {
	bw := bufio.NewWriterSize(w, 1<<20)
	rng := rand.New(rand.NewPCG(seed, 0x7469646573696674))
	if _, err := bw.WriteString(header); err != nil {
		return err
	}
	var (
		planet                   string
		pm, pr, dist, lum, smass float64
		buf                      []byte
	)
	f := func(v float64, sig int) { buf = strconv.AppendFloat(buf, v, 'g', sig, 64); buf = append(buf, ',') }
	for i := 0; i < n; i++ {
		if i%perPlanet == 0 {
			p := i / perPlanet
			planet = fmt.Sprintf("Synth-P%06d", p)
			pm = 0.1 + rng.Float64()*5      // jupiterMass
			pr = 0.8 + rng.Float64()*0.5    // jupiterRad
			dist = 0.5 + rng.Float64()*10   // AU
			lum = 0.1 + rng.Float64()*2     // solLum
			smass = 0.5 + rng.Float64()*0.8 // solMass
		}
		radius := 100 + rng.Float64()*2900   // km
		density := 1000 + rng.Float64()*2800 // kg/m³
		mass := density * 4 / 3 * math.Pi * math.Pow(radius*1e3, 3)
		a := 2e5 + rng.Float64()*5e6 // km
		e := rng.Float64() * 0.05
		period := 2 * math.Pi * math.Sqrt(math.Pow(a*1e3, 3)/(pm*gmJupiter+G*mass)) / 86400
		buf = buf[:0]
		buf = fmt.Appendf(buf, "Synth-%07d,%s,Synth-S%06d,invented synthetic benchmark value,", i, planet, i/perPlanet)
		f(mass, 4)
		f(mass*0.02, 2)
		f(radius, 5)
		f(radius*0.01, 2)
		f(a, 6)
		f(a*1e-4, 2)
		f(e, 3)
		f(0.1*e+1e-4, 2)
		f(period, 6)
		f(math.Pow(10, -4+rng.Float64()*3), 3)
		f(2+rng.Float64()*8, 2)
		f(0.05+rng.Float64()*0.9, 2)
		f(0.05, 1)
		f(pm, 4)
		f(pm*0.05, 2)
		f(pr, 4)
		f(dist, 4)
		f(dist*0.01, 2)
		f(lum, 4)
		f(lum*0.05, 2)
		buf = strconv.AppendFloat(buf, smass, 'g', 4, 64)
		buf = append(buf, '\n')
		if _, err := bw.Write(buf); err != nil {
			return err
		}
	}
	return bw.Flush()
}
