// Package synth builds invented synthetic catalogs for benchmarks and tests
// of the ranking: N moons with random, made-up but physically plausible
// values and a mix of uncertainty forms and gaps. No value describes a real
// body. The same (n, seed) always gives the same catalog.
//
//	cat := synth.Catalog(10000, 1)
//	res, err := rank.Run(ctx, cat, prof, rank.Options{})
//
// WriteCSV writes the same catalog in the canonical table layout, for
// end-to-end timings through `tidesift import`.
package synth

import (
	"bufio"
	"fmt"
	"io"
	"math"
	"math/rand/v2"
	"strconv"

	"tidesift/schema"
)

// Source is the source text of every synthetic value.
const Source = "invented synthetic benchmark value (not a real body)"

// Unit conversions for WriteCSV, from the IAU 2015 Resolution B3 nominal
// values and the IAU 2012 au.
const (
	au         = 1.495978707e11 // m (IAU 2012 Resolution B2)
	solLum     = 3.828e26       // W (IAU 2015 B3 nominal L☉)
	gmJupiter  = 1.2668653e17   // m³/s² (IAU 2015 B3 nominal GM_J)
	bigG       = 6.67430e-11    // CODATA 2018
	day        = 86400.0
	moonsEach  = 10 // moons per planet
	planetsPer = 4  // planets per star
)

func param(key string, v float64, u schema.Uncertainty) schema.Param {
	return schema.Param{Key: key, Value: v, Unc: u, Source: Source, Status: schema.StatusMeasured, Revision: 1}
}

func sym(s float64) schema.Uncertainty {
	return schema.Uncertainty{Kind: schema.UncSymmetric, Sigma: s}
}

// Catalog returns an invented catalog of n moons: ten to a planet, four
// planets to a star. About a third of the moons lack k2/Q (a profile prior
// fills it), a fifth give a moment of inertia, half lack a period (Kepler's
// third law), and the uncertainty forms vary.
func Catalog(n int, seed uint64) *schema.Catalog {
	r := rand.New(rand.NewPCG(seed, 0x5eed))
	cat := &schema.Catalog{Revision: schema.Revision{ID: 1, File: "synthetic", Note: "invented synthetic catalog"},
		ContentHash: fmt.Sprintf("synthetic-%d-%d", n, seed)}
	nPlanets := (n + moonsEach - 1) / moonsEach
	nStars := (nPlanets + planetsPer - 1) / planetsPer
	for s := range nStars {
		lum := solLum * math.Pow(10, -1+1.5*r.Float64())
		cat.Stars = append(cat.Stars, schema.Body{Kind: schema.KindStar, Name: fmt.Sprintf("Synth-%05d", s),
			Params: map[string]schema.Param{"star_luminosity": param("star_luminosity", lum, sym(0.03*lum))}})
	}
	for p := range nPlanets {
		mp := 1.898e27 * math.Pow(10, -1.5+2*r.Float64())
		d := au * math.Pow(10, 0.3+r.Float64()) // 2–20 AU: mostly icy moons
		cat.Planets = append(cat.Planets, schema.Body{Kind: schema.KindPlanet, Name: fmt.Sprintf("Synth-%05d %c", p/planetsPer, 'b'+p%planetsPer),
			Parent: cat.Stars[p/planetsPer].Name, Params: map[string]schema.Param{
				"planet_mass":   param("planet_mass", mp, sym(0.01*mp)),
				"planet_radius": param("planet_radius", 7e7*math.Pow(mp/1.898e27, 0.1), schema.Uncertainty{}),
				"star_distance": param("star_distance", d, sym(0.01*d)),
			}})
	}
	for i := range n {
		pl := &cat.Planets[i/moonsEach]
		mp := pl.Params["planet_mass"].Value
		rho := 1200 + 2500*r.Float64()
		mass := math.Pow(10, 19+4*r.Float64())
		radius := math.Cbrt(3 * mass / (4 * math.Pi * rho))
		a := 7e7 * (3 + 40*r.Float64())
		e := math.Pow(10, -3.5+2.5*r.Float64())
		ps := map[string]schema.Param{
			"mass":            param("mass", mass, sym(mass*0.01*(1+4*r.Float64()))),
			"radius":          param("radius", radius, sym(radius*0.005)),
			"semi_major_axis": param("semi_major_axis", a, sym(a*1e-4)),
		}
		switch r.IntN(3) {
		case 0:
			ps["eccentricity"] = param("eccentricity", e, sym(e*0.2))
		case 1:
			ps["eccentricity"] = param("eccentricity", e, schema.Uncertainty{Kind: schema.UncAsymmetric, Plus: e * 0.5, Minus: e * 0.2})
		default:
			ps["eccentricity"] = param("eccentricity", e, schema.Uncertainty{Kind: schema.UncRange, Min: e * 0.5, Max: e * 1.5})
		}
		if r.IntN(2) == 0 {
			period := 2 * math.Pi * math.Sqrt(a*a*a/(bigG*(mp+mass)))
			ps["period"] = param("period", period, sym(period*1e-6))
		}
		if r.IntN(3) != 0 {
			kq := math.Pow(10, -4+3*r.Float64())
			ps["k2_q"] = param("k2_q", kq, schema.Uncertainty{Kind: schema.UncFactor, Factor: 2 + 2*r.Float64()})
		}
		alb := 0.1 + 0.7*r.Float64()
		ps["bond_albedo"] = param("bond_albedo", alb, sym(0.05))
		if r.IntN(5) == 0 {
			ps["moment_of_inertia"] = param("moment_of_inertia", 0.3+0.08*r.Float64(), sym(0.005))
		}
		cat.Moons = append(cat.Moons, schema.Body{Kind: schema.KindMoon, Name: fmt.Sprintf("Synth moon %06d", i),
			Parent: pl.Name, Params: ps})
	}
	return cat
}

// csvColumns are the keys WriteCSV writes, with their unit and SI scale.
var csvColumns = []struct {
	key, unit string
	scale     float64 // SI value / scale = value in unit
}{
	{"mass", "kg", 1},
	{"radius", "km", 1e3},
	{"semi_major_axis", "km", 1e3},
	{"eccentricity", "", 1},
	{"period", "d", day},
	{"k2_q", "", 1},
	{"bond_albedo", "", 1},
	{"moment_of_inertia", "", 1},
	{"planet_mass", "kg", 1},
	{"planet_radius", "km", 1e3},
	{"star_distance", "AU", au},
	{"star_luminosity", "solLum", solLum},
}

// WriteCSV writes cat in the canonical table layout: one row per moon, a
// `key [unit]` column per key and its uncertainty companions (`key_err`,
// `key_err_plus`/`key_err_minus`, `key_min`/`key_max`, `key_factor`).
func WriteCSV(w io.Writer, cat *schema.Catalog) error {
	bw := bufio.NewWriter(w)
	bw.WriteString("name,planet,star,source")
	for _, c := range csvColumns {
		h := c.key
		if c.unit != "" {
			h += " [" + c.unit + "]"
		}
		fmt.Fprintf(bw, ",%s,%s_err,%s_err_plus,%s_err_minus,%s_min,%s_max,%s_factor", h, c.key, c.key, c.key, c.key, c.key, c.key)
	}
	bw.WriteString("\n")
	f := func(x float64) string { return strconv.FormatFloat(x, 'g', 10, 64) }
	planets := map[string]*schema.Body{}
	for i := range cat.Planets {
		planets[cat.Planets[i].Name] = &cat.Planets[i]
	}
	stars := map[string]*schema.Body{}
	for i := range cat.Stars {
		stars[cat.Stars[i].Name] = &cat.Stars[i]
	}
	for i := range cat.Moons {
		m := &cat.Moons[i]
		pl := planets[m.Parent]
		in := map[string]schema.Param{}
		for _, b := range []*schema.Body{stars[pl.Parent], pl, m} {
			for k, v := range b.Params {
				in[k] = v
			}
		}
		fmt.Fprintf(bw, "%s,%s,%s,%q", m.Name, m.Parent, pl.Parent, Source)
		for _, c := range csvColumns {
			p, ok := in[c.key]
			if !ok {
				bw.WriteString(",,,,,,,")
				continue
			}
			cells := [7]string{f(p.Value / c.scale)}
			switch p.Unc.Kind {
			case schema.UncSymmetric:
				cells[1] = f(p.Unc.Sigma / c.scale)
			case schema.UncAsymmetric:
				cells[2], cells[3] = f(p.Unc.Plus/c.scale), f(p.Unc.Minus/c.scale)
			case schema.UncRange:
				cells[4], cells[5] = f(p.Unc.Min/c.scale), f(p.Unc.Max/c.scale)
			case schema.UncFactor:
				cells[6] = f(p.Unc.Factor)
			}
			for _, s := range cells {
				bw.WriteString("," + s)
			}
		}
		bw.WriteString("\n")
	}
	return bw.Flush()
}
