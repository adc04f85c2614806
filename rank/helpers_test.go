package rank

import (
	"math"
	"testing"

	"tidesift/rank/profile"
	"tidesift/schema"
)

const (
	auM    = 1.495978707e11 // m, IAU 2012 Resolution B2
	lsunW  = 3.828e26       // W, IAU 2015 Resolution B3 nominal solar luminosity
	dayS   = 86400.0
	kmM    = 1e3
	invSrc = "invented test value"
)

func p(key string, v float64, u schema.Uncertainty) schema.Param {
	return schema.Param{Key: key, Value: v, Unc: u, Source: invSrc, Status: schema.StatusMeasured, Revision: 1}
}

func fixed(key string, v float64) schema.Param { return p(key, v, schema.Uncertainty{}) }

func sig(key string, v, s float64) schema.Param {
	return p(key, v, schema.Uncertainty{Kind: schema.UncSymmetric, Sigma: s})
}

func body(kind schema.Kind, name, parent string, ps ...schema.Param) schema.Body {
	m := map[string]schema.Param{}
	for _, x := range ps {
		m[x.Key] = x
	}
	return schema.Body{Kind: kind, Name: name, Parent: parent, Params: m}
}

// testCatalog is an invented system: the star Aurel, its giant Aurel b, and
// moons that exercise every uncertainty form and every way of filling an
// input. No value describes a real body.
func testCatalog() *schema.Catalog {
	return &schema.Catalog{
		Revision:    schema.Revision{ID: 7, File: "invented.csv"},
		ContentHash: "test-hash",
		Stars:       []schema.Body{body(schema.KindStar, "Aurel", "", sig("star_luminosity", lsunW, 0.01*lsunW))},
		Planets: []schema.Body{body(schema.KindPlanet, "Aurel b", "Aurel",
			sig("planet_mass", 1.9e27, 1e25), sig("star_distance", 5.2*auM, 0.01*auM))},
		Moons: []schema.Body{
			body(schema.KindMoon, "Brisk", "Aurel b",
				sig("mass", 4.8e22, 0.05e22), sig("radius", 1560*kmM, 5*kmM), sig("semi_major_axis", 671000*kmM, 100*kmM),
				sig("eccentricity", 0.009, 0.002), fixed("obliquity", 0.001), sig("period", 3.55*dayS, 0.001*dayS),
				p("k2_q", 0.01, schema.Uncertainty{Kind: schema.UncFactor, Factor: 2}), sig("bond_albedo", 0.6, 0.05)),
			body(schema.KindMoon, "Cinder", "Aurel b",
				sig("mass", 9e22, 0.1e22), sig("radius", 1820*kmM, 3*kmM), sig("semi_major_axis", 422000*kmM, 50*kmM),
				p("eccentricity", 0.004, schema.Uncertainty{Kind: schema.UncAsymmetric, Plus: 0.002, Minus: 0.001}),
				fixed("obliquity", 0), sig("k2_q", 0.02, 0.005),
				p("bond_albedo", 0.5, schema.Uncertainty{Kind: schema.UncRange, Min: 0.4, Max: 0.7})),
			// Drift: no k2/Q, obliquity or albedo: the profile's priors fill them.
			body(schema.KindMoon, "Drift", "Aurel b",
				sig("mass", 1.5e23, 0.02e23), sig("radius", 2630*kmM, 10*kmM), sig("semi_major_axis", 1070000*kmM, 500*kmM),
				sig("eccentricity", 0.0015, 0.0005), sig("moment_of_inertia", 0.311, 0.003)),
			// Ember: radius and density but no mass; k2 and Q instead of k2/Q.
			body(schema.KindMoon, "Ember", "Aurel b",
				sig("density", 1800, 100), sig("radius", 700*kmM, 5*kmM), sig("semi_major_axis", 300000*kmM, 100*kmM),
				sig("eccentricity", 0.02, 0.005), fixed("obliquity", 0.05), sig("k2", 0.05, 0.01),
				p("q", 50, schema.Uncertainty{Kind: schema.UncRange, Min: 20, Max: 100}), sig("bond_albedo", 0.3, 0.05)),
			// Lost: no semi-major axis and no prior for one: excluded.
			body(schema.KindMoon, "Lost", "Aurel b", sig("mass", 1e21, 1e20), sig("radius", 300*kmM, 5*kmM)),
		},
	}
}

// fixedProfile has only fixed priors, so a moon whose catalog values are all
// exact has no uncertainty at all.
func fixedProfile(tb testing.TB) *profile.Profile {
	tb.Helper()
	p, err := profile.Parse("fixed.toml", []byte(`
name = "fixed"
top_k = 2
[[criterion]]
metric = "heat_flux_w_m2"
transfer = "log_ramp"
lo = 1e-3
hi = 1
[[criterion]]
metric = "retains:N2"
transfer = "ramp"
lo = 0
hi = 1
[priors]
k2_q = { dist = "fixed", value = 0.01 }
bond_albedo = { dist = "fixed", value = 0.5 }
obliquity = { dist = "fixed", value = 0 }
rock_density = { dist = "fixed", value = 3300 }
`))
	if err != nil {
		tb.Fatal(err)
	}
	return p
}

func mustProfile(tb testing.TB, name string) *profile.Profile {
	tb.Helper()
	p, err := profile.Builtin(name)
	if err != nil {
		tb.Fatal(err)
	}
	return p
}

// near reports |got − want| ≤ rel·|want| + abs.
func near(got, want, rel, abs float64) bool {
	return math.Abs(got-want) <= rel*math.Abs(want)+abs
}

func checkNear(tb testing.TB, what string, got, want, rel, abs float64) {
	tb.Helper()
	if !near(got, want, rel, abs) {
		tb.Errorf("%s = %.8g, want %.8g (rel %g, abs %g)", what, got, want, rel, abs)
	}
}
