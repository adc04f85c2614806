package export

import (
	"flag"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"testing"
	"time"

	"tidesift/rank"
	"tidesift/schema"
)

var update = flag.Bool("update", false, "rewrite the golden files in testdata/")

// All names and values below are invented for the tests; none describes a
// real body.

func q(p05, p50, p95 float64) rank.Quantiles { return rank.Quantiles{P05: p05, P50: p50, P95: p95} }

// sampleResult is a small ranking of invented moons.
func sampleResult() *rank.Result {
	rev := schema.Revision{ID: 7, Time: time.Date(2026, 11, 30, 12, 0, 0, 0, time.UTC), File: "velra-moons.csv", SHA256: "3f2a", Note: "invented test catalog"}
	return &rank.Result{
		FormatVersion:   rank.FormatVersion,
		CatalogRevision: 7,
		CatalogHash:     "9c1e0b7d2a",
		Profile:         "ocean-worlds",
		Samples:         4000,
		Seed:            42,
		TopK:            2,
		GOARCH:          "amd64",
		Excluded:        []rank.Excluded{{Name: "Osk c IX", Planet: "Osk c", Missing: []string{"mass", "radius"}}},
		Warnings:        []string{"profile prior for k2_q used for 1 of 3 moons"},
		ProfileTOML:     "name = \"ocean-worlds\"\n\n[[criterion]]\nquantity = \"ocean_probability\"\nweight = 1\n",
		Revision:        rev,
		Targets: []rank.Target{
			{
				Name: "Velra b I", Planet: "Velra b", Star: "Velra",
				Rank: 1, RankP05: 1, RankP95: 2,
				PTop:  rank.PTop{K: 2, P: 0.97},
				Score: q(0.48, 0.62, 0.71), ScoreMedianSE: 0.004,
				AssumedInputs: []string{"k2_q"},
				Drivers:       []rank.Driver{{Input: "k2_q", Share: 0.62}, {Input: "eccentricity", Share: 0.21}, {Input: "mass", Share: 0.05}},
				Metrics: rank.Metrics{
					TidalPower:          q(75e12, 93e12, 112e12),
					RadiogenicPower:     q(1.9e11, 2.1e11, 2.3e11),
					HeatFlux:            q(0.021, 0.035, 0.052),
					TidalForce:          q(1.1e20, 1.26e20, 1.41e20),
					SurfaceTemperature:  q(98.2, 101.5, 104.9),
					EscapeVelocity:      q(2010, 2025, 2040),
					WaterLayerThickness: q(95e3, 120e3, 150e3),
					IceShellThickness:   q(8e3, 20e3, 45e3),
					OceanProbability:    0.91, OceanProbabilitySE: 0.0045,
					Retention: map[string]float64{"H2O": 1, "CH4": 0.8, "N2": 0.55, "CO": 0.3},
				},
				Inputs: []schema.Param{
					{Key: "mass", Value: 4.1e22, Unc: schema.Uncertainty{Kind: schema.UncSymmetric, Sigma: 0.2e22}, Source: "invented survey table 2", Status: schema.StatusMeasured, Revision: 3},
					{Key: "eccentricity", Value: 0.011, Unc: schema.Uncertainty{Kind: schema.UncAsymmetric, Plus: 0.002, Minus: 0.001}, Source: "invented orbit fit", Status: schema.StatusMeasured, Revision: 7},
					{Key: "k2_q", Value: 0.01, Unc: schema.Uncertainty{Kind: schema.UncFactor, Factor: 10}, Status: schema.StatusAssumed},
					{Key: "star_luminosity", Value: 3.2e26, Unc: schema.Uncertainty{Kind: schema.UncRange, Min: 3.0e26, Max: 3.4e26}, Source: "invented stellar model", Status: schema.StatusMeasured, Revision: 2},
				},
				Priors: map[string]string{"k2_q": "log-uniform 1e-4 to 0.1"},
				Flags:  map[string]float64{"high_eccentricity": 0.12, "frozen_through": 0.09},
				Notes:  []string{"ice_shell_thickness_m not computable in 9% of samples"},
			},
			{
				Name: "Velra b II", Planet: "Velra b", Star: "Velra",
				Rank: 2, RankP05: 1, RankP95: 3,
				PTop:  rank.PTop{K: 2, P: 0.71},
				Score: q(0.40, 0.55, 0.66), ScoreMedianSE: 0.005,
				Drivers: []rank.Driver{{Input: "moment_of_inertia", Share: 0.44}, {Input: "mass", Share: 0.30}},
				Metrics: rank.Metrics{
					TidalPower:          q(2.0e11, 3.1e11, 4.5e11),
					RadiogenicPower:     q(4.0e10, 4.4e10, 4.9e10),
					HeatFlux:            q(0.006, 0.009, 0.013),
					TidalForce:          q(2.2e18, 2.5e18, 2.9e18),
					SurfaceTemperature:  q(88.0, 90.1, 92.3),
					EscapeVelocity:      q(1400, 1450, 1500),
					WaterLayerThickness: q(60e3, 80e3, 100e3),
					IceShellThickness:   q(40e3, 70e3, math.Inf(1)),
					OceanProbability:    0.52, OceanProbabilitySE: 0.0079,
					Retention: map[string]float64{"H2O": 1, "CH4": 0.3, "N2": 0.1, "CO": 0.05},
				},
				Inputs: []schema.Param{
					{Key: "mass", Value: 1.2e22, Unc: schema.Uncertainty{Kind: schema.UncSymmetric, Sigma: 0.1e22}, Source: "invented survey table 2", Status: schema.StatusMeasured, Revision: 3},
					{Key: "moment_of_inertia", Value: 0.33, Unc: schema.Uncertainty{Kind: schema.UncRange, Min: 0.30, Max: 0.36}, Source: "invented gravity fit", Status: schema.StatusMeasured, Revision: 5},
				},
			},
			{
				Name: "Osk c IV", Planet: "Osk c", Star: "Osk",
				Rank: 3, RankP05: 2, RankP95: 3,
				PTop:  rank.PTop{K: 2, P: 0.32},
				Score: q(0.05, 0.10, 0.18), ScoreMedianSE: 0.002,
				Metrics: rank.Metrics{
					TidalPower:          q(1e6, 3e6, 9e6),
					RadiogenicPower:     q(1.0e8, 1.1e8, 1.2e8),
					HeatFlux:            q(0.0001, 0.0002, 0.0003),
					TidalForce:          q(1e15, 2e15, 3e15),
					SurfaceTemperature:  q(150, 150, 150),
					EscapeVelocity:      q(120, 125, 130),
					WaterLayerThickness: q(0, 0, 1200),
					IceShellThickness:   q(math.NaN(), math.NaN(), math.NaN()),
					OceanProbability:    0,
					Retention:           map[string]float64{"H2O": 0.2},
				},
			},
		},
	}
}

// syntheticResult builds an invented ranking of n targets for benchmarks and
// size tests: plausible magnitudes, random but reproducible.
func syntheticResult(n int) *rank.Result {
	rng := rand.New(rand.NewPCG(1, 1))
	r := sampleResult()
	r.TopK = 10
	r.Targets = make([]rank.Target, n)
	spread := func(mid, rel float64) rank.Quantiles {
		w := rel * (0.5 + rng.Float64())
		return q(mid*(1-w), mid, mid*(1+w))
	}
	keys := []string{"mass", "radius", "semi_major_axis", "eccentricity", "obliquity", "period", "k2_q",
		"bond_albedo", "moment_of_inertia", "atmosphere_column", "planet_mass", "planet_radius",
		"star_distance", "star_luminosity", "star_mass"}
	for i := range r.Targets {
		score := 1 - float64(i)/float64(n)
		t := rank.Target{
			Name:    "Syn " + itoa(i/7) + " " + romanish(i%7),
			Planet:  "Syn " + itoa(i/7),
			Star:    "Synstar " + itoa(i/50),
			Rank:    float64(i + 1),
			RankP05: math.Max(1, float64(i+1)-3),
			RankP95: float64(i + 4),
			PTop:    rank.PTop{K: 10, P: math.Max(0, 1-float64(i)/12)},
			Score:   spread(score, 0.2), ScoreMedianSE: 0.003,
			Metrics: rank.Metrics{
				TidalPower:          spread(math.Pow(10, 9+5*rng.Float64()), 0.5),
				RadiogenicPower:     spread(math.Pow(10, 9+3*rng.Float64()), 0.1),
				HeatFlux:            spread(math.Pow(10, -3+2*rng.Float64()), 0.5),
				TidalForce:          spread(math.Pow(10, 15+5*rng.Float64()), 0.3),
				SurfaceTemperature:  spread(60+100*rng.Float64(), 0.05),
				EscapeVelocity:      spread(200+2500*rng.Float64(), 0.03),
				WaterLayerThickness: spread(1e5*rng.Float64(), 0.3),
				IceShellThickness:   spread(5e3+9e4*rng.Float64(), 0.6),
				OceanProbability:    rng.Float64(), OceanProbabilitySE: 0.005,
				Retention: map[string]float64{"H2O": 1, "CH4": rng.Float64(), "NH3": rng.Float64(), "N2": rng.Float64(),
					"CO": rng.Float64(), "CO2": rng.Float64(), "SO2": rng.Float64()},
			},
			Priors: map[string]string{},
		}
		for j, k := range keys {
			p := schema.Param{Key: k, Value: math.Pow(10, 3*rng.Float64()), Source: "synthetic generator, invented", Status: schema.StatusMeasured, Revision: int64(1 + j%3)}
			switch j % 4 {
			case 0:
				p.Unc = schema.Uncertainty{Kind: schema.UncSymmetric, Sigma: p.Value * 0.1}
			case 1:
				p.Unc = schema.Uncertainty{Kind: schema.UncAsymmetric, Plus: p.Value * 0.1, Minus: p.Value * 0.05}
			case 2:
				p.Unc = schema.Uncertainty{Kind: schema.UncRange, Min: p.Value * 0.8, Max: p.Value * 1.3}
			case 3:
				p.Unc = schema.Uncertainty{Kind: schema.UncFactor, Factor: 3}
			}
			if k == "k2_q" {
				p.Status, p.Source, p.Revision = schema.StatusAssumed, "", 0
				t.AssumedInputs = append(t.AssumedInputs, k)
				t.Priors[k] = "log-uniform 1e-4 to 0.1"
			}
			t.Inputs = append(t.Inputs, p)
			if j < 8 {
				t.Drivers = append(t.Drivers, rank.Driver{Input: k, Share: 0.5 / float64(j+1)})
			}
		}
		r.Targets[i] = t
	}
	return r
}

func itoa(i int) string {
	const digits = "0123456789"
	if i == 0 {
		return "0"
	}
	var b []byte
	for ; i > 0; i /= 10 {
		b = append([]byte{digits[i%10]}, b...)
	}
	return string(b)
}

func romanish(i int) string { return [...]string{"I", "II", "III", "IV", "V", "VI", "VII"}[i] }

// hostileNames are catalog names a spreadsheet would otherwise evaluate.
var hostileNames = []string{"=1+1", "@SUM(A1)", "+x", "-x", "\tTabbed", "\rReturn", "=HYPERLINK(\"http://example.invalid\")"}

// hostileResult is sampleResult with names, planets and drivers that look
// like formulas.
func hostileResult() *rank.Result {
	r := sampleResult()
	for i := range r.Targets {
		r.Targets[i].Name = hostileNames[i%len(hostileNames)]
		r.Targets[i].Planet = hostileNames[(i+3)%len(hostileNames)]
	}
	r.Targets = append(r.Targets, r.Targets[0], r.Targets[1], r.Targets[2], r.Targets[0])
	for i := 3; i < len(r.Targets); i++ {
		r.Targets[i].Name = hostileNames[i%len(hostileNames)]
		r.Targets[i].Planet = "-Velra"
	}
	r.Targets[0].Star = "@star"
	return r
}

// closeTo reports whether got is within a relative tolerance of want (and
// treats two NaNs, or two equal infinities, as equal).
func closeTo(got, want, rel float64) bool {
	if math.IsNaN(want) || math.IsNaN(got) {
		return math.IsNaN(want) && math.IsNaN(got)
	}
	if math.IsInf(want, 0) || math.IsInf(got, 0) {
		return got == want
	}
	return math.Abs(got-want) <= rel*math.Max(math.Abs(want), 1e-300)
}

// checkGolden compares got with testdata/name, rewriting it under -update.
func checkGolden(tb testing.TB, name string, got []byte) {
	tb.Helper()
	path := filepath.Join("testdata", name)
	if *update {
		if err := os.WriteFile(path, got, 0o644); err != nil {
			tb.Fatal(err)
		}
		return
	}
	want, err := os.ReadFile(path)
	if err != nil {
		tb.Fatalf("read golden (run go test ./export -update to create it): %v", err)
	}
	if string(got) != string(want) {
		tb.Errorf("%s differs from the golden; got:\n%s\nwant:\n%s", name, got, want)
	}
}
