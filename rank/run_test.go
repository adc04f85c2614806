package rank

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"math"
	"reflect"
	"slices"
	"strings"
	"testing"

	"tidesift/rank/physics"
	"tidesift/rank/profile"
	"tidesift/rank/synth"
	"tidesift/schema"
)

func mustRun(tb testing.TB, cat *schema.Catalog, prof *profile.Profile, opt Options) *Result {
	tb.Helper()
	res, err := Run(context.Background(), cat, prof, opt)
	if err != nil {
		tb.Fatal(err)
	}
	return res
}

func jsonOf(tb testing.TB, res *Result) []byte {
	tb.Helper()
	b, err := json.Marshal(res)
	if err != nil {
		tb.Fatalf("json: %v", err)
	}
	return b
}

func TestDeterminism(t *testing.T) {
	cat := synth.Catalog(40, 3)
	prof := mustProfile(t, "ocean")
	a := jsonOf(t, mustRun(t, cat, prof, Options{Samples: 3000, Workers: 1}))
	b := jsonOf(t, mustRun(t, cat, prof, Options{Samples: 3000, Workers: 1}))
	c := jsonOf(t, mustRun(t, cat, prof, Options{Samples: 3000, Workers: 4}))
	if !bytes.Equal(a, b) {
		t.Error("two runs differ")
	}
	if !bytes.Equal(a, c) {
		t.Error("1 and 4 workers differ")
	}
	d := jsonOf(t, mustRun(t, cat, prof, Options{Samples: 3000, Workers: 4, Seed: 2}))
	if bytes.Equal(a, d) {
		t.Error("seed 2 gave the same result as seed 1")
	}
}

// TestStreamsIndependentOfOthers: a moon's samples depend on its own identity,
// not on which other moons are ranked, so its score and metrics are the same
// with a filter.
func TestStreamsIndependentOfOthers(t *testing.T) {
	cat := synth.Catalog(30, 5)
	prof := mustProfile(t, "tidal")
	all := mustRun(t, cat, prof, Options{Samples: 2000})
	some := mustRun(t, cat, prof, Options{Samples: 2000, Filter: Filter{Planets: []string{cat.Planets[1].Name}}})
	if len(some.Targets) != 10 {
		t.Fatalf("filter kept %d targets, want 10", len(some.Targets))
	}
	for _, s := range some.Targets {
		i := slices.IndexFunc(all.Targets, func(a Target) bool { return a.Name == s.Name })
		if !reflect.DeepEqual(all.Targets[i].Metrics, s.Metrics) || all.Targets[i].Score != s.Score {
			t.Errorf("%s: results depend on the other targets", s.Name)
		}
	}
}

func TestInvariants(t *testing.T) {
	cat := synth.Catalog(60, 7)
	for _, name := range profile.BuiltinNames() {
		prof := mustProfile(t, name)
		res := mustRun(t, cat, prof, Options{Samples: 1500})
		n := len(res.Targets)
		if n != 60 {
			t.Fatalf("%s: %d targets", name, n)
		}
		var sum float64
		for i, tg := range res.Targets {
			sum += tg.PTop.P
			ordered := func(what string, q Quantiles) {
				if !(q.P05 <= q.P50 && q.P50 <= q.P95) {
					t.Errorf("%s %s %s: %+v not ordered", name, tg.Name, what, q)
				}
			}
			ordered("score", tg.Score)
			ordered("rank", Quantiles{tg.RankP05, tg.Rank, tg.RankP95})
			m := tg.Metrics
			for _, q := range []Quantiles{m.TidalPower, m.RadiogenicPower, m.HeatFlux, m.TidalForce, m.SurfaceTemperature,
				m.EscapeVelocity, m.WaterLayerThickness, m.IceShellThickness} {
				ordered("metric", q)
			}
			if tg.RankP05 < 1 || tg.RankP95 > float64(n) || tg.Score.P05 < 0 || tg.Score.P95 > 1 {
				t.Errorf("%s: ranks %g..%g, score %+v out of range", tg.Name, tg.RankP05, tg.RankP95, tg.Score)
			}
			if i > 0 && res.Targets[i-1].Rank > tg.Rank {
				t.Errorf("targets not sorted by median rank at %d", i)
			}
			for _, d := range tg.Drivers {
				if d.Share < 0 || d.Share > 1 {
					t.Errorf("%s: driver %+v outside [0, 1]", tg.Name, d)
				}
			}
			if !slices.IsSortedFunc(tg.Drivers, func(a, b Driver) int {
				switch {
				case a.Share > b.Share:
					return -1
				case a.Share < b.Share:
					return 1
				}
				return 0
			}) {
				t.Errorf("%s: drivers not largest first", tg.Name)
			}
		}
		// Ranks in every sample are a permutation of 1…n, so exactly k targets
		// rank ≤ k in each sample.
		if math.Abs(sum-float64(res.TopK)) > 1e-9 {
			t.Errorf("%s: Σ P(rank ≤ %d) = %.12g", name, res.TopK, sum)
		}
	}
}

func TestAllFixedInputsZeroWidth(t *testing.T) {
	cat := &schema.Catalog{
		Stars:   []schema.Body{body(schema.KindStar, "Aurel", "", fixed("star_luminosity", lsunW))},
		Planets: []schema.Body{body(schema.KindPlanet, "Aurel b", "Aurel", fixed("planet_mass", 1.9e27), fixed("star_distance", 5.2*auM))},
		Moons: []schema.Body{
			body(schema.KindMoon, "Still", "Aurel b", fixed("mass", 4.8e22), fixed("radius", 1560*kmM),
				fixed("semi_major_axis", 671000*kmM), fixed("eccentricity", 0.009)),
			body(schema.KindMoon, "Stiller", "Aurel b", fixed("mass", 1.5e23), fixed("radius", 2630*kmM),
				fixed("semi_major_axis", 1070000*kmM), fixed("eccentricity", 0.0015)),
		},
	}
	res := mustRun(t, cat, fixedProfile(t), Options{Samples: 500})
	for _, tg := range res.Targets {
		zero := func(what string, q Quantiles) {
			if q.P05 != q.P95 || q.P50 != q.P05 {
				t.Errorf("%s %s: %+v, want zero width", tg.Name, what, q)
			}
		}
		zero("score", tg.Score)
		zero("rank", Quantiles{tg.RankP05, tg.Rank, tg.RankP95})
		zero("tidal power", tg.Metrics.TidalPower)
		zero("heat flux", tg.Metrics.HeatFlux)
		zero("surface temperature", tg.Metrics.SurfaceTemperature)
		if tg.ScoreMedianSE != 0 || tg.Metrics.OceanProbabilitySE != 0 || len(tg.Drivers) != 0 {
			t.Errorf("%s: SE %g, ocean SE %g, drivers %v; want none", tg.Name, tg.ScoreMedianSE, tg.Metrics.OceanProbabilitySE, tg.Drivers)
		}
	}
}

func TestExcludedAndWarned(t *testing.T) {
	res := mustRun(t, testCatalog(), mustProfile(t, "ocean"), Options{Samples: 500})
	if len(res.Excluded) != 1 || res.Excluded[0].Name != "Lost" {
		t.Fatalf("excluded %+v, want Lost", res.Excluded)
	}
	if !slices.Contains(res.Excluded[0].Missing, "semi_major_axis") {
		t.Errorf("missing %v", res.Excluded[0].Missing)
	}
	if len(res.Warnings) == 0 || !strings.Contains(res.Warnings[0], "Lost") {
		t.Errorf("warnings %v", res.Warnings)
	}
	for _, tg := range res.Targets {
		if tg.Name == "Lost" {
			t.Error("Lost was ranked")
		}
	}
}

func TestAssumedInputs(t *testing.T) {
	cat := testCatalog()
	before, _ := json.Marshal(cat)
	prof := mustProfile(t, "ocean")
	res := mustRun(t, cat, prof, Options{Samples: 500})
	after, _ := json.Marshal(cat)
	if !bytes.Equal(before, after) {
		t.Fatal("Run changed the catalog")
	}
	get := func(name string) Target {
		for _, tg := range res.Targets {
			if tg.Name == name {
				return tg
			}
		}
		t.Fatalf("no target %s", name)
		return Target{}
	}
	drift := get("Drift")
	// AssumedInputs holds the catalog keys Drift lacks; rock_density, a
	// model parameter only profiles set, is assumed too but never missing
	// data, so it shows in Inputs and Priors only.
	want := []string{"obliquity", "k2_q", "bond_albedo"}
	if !reflect.DeepEqual(drift.AssumedInputs, want) {
		t.Errorf("Drift assumed %v, want %v", drift.AssumedInputs, want)
	}
	fromPriors := append(slices.Clone(want), profile.RockDensityKey)
	for _, in := range drift.Inputs {
		assumed := slices.Contains(fromPriors, in.Key)
		if assumed != (in.Status == schema.StatusAssumed) {
			t.Errorf("Drift input %s: status %s", in.Key, in.Status)
		}
		if assumed && (!strings.Contains(in.Source, `profile "ocean" prior`) || drift.Priors[in.Key] == "") {
			t.Errorf("Drift input %s: source %q, prior %q", in.Key, in.Source, drift.Priors[in.Key])
		}
		if !assumed && in.Source != invSrc {
			t.Errorf("Drift measured input %s lost its source: %q", in.Key, in.Source)
		}
	}
	if drift.Priors["k2_q"] != "log-uniform 0.0001…0.1" {
		t.Errorf("k2_q prior %q", drift.Priors["k2_q"])
	}
	if len(drift.Priors) != len(fromPriors) {
		t.Errorf("Drift priors %v, want one for each of %v", drift.Priors, fromPriors)
	}
	// Brisk's catalog gives every input: not marked, though the profile's
	// rock_density prior is still used and described.
	brisk := get("Brisk")
	if brisk.AssumedInputs == nil || len(brisk.AssumedInputs) != 0 {
		t.Errorf("Brisk assumed %#v, want an empty list", brisk.AssumedInputs)
	}
	if brisk.Priors[profile.RockDensityKey] == "" {
		t.Errorf("Brisk priors %v lack %s", brisk.Priors, profile.RockDensityKey)
	}
	// Ember: mass from density and radius, k2/Q from k2 and Q.
	ember := get("Ember")
	var keys []string
	for _, in := range ember.Inputs {
		keys = append(keys, in.Key)
	}
	for _, k := range []string{"density", "radius", "k2", "q"} {
		if !slices.Contains(keys, k) {
			t.Errorf("Ember inputs %v lack %s", keys, k)
		}
	}
	if slices.Contains(keys, "mass") || slices.Contains(keys, "k2_q") {
		t.Errorf("Ember inputs %v: mass and k2_q should be derived", keys)
	}
	if ember.Metrics.EscapeVelocity.P50 <= 0 {
		t.Errorf("Ember escape velocity %+v", ember.Metrics.EscapeVelocity)
	}
}

// TestTinyUncertaintyMatchesCentral: with uncertainties a millionth of each
// value, every metric median equals the model at the central values.
func TestTinyUncertaintyMatchesCentral(t *testing.T) {
	cat := testCatalog()
	for mi := range cat.Moons {
		for k, v := range cat.Moons[mi].Params {
			if v.Unc.Kind != schema.UncNone {
				v.Unc = schema.Uncertainty{Kind: schema.UncSymmetric, Sigma: 1e-6 * math.Abs(v.Value)}
				cat.Moons[mi].Params[k] = v
			}
		}
	}
	for _, b := range [][]schema.Body{cat.Planets, cat.Stars} {
		for i := range b {
			for k, v := range b[i].Params {
				v.Unc = schema.Uncertainty{Kind: schema.UncSymmetric, Sigma: 1e-6 * v.Value}
				b[i].Params[k] = v
			}
		}
	}
	prof := fixedProfile(t)
	res := mustRun(t, cat, prof, Options{Samples: 1000})
	for _, tg := range res.Targets {
		var moon *schema.Body
		for i := range cat.Moons {
			if cat.Moons[i].Name == tg.Name {
				moon = &cat.Moons[i]
			}
		}
		d, _, err := Central(cat, moon, prof)
		if err != nil {
			t.Fatal(err)
		}
		m := tg.Metrics
		for _, c := range []struct {
			what string
			med  float64
			want float64
		}{
			{"tidal power", m.TidalPower.P50, d.TidalPower},
			{"radiogenic power", m.RadiogenicPower.P50, d.RadiogenicPower},
			{"heat flux", m.HeatFlux.P50, d.HeatFlux},
			{"tidal force", m.TidalForce.P50, d.TidalForce},
			{"surface temperature", m.SurfaceTemperature.P50, d.SurfaceTemperature},
			{"escape velocity", m.EscapeVelocity.P50, d.EscapeVelocity},
			{"water layer", m.WaterLayerThickness.P50, d.WaterLayerThickness},
			{"ice shell", m.IceShellThickness.P50, d.IceShellThickness},
		} {
			checkNear(t, tg.Name+" "+c.what, c.med, c.want, 1e-4, 1e-9)
		}
	}
}

// TestIo: Io with published values and tiny uncertainties gives the tidal
// power of the published k2/Q.
func TestIo(t *testing.T) {
	cat := &schema.Catalog{
		Stars: []schema.Body{body(schema.KindStar, "Sun", "", fixed("star_luminosity", lsunW))}, // IAU 2015 B3 nominal
		Planets: []schema.Body{body(schema.KindPlanet, "Jupiter", "Sun",
			fixed("planet_mass", 1.89819e27),     // NASA Jupiter fact sheet (Williams 2021)
			fixed("star_distance", 5.2038*auM))}, // NASA Jupiter fact sheet, semi-major axis
		Moons: []schema.Body{body(schema.KindMoon, "Io", "Jupiter",
			sig("mass", 8.9319e22, 1e16),             // NASA Jovian satellite fact sheet
			sig("radius", 1821.6*kmM, 1e-3),          // NASA Jovian satellite fact sheet
			sig("semi_major_axis", 421800*kmM, 1e-2), // NASA Jovian satellite fact sheet
			sig("eccentricity", 0.0041, 1e-9),        // as used with k2/Q by Lainey et al. 2009
			fixed("obliquity", 0),                    // synchronous, negligible obliquity (common practice)
			sig("period", 1.769138*dayS, 1e-6),       // NASA Jovian satellite fact sheet
			sig("k2_q", 0.015, 1e-9),                 // Lainey et al. 2009, Nature 459, 957
			fixed("bond_albedo", 0.63))},             // from memory; does not enter the tidal power
	}
	prof := mustProfile(t, "tidal")
	res := mustRun(t, cat, prof, Options{Samples: 500})
	got := res.Targets[0].Metrics.TidalPower.P50
	// Lainey et al. 2009: Io's dissipation 93 ± 19 TW; 5 % on the formula's output.
	checkNear(t, "Io tidal power", got, 93e12, 0.05, 0)
	d, _, err := Central(cat, &cat.Moons[0], prof)
	if err != nil {
		t.Fatal(err)
	}
	checkNear(t, "Io tidal power vs Evaluate", got, d.TidalPower, 1e-6, 0)
}

// TestStandardErrorShrinks: the reported standard errors fall as 1/√samples.
func TestStandardErrorShrinks(t *testing.T) {
	cat := testCatalog()
	prof := mustProfile(t, "tidal")
	small := mustRun(t, cat, prof, Options{Samples: 1000})
	big := mustRun(t, cat, prof, Options{Samples: 16000})
	checked := 0
	for _, tg := range small.Targets {
		b := big.Targets[slices.IndexFunc(big.Targets, func(x Target) bool { return x.Name == tg.Name })]
		if tg.ScoreMedianSE == 0 {
			continue
		}
		checked++
		ratio := tg.ScoreMedianSE / b.ScoreMedianSE
		// √(16000/1000) = 4; the SE estimates themselves scatter by ~10 %.
		if ratio < 3 || ratio > 5.3 {
			t.Errorf("%s: score median SE %g → %g, ratio %.2f, want ≈ 4", tg.Name, tg.ScoreMedianSE, b.ScoreMedianSE, ratio)
		}
	}
	if checked < 2 {
		t.Fatalf("only %d targets have a score spread to check", checked)
	}
	// The ocean probability's SE, where the probability is away from 0 and 1.
	for _, tg := range small.Targets {
		b := big.Targets[slices.IndexFunc(big.Targets, func(x Target) bool { return x.Name == tg.Name })]
		if p := b.Metrics.OceanProbability; p < 0.05 || p > 0.95 {
			continue
		}
		if r := tg.Metrics.OceanProbabilitySE / b.Metrics.OceanProbabilitySE; r < 3.3 || r > 4.8 {
			t.Errorf("%s: ocean probability SE ratio %.2f, want ≈ 4", tg.Name, r)
		}
	}
}

func TestJSONContract(t *testing.T) {
	res := mustRun(t, testCatalog(), mustProfile(t, "volatiles"), Options{Samples: 300})
	b := jsonOf(t, res)
	var doc map[string]any
	if err := json.Unmarshal(b, &doc); err != nil {
		t.Fatal(err)
	}
	for _, k := range []string{"format_version", "catalog_revision", "profile", "samples", "seed", "targets", "goarch", "top_k"} {
		if _, ok := doc[k]; !ok {
			t.Errorf("JSON lacks %q", k)
		}
	}
	tg := doc["targets"].([]any)[0].(map[string]any)
	for _, k := range []string{"name", "planet", "rank", "rank_p05", "rank_p95", "p_top", "score", "assumed_inputs", "drivers", "metrics"} {
		if _, ok := tg[k]; !ok {
			t.Errorf("target lacks %q", k)
		}
	}
	met := tg["metrics"].(map[string]any)
	for _, k := range []string{"tidal_power_w", "radiogenic_power_w", "heat_flux_w_m2", "tidal_force_n", "surface_temperature_k",
		"escape_velocity_m_s", "water_layer_thickness_m", "ice_shell_thickness_m", "ocean_probability", "retention"} {
		if _, ok := met[k]; !ok {
			t.Errorf("metrics lack %q", k)
		}
	}
	if res.CatalogRevision != 7 || res.CatalogHash != "test-hash" || res.ProfileTOML == "" || res.Revision.File != "invented.csv" {
		t.Errorf("result header %+v", res)
	}
	if len(res.Targets[0].Metrics.Retention) != physics.NumVolatiles {
		t.Errorf("retention %v", res.Targets[0].Metrics.Retention)
	}
}

func TestDriversFindTheUncertainInput(t *testing.T) {
	// Only eccentricity is uncertain (beyond the fixed priors): it owns the
	// whole score variance under the tidal profile.
	cat := &schema.Catalog{
		Stars:   []schema.Body{body(schema.KindStar, "Aurel", "", fixed("star_luminosity", lsunW))},
		Planets: []schema.Body{body(schema.KindPlanet, "Aurel b", "Aurel", fixed("planet_mass", 1.9e27), fixed("star_distance", 5.2*auM))},
		Moons: []schema.Body{body(schema.KindMoon, "Brisk", "Aurel b", fixed("mass", 4.8e22), fixed("radius", 1560*kmM),
			fixed("semi_major_axis", 671000*kmM), sig("eccentricity", 0.009, 0.003), sig("bond_albedo", 0.5, 1e-9))},
	}
	res := mustRun(t, cat, fixedProfile(t), Options{Samples: 4000})
	dr := res.Targets[0].Drivers
	if len(dr) != 2 || dr[0].Input != "eccentricity" || dr[0].Share < 0.95 || dr[1].Share > 0.02 {
		t.Errorf("drivers %+v, want eccentricity ≈ 1, bond_albedo ≈ 0", dr)
	}
}

func TestCentral(t *testing.T) {
	cat := testCatalog()
	prof := mustProfile(t, "ocean")
	d, params, err := Central(cat, &cat.Moons[2], prof) // Drift, with priors
	if err != nil {
		t.Fatal(err)
	}
	var k2q schema.Param
	for _, p := range params {
		if p.Key == "k2_q" {
			k2q = p
		}
	}
	if k2q.Status != schema.StatusAssumed || !near(k2q.Value, 10*1e-4*math.Sqrt(10), 1e-9, 0) {
		t.Errorf("k2_q %+v, want assumed at the prior median 10^-2.5", k2q)
	}
	if !(d.TidalPower > 0) {
		t.Errorf("tidal power %g", d.TidalPower)
	}
	_, _, err = Central(cat, &cat.Moons[4], prof) // Lost
	if !errors.Is(err, ErrMissingInputs) || !strings.Contains(err.Error(), "semi_major_axis") {
		t.Errorf("Lost: %v", err)
	}
}

func TestOptions(t *testing.T) {
	cat := testCatalog()
	prof := mustProfile(t, "ocean")
	res := mustRun(t, cat, prof, Options{Samples: 200, TopK: 2, Filter: Filter{Stars: []string{"aurel"}}})
	if res.TopK != 2 || res.Targets[0].PTop.K != 2 || res.Seed != 1 || res.Samples != 200 {
		t.Errorf("options not applied: %+v", res)
	}
	if r := mustRun(t, cat, prof, Options{Samples: 200, Filter: Filter{Planets: []string{"nowhere"}}}); len(r.Targets) != 0 {
		t.Errorf("filter: %d targets", len(r.Targets))
	}
	if _, err := Run(context.Background(), cat, prof, Options{Samples: -1}); err == nil {
		t.Error("negative samples: want an error")
	}
	var calls, last int
	mustRun(t, cat, prof, Options{Samples: 200, Progress: func(done, total int) { calls++; last = done; _ = total }})
	if calls != 4 || last != 4 {
		t.Errorf("progress called %d times, last %d; want 4", calls, last)
	}
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if _, err := Run(ctx, cat, prof, Options{Samples: 200}); !errors.Is(err, context.Canceled) {
		t.Errorf("cancelled: %v", err)
	}
}

// TestSharedPlanetDraws: moons of one planet share its draws sample by
// sample. Of two moons whose only uncertain input is the planet's mass, the
// 1 % heavier one has the larger tidal force in every sample, so it ranks
// first in every sample — with independent draws of a 26 % uncertain planet
// mass it would lose about half the time. Two identical moons tie in every
// sample, and the ties go either way with probability 1/2.
func TestSharedPlanetDraws(t *testing.T) {
	moon := func(name string, mass float64) schema.Body {
		return body(schema.KindMoon, name, "Aurel b", fixed("mass", mass), fixed("radius", 1560*kmM),
			fixed("semi_major_axis", 671000*kmM), fixed("eccentricity", 0.009))
	}
	cat := &schema.Catalog{
		Stars:   []schema.Body{body(schema.KindStar, "Aurel", "", fixed("star_luminosity", lsunW))},
		Planets: []schema.Body{body(schema.KindPlanet, "Aurel b", "Aurel", sig("planet_mass", 1.9e27, 5e26), fixed("star_distance", 5.2*auM))},
		Moons:   []schema.Body{moon("Twin A", 4.8e22), moon("Twin B", 4.848e22), moon("Twin C", 4.8e22)},
	}
	prof, err := profile.Parse("t", []byte(`
top_k = 1
[[criterion]]
metric = "tidal_force_n"
transfer = "log_ramp"
lo = 1e18
hi = 1e22
[priors]
k2_q = { dist = "fixed", value = 0.01 }
bond_albedo = { dist = "fixed", value = 0.5 }
obliquity = { dist = "fixed", value = 0 }
rock_density = { dist = "fixed", value = 3300 }
`))
	if err != nil {
		t.Fatal(err)
	}
	const n = 2000
	res := mustRun(t, cat, prof, Options{Samples: n})
	get := func(name string) Target {
		return res.Targets[slices.IndexFunc(res.Targets, func(x Target) bool { return x.Name == name })]
	}
	a, b, c := get("Twin A"), get("Twin B"), get("Twin C")
	if b.PTop.P != 1 || b.Rank != 1 || b.RankP95 != 1 {
		t.Errorf("heavier twin: P(rank 1) = %g, ranks %g..%g; want first in every sample", b.PTop.P, b.RankP05, b.RankP95)
	}
	if a.Score != c.Score || a.Score.P05 == a.Score.P95 {
		t.Errorf("identical twins: scores %+v and %+v", a.Score, c.Score)
	}
	// A and C tie in every sample for ranks 2 and 3: each is second with
	// probability 1/2 (binomial SE √(0.25/n); five SE).
	for _, tg := range []Target{a, c} {
		if tg.RankP05 != 2 || tg.RankP95 != 3 {
			t.Errorf("%s: ranks %g..%g, want 2..3", tg.Name, tg.RankP05, tg.RankP95)
		}
	}
	res2 := mustRun(t, cat, prof, Options{Samples: n, TopK: 2})
	for _, tg := range res2.Targets {
		if tg.Name == "Twin B" {
			continue
		}
		if math.Abs(tg.PTop.P-0.5) > 5*math.Sqrt(0.25/n) {
			t.Errorf("%s: P(rank ≤ 2) = %g, want 0.5: ties should be broken at random", tg.Name, tg.PTop.P)
		}
	}
}

// TestIndexMatchesCatalog: the engine's name index gives what the schema's
// own lookups give.
func TestIndexMatchesCatalog(t *testing.T) {
	for _, cat := range []*schema.Catalog{testCatalog(), synth.Catalog(45, 2)} {
		ix := newCatIndex(cat)
		for i := range cat.Moons {
			m := &cat.Moons[i]
			in, star := ix.inputs(m)
			if !reflect.DeepEqual(in, cat.Inputs(m)) || star != cat.StarOf(m) {
				t.Fatalf("%s: index and catalog disagree", m.Name)
			}
		}
	}
}

// TestNoPerSampleAllocations: Run's allocations do not grow with the sample
// count beyond its sample-sized buffers (the score matrix and one set of
// per-worker buffers), so the sample loop allocates nothing.
func TestNoPerSampleAllocations(t *testing.T) {
	cat := testCatalog()
	prof := mustProfile(t, "ocean")
	allocs := func(s int) float64 {
		return testing.AllocsPerRun(3, func() {
			if _, err := Run(context.Background(), cat, prof, Options{Samples: s, Workers: 1}); err != nil {
				t.Fatal(err)
			}
		})
	}
	a, b := allocs(2*ChunkSize), allocs(16*ChunkSize)
	if b > a+20 {
		t.Errorf("allocations grow with samples: %v at %d, %v at %d", a, 2*ChunkSize, b, 16*ChunkSize)
	}
}

// TestSharedCacheChurn: with many planets and stars the per-worker cache of
// planet and star inputs is constantly replaced; every moon must still get
// exactly the results it gets when ranked with its planet's moons alone.
func TestSharedCacheChurn(t *testing.T) {
	cat := synth.Catalog(240, 11) // 24 planets, 6 stars
	prof := mustProfile(t, "tidal")
	all := mustRun(t, cat, prof, Options{Samples: 300, Workers: 3})
	byName := map[string]Target{}
	for _, tg := range all.Targets {
		byName[tg.Name] = tg
	}
	for _, pl := range cat.Planets {
		part := mustRun(t, cat, prof, Options{Samples: 300, Workers: 1, Filter: Filter{Planets: []string{pl.Name}}})
		for _, tg := range part.Targets {
			a := byName[tg.Name]
			if !reflect.DeepEqual(a.Metrics, tg.Metrics) || a.Score != tg.Score || !reflect.DeepEqual(a.Drivers, tg.Drivers) {
				t.Fatalf("%s: results depend on the other moons ranked", tg.Name)
			}
		}
	}
}
