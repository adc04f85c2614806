package physics

import (
	"encoding/json"
	"math"
	"strings"
	"testing"
)

// The rock end member for the two-component fallback in these tests: the
// default three-layer mantle density (common practice to use the same rock).
const testRockDensity = 3250

func evaluate(tb testing.TB, in Inputs, opt Options) Derived {
	tb.Helper()
	var d Derived
	Evaluate(in, opt, &d)
	return d
}

func TestEvaluateIoTides(t *testing.T) {
	// Lainey et al. 2009 (Nature 459, 957): k2/Q = 0.015, e = 0.0041 → ≈ 93 TW.
	d := evaluate(t, ioMoon.inputs(0.015, testRockDensity), DefaultOptions())
	approx(t, "Io tidal power", d.TidalPower, 93e12, 0.05)
	// Io's published mean heat flux is about 2.2–2.5 W/m² (e.g. Veeder et al.
	// 1994, J. Geophys. Res. 99, 17095, ≈ 2.5 W/m²; from memory): the tidal
	// model's 93 TW over Io's surface must land in that range.
	if d.HeatFlux < 2.0 || d.HeatFlux > 2.7 {
		t.Errorf("Io heat flux %.3g W/m², want 2.0–2.7", d.HeatFlux)
	}
}

func TestEvaluateOceans(t *testing.T) {
	// Conduction only: these checks use a conductive ice shell with
	// k = 651/T and no solid-state convection, no high-pressure ice phases
	// below the ocean and no salts or ammonia; they test the model's logic on
	// published bulk parameters, not the state of the moons.
	//
	// Tidal heating of Europa and Ganymede is not measured. Europa gets an
	// assumed k2/Q = 0.25/100 (k2 ≈ 0.25 for an ocean-bearing Europa, Moore &
	// Schubert 2000, Icarus 147, 317, from memory; Q = 100 common practice); Ganymede's
	// tidal heat is negligible at its e = 0.001 whatever k2/Q, so it gets
	// none (radiogenic heating alone). Io: Lainey et al. 2009. Moon: k2/Q =
	// 0.0006 (k2 ≈ 0.024, Q ≈ 38; Williams et al. 2014, from memory).
	opt := DefaultOptions()
	cases := []struct {
		b     body
		k2q   float64
		ocean bool
		flag  Flag // must be set
	}{
		{europa, 0.0025, true, 0},
		{ganymede, 0, true, 0},
		{ioMoon, 0.015, false, FlagNoIce},
		{moon, 0.0006, false, FlagNoIce | FlagIceUnstable},
	}
	for _, c := range cases {
		d := evaluate(t, c.b.inputs(c.k2q, testRockDensity), opt)
		if d.Ocean != c.ocean {
			t.Errorf("%s: ocean %v, want %v (water %.4g m, shell %.4g m, flags %v)", c.b.name, d.Ocean, c.ocean, d.WaterLayerThickness, d.ConductiveShellThickness, d.Flags)
		}
		if d.Flags&c.flag != c.flag {
			t.Errorf("%s: flags %v, want %v set", c.b.name, d.Flags, c.flag)
		}
		if c.ocean {
			if !(d.OceanThickness > 0) || !(d.IceShellThickness > 0) {
				t.Errorf("%s: ocean %.4g m under shell %.4g m", c.b.name, d.OceanThickness, d.IceShellThickness)
			}
			approx(t, c.b.name+" layers add up", d.IceShellThickness+d.OceanThickness, d.WaterLayerThickness, 1e-12)
			if d.Interior != InteriorThreeLayer {
				t.Errorf("%s: interior %v, want three_layer", c.b.name, d.Interior)
			}
		} else if d.WaterLayerThickness != 0 || d.OceanThickness != 0 || d.IceShellThickness != 0 {
			t.Errorf("%s: water %g, shell %g, ocean %g; want all 0", c.b.name, d.WaterLayerThickness, d.IceShellThickness, d.OceanThickness)
		}
	}
	// Disagreement worth knowing: on radiogenic heat alone (k2/Q = 0) the
	// conductive shell of Europa (≈ 139 km) is thicker than its H₂O layer
	// (≈ 110 km), so Europa freezes through in this model; its ocean depends
	// on tidal heating, as the literature also argues.
	d := evaluate(t, europa.inputs(0, testRockDensity), opt)
	if d.Ocean || d.Flags&FlagFrozenThrough == 0 {
		t.Errorf("Europa without tides: ocean %v, flags %v; want frozen through", d.Ocean, d.Flags)
	}
}

func TestEvaluateTemperatures(t *testing.T) {
	opt := DefaultOptions()
	in := europa.inputs(0.0025, testRockDensity)
	d := evaluate(t, in, opt)
	approx(t, "T_eq", d.EquilibriumTemperature, EquilibriumTemperature(solarLuminosity, europa.albedo, jupiterSunDist), 1e-15)
	approx(t, "T_s", d.SurfaceTemperature, SurfaceTemperature(d.EquilibriumTemperature, d.HeatFlux), 1e-15)
	// A measured surface temperature overrides the energy balance.
	in.SurfaceTemperature = 110
	d = evaluate(t, in, opt)
	approx(t, "T_s given", d.SurfaceTemperature, 110, 0)
	approx(t, "shell at 110 K", d.ConductiveShellThickness, ShellThickness(d.HeatFlux, 110, opt.MeltingTemperature), 1e-15)
	// A warm surface above the ice-stability temperature removes the water.
	in.SurfaceTemperature = 200
	d = evaluate(t, in, opt)
	if d.WaterLayerThickness != 0 || d.Flags&FlagIceUnstable == 0 || d.Ocean {
		t.Errorf("warm Europa: water %g, flags %v", d.WaterLayerThickness, d.Flags)
	}
	// Above melting: no shell, no ocean, flagged (with the stability limit
	// raised so the water survives to the shell step).
	hot := opt
	hot.IceStabilityTemperature = 400
	in.SurfaceTemperature = 300
	d = evaluate(t, in, hot)
	if d.Flags&FlagSurfaceAboveMelting == 0 || d.Ocean || d.IceShellThickness != 0 {
		t.Errorf("hot surface: flags %v, ocean %v, shell %g", d.Flags, d.Ocean, d.IceShellThickness)
	}
	// An ammonia–water ocean (176 K eutectic) has a thinner shell.
	amm := opt
	amm.MeltingTemperature = AmmoniaWaterEutectic
	in.SurfaceTemperature = math.NaN()
	dw := evaluate(t, in, opt)
	da := evaluate(t, in, amm)
	approx(t, "ammonia shell", da.ConductiveShellThickness, dw.ConductiveShellThickness*math.Log(176/dw.SurfaceTemperature)/math.Log(opt.MeltingTemperature/dw.SurfaceTemperature), 1e-12)
}

func TestEvaluateMinOceanThickness(t *testing.T) {
	opt := DefaultOptions()
	d := evaluate(t, europa.inputs(0.0025, testRockDensity), opt)
	if !d.OceanQualifies {
		t.Fatal("Europa ocean does not qualify with minimum 0")
	}
	opt.MinOceanThickness = d.OceanThickness + 1
	d = evaluate(t, europa.inputs(0.0025, testRockDensity), opt)
	if !d.Ocean || d.OceanQualifies {
		t.Errorf("ocean %v qualifies %v; want exists but too thin", d.Ocean, d.OceanQualifies)
	}
}

func TestEvaluateHighEccentricity(t *testing.T) {
	in := europa.inputs(0.0025, testRockDensity)
	in.Eccentricity = 0.35
	d := evaluate(t, in, DefaultOptions())
	if d.Flags&FlagHighEccentricity == 0 {
		t.Errorf("flags %v, want high_eccentricity", d.Flags)
	}
	in.Eccentricity = 0.29
	if d := evaluate(t, in, DefaultOptions()); d.Flags&FlagHighEccentricity != 0 {
		t.Errorf("e = 0.29 flagged: %v", d.Flags)
	}
}

func TestEvaluateKepler(t *testing.T) {
	in := ioMoon.inputs(0.015, testRockDensity)
	in.Period = math.NaN()
	d := evaluate(t, in, DefaultOptions())
	approx(t, "n", d.MeanMotion, MeanMotionKepler(ioMoon.a, jupiterMass, ioMoon.mass), 1e-15)
	if d.Flags&FlagMeanMotionFromKepler == 0 {
		t.Errorf("flags %v, want mean_motion_from_kepler", d.Flags)
	}
}

// TestEvaluateMissing checks that a missing input makes NaN exactly the
// quantities that depend on it (the table in Evaluate's comment).
func TestEvaluateMissing(t *testing.T) {
	opt := DefaultOptions()
	base := evaluate(t, europa.inputs(0.0025, testRockDensity), opt)
	nan := math.NaN()
	type getter func(*Derived) float64
	fields := map[string]getter{
		"MeanMotion":          func(d *Derived) float64 { return d.MeanMotion },
		"TidalPower":          func(d *Derived) float64 { return d.TidalPower },
		"RadiogenicPower":     func(d *Derived) float64 { return d.RadiogenicPower },
		"HeatFlux":            func(d *Derived) float64 { return d.HeatFlux },
		"TidalForce":          func(d *Derived) float64 { return d.TidalForce },
		"TidalAcceleration":   func(d *Derived) float64 { return d.TidalAcceleration },
		"EquilibriumTemp":     func(d *Derived) float64 { return d.EquilibriumTemperature },
		"SurfaceTemperature":  func(d *Derived) float64 { return d.SurfaceTemperature },
		"EscapeVelocity":      func(d *Derived) float64 { return d.EscapeVelocity },
		"RockFraction":        func(d *Derived) float64 { return d.RockFraction },
		"WaterLayerThickness": func(d *Derived) float64 { return d.WaterLayerThickness },
		"IceShellThickness":   func(d *Derived) float64 { return d.IceShellThickness },
		"OceanThickness":      func(d *Derived) float64 { return d.OceanThickness },
		"JeansH2O":            func(d *Derived) float64 { return d.JeansParameter[VolatileH2O] },
	}
	for name, f := range fields {
		if math.IsNaN(f(&base)) {
			t.Fatalf("baseline %s is NaN", name)
		}
	}
	cases := []struct {
		name  string
		mod   func(*Inputs)
		isNaN []string // every other field must stay finite
	}{
		{"no k2/Q", func(in *Inputs) { in.K2Q = nan },
			[]string{"TidalPower", "HeatFlux", "SurfaceTemperature", "WaterLayerThickness", "IceShellThickness", "OceanThickness", "JeansH2O"}},
		{"no luminosity", func(in *Inputs) { in.StarLuminosity = nan },
			[]string{"EquilibriumTemp", "SurfaceTemperature", "WaterLayerThickness", "IceShellThickness", "OceanThickness", "JeansH2O"}},
		{"no luminosity, T_s given", func(in *Inputs) { in.StarLuminosity = nan; in.SurfaceTemperature = 100 },
			[]string{"EquilibriumTemp"}},
		{"no planet mass", func(in *Inputs) { in.PlanetMass = nan },
			[]string{"TidalForce", "TidalAcceleration"}},
		{"no period, no planet mass", func(in *Inputs) { in.PlanetMass = nan; in.Period = nan },
			[]string{"MeanMotion", "TidalPower", "TidalForce", "TidalAcceleration", "HeatFlux", "SurfaceTemperature", "WaterLayerThickness", "IceShellThickness", "OceanThickness", "JeansH2O"}},
		{"no semi-major axis", func(in *Inputs) { in.SemiMajorAxis = nan },
			[]string{"TidalForce", "TidalAcceleration"}},
		{"no moment of inertia (two-component)", func(in *Inputs) { in.MomentOfInertia = nan }, nil},
		{"no MoI, no rock density", func(in *Inputs) { in.MomentOfInertia = nan; in.RockDensity = nan },
			[]string{"RockFraction", "RadiogenicPower", "HeatFlux", "SurfaceTemperature", "WaterLayerThickness", "IceShellThickness", "OceanThickness", "JeansH2O"}},
		{"no rock density (three-layer)", func(in *Inputs) { in.RockDensity = nan }, nil},
		{"no rock density, three-layer fails", func(in *Inputs) { in.RockDensity = nan; in.MomentOfInertia = 0.45 }, nil},
		{"no mass", func(in *Inputs) { in.Mass = nan },
			[]string{"TidalForce", "EscapeVelocity", "RockFraction", "RadiogenicPower", "HeatFlux", "SurfaceTemperature", "WaterLayerThickness", "IceShellThickness", "OceanThickness", "JeansH2O"}},
		{"no albedo", func(in *Inputs) { in.BondAlbedo = nan },
			[]string{"EquilibriumTemp", "SurfaceTemperature", "WaterLayerThickness", "IceShellThickness", "OceanThickness", "JeansH2O"}},
	}
	for _, c := range cases {
		in := europa.inputs(0.0025, testRockDensity)
		c.mod(&in)
		d := evaluate(t, in, opt)
		want := map[string]bool{}
		for _, n := range c.isNaN {
			want[n] = true
		}
		for name, f := range fields {
			if got := math.IsNaN(f(&d)); got != want[name] {
				t.Errorf("%s: %s NaN = %v, want %v", c.name, name, got, want[name])
			}
		}
		if d.Flags&FlagOutOfDomain != 0 {
			t.Errorf("%s: a missing input raised out_of_domain", c.name)
		}
	}
}

func TestEvaluateSpecialInputs(t *testing.T) {
	opt := DefaultOptions()
	cases := []struct {
		name string
		mod  func(*Inputs)
		flag Flag
		chk  func(*Derived) bool
	}{
		{"mass 0", func(in *Inputs) { in.Mass = 0 }, FlagOutOfDomain, func(d *Derived) bool { return math.IsNaN(d.EscapeVelocity) }},
		{"mass +Inf", func(in *Inputs) { in.Mass = math.Inf(1) }, FlagOutOfDomain, func(d *Derived) bool { return math.IsNaN(d.EscapeVelocity) }},
		{"radius -1", func(in *Inputs) { in.Radius = -1 }, FlagOutOfDomain, func(d *Derived) bool { return math.IsNaN(d.TidalPower) }},
		{"e = 1", func(in *Inputs) { in.Eccentricity = 1 }, FlagOutOfDomain, func(d *Derived) bool { return math.IsNaN(d.TidalPower) }},
		{"e = 0", func(in *Inputs) { in.Eccentricity = 0 }, 0, func(d *Derived) bool { return d.TidalPower == 0 }},
		{"k2/Q = 0", func(in *Inputs) { in.K2Q = 0 }, 0, func(d *Derived) bool { return d.TidalPower == 0 && d.HeatFlux > 0 }},
		{"period -Inf", func(in *Inputs) { in.Period = math.Inf(-1) }, FlagOutOfDomain | FlagMeanMotionFromKepler, func(d *Derived) bool { return d.MeanMotion > 0 }},
		{"albedo 1.5", func(in *Inputs) { in.BondAlbedo = 1.5 }, FlagOutOfDomain, func(d *Derived) bool { return math.IsNaN(d.EquilibriumTemperature) }},
		{"luminosity 0", func(in *Inputs) { in.StarLuminosity = 0 }, 0, func(d *Derived) bool { return d.EquilibriumTemperature == 0 && d.SurfaceTemperature > 0 }},
		{"moi 0.9", func(in *Inputs) { in.MomentOfInertia = 0.9 }, FlagOutOfDomain, func(d *Derived) bool { return d.Interior == InteriorTwoComponent }},
		{"moi 0.45", func(in *Inputs) { in.MomentOfInertia = 0.45 }, FlagNoThreeLayerSolution, func(d *Derived) bool { return d.Interior == InteriorTwoComponent }},
		{"column 0", func(in *Inputs) { in.AtmosphereColumn = 0 }, 0, func(d *Derived) bool { return d.RetentionTime[VolatileN2] == 0 }},
		{"column -1", func(in *Inputs) { in.AtmosphereColumn = -1 }, FlagOutOfDomain, func(d *Derived) bool { return math.IsNaN(d.RetentionTime[VolatileN2]) }},
		{"surface temperature 0", func(in *Inputs) { in.SurfaceTemperature = 0 }, FlagOutOfDomain, func(d *Derived) bool { return d.SurfaceTemperature > 0 }},
		{"all NaN", func(in *Inputs) {
			*in = Inputs{math.NaN(), math.NaN(), math.NaN(), math.NaN(), math.NaN(), math.NaN(), math.NaN(), math.NaN(), math.NaN(), math.NaN(), math.NaN(), math.NaN(), math.NaN(), math.NaN(), math.NaN()}
		}, 0, func(d *Derived) bool {
			return math.IsNaN(d.TidalPower) && math.IsNaN(d.OceanThickness) && !d.Ocean && !d.Retained[0] && d.Interior == InteriorNone
		}},
	}
	for _, c := range cases {
		in := europa.inputs(0.0025, testRockDensity)
		c.mod(&in)
		d := evaluate(t, in, opt)
		if d.Flags&c.flag != c.flag || (c.flag&FlagOutOfDomain == 0 && d.Flags&FlagOutOfDomain != 0) {
			t.Errorf("%s: flags %v, want %v", c.name, d.Flags, Flag(c.flag))
		}
		if !c.chk(&d) {
			t.Errorf("%s: unexpected result %+v", c.name, d)
		}
	}
}

func TestEvaluateOverwrites(t *testing.T) {
	// Evaluate must set every field, whatever the previous contents.
	opt := DefaultOptions()
	in := europa.inputs(0.0025, testRockDensity)
	var fresh, reused Derived
	Evaluate(in, opt, &fresh)
	Evaluate(moon.inputs(0.0006, testRockDensity), opt, &reused)
	reused.Ocean, reused.OceanQualifies = true, true
	Evaluate(in, opt, &reused)
	a, _ := json.Marshal(fresh.Named())
	b, _ := json.Marshal(reused.Named())
	if string(a) != string(b) {
		t.Errorf("reused Derived differs:\n%s\n%s", a, b)
	}
}

func TestEvaluateRetentionTime(t *testing.T) {
	// With a column, RetentionTime matches the separate functions.
	in := ganymede.inputs(0, testRockDensity)
	in.AtmosphereColumn = 1e-3
	d := evaluate(t, in, DefaultOptions())
	j := VolatileCH4
	mm := Volatiles[j].MolarMass
	n := SurfaceNumberDensity(in.AtmosphereColumn, d.SurfaceGravity, d.SurfaceTemperature)
	want := RetentionTime(in.AtmosphereColumn, JeansMassFlux(n, d.SurfaceTemperature, mm, d.JeansParameter[j]))
	approx(t, "CH4 τ", d.RetentionTime[j], want, 1e-12)
	// Heavier gases are held longer.
	if !(d.RetentionTime[VolatileH2] < d.RetentionTime[VolatileCH4] && d.RetentionTime[VolatileCH4] < d.RetentionTime[VolatileN2]) {
		t.Errorf("τ not increasing with mass: %v", d.RetentionTime)
	}
	approx(t, "CH4 log10 τ", float64(d.Named().RetentionTimeLog10["CH4"]), math.Log10(d.RetentionTime[VolatileCH4]), 1e-12)
	// The JSON log10 form stays finite where τ overflows: SO₂ on a 30 K
	// Ganymede has λ ≈ 960 and e^λ > MaxFloat64.
	in.SurfaceTemperature = 30
	d = evaluate(t, in, DefaultOptions())
	c := d.Named()
	if !math.IsInf(d.RetentionTime[VolatileSO2], 1) {
		t.Fatalf("expected SO2 τ to overflow, got %g", d.RetentionTime[VolatileSO2])
	}
	if lg := c.RetentionTimeLog10["SO2"]; !lg.Valid() || lg < 300 {
		t.Errorf("SO2 log10 τ = %v, want a finite value above 300", float64(lg))
	}
	// The logarithmic branch agrees with log10 of the direct τ where both exist.
	in.SurfaceTemperature = math.NaN()
	d = evaluate(t, in, DefaultOptions())
	lam := d.JeansParameter[VolatileCH4]
	approx(t, "log branch", retentionLog10(math.Inf(1), lam, d.SurfaceTemperature, d.SurfaceGravity, mm), math.Log10(d.RetentionTime[VolatileCH4]), 1e-12)
}

func TestNamedJSON(t *testing.T) {
	d := evaluate(t, europa.inputs(0.0025, testRockDensity), DefaultOptions())
	b, err := json.Marshal(d.Named())
	if err != nil {
		t.Fatal(err)
	}
	var m map[string]any
	if err := json.Unmarshal(b, &m); err != nil {
		t.Fatal(err)
	}
	// The ranking contract's metric names (rank/result.go Metrics).
	for _, k := range []string{"tidal_power_w", "radiogenic_power_w", "heat_flux_w_m2", "tidal_force_n",
		"surface_temperature_k", "escape_velocity_m_s", "water_layer_thickness_m", "ice_shell_thickness_m",
		"ocean_probability", "retention"} {
		if _, ok := m[k]; !ok {
			t.Errorf("missing %q in %s", k, b)
		}
	}
	if m["ocean_probability"] != 1.0 {
		t.Errorf("ocean_probability = %v, want 1", m["ocean_probability"])
	}
	ret := m["retention"].(map[string]any)
	if len(ret) != NumVolatiles || ret["H2"] != 0.0 || ret["SO2"] != 1.0 {
		t.Errorf("retention = %v", ret)
	}
	// NaN becomes null, and so does an unknown retention.
	in := europa.inputs(math.NaN(), testRockDensity)
	d = evaluate(t, in, DefaultOptions())
	b, err = json.Marshal(d.Named())
	if err != nil {
		t.Fatalf("NaN fields broke JSON: %v", err)
	}
	s := string(b)
	for _, want := range []string{`"tidal_power_w":null`, `"ocean_probability":null`, `"H2O":null`, `"flags":[]`} {
		if !strings.Contains(s, want) {
			t.Errorf("missing %s in %s", want, s)
		}
	}
}

func TestFlagNames(t *testing.T) {
	if s := Flag(0).String(); s != "none" {
		t.Errorf("zero flag %q", s)
	}
	f := FlagHighEccentricity | FlagNoIce
	if s := f.String(); s != "high_eccentricity|no_ice" {
		t.Errorf("String = %q", s)
	}
	seen := map[string]bool{}
	for i := range numFlags {
		n := Flag(1 << i).String()
		if n == "" || strings.Contains(n, "|") || seen[n] {
			t.Errorf("flag bit %d has bad name %q", i, n)
		}
		seen[n] = true
	}
}

func TestOptionsValidate(t *testing.T) {
	if err := DefaultOptions().Validate(); err != nil {
		t.Errorf("defaults invalid: %v", err)
	}
	o := DefaultOptions()
	o.CoreDensity = 3000
	o.IceDensity = -1
	err := o.Validate()
	if err == nil || !strings.Contains(err.Error(), "water < mantle < core") || !strings.Contains(err.Error(), "ice density") {
		t.Errorf("Validate = %v", err)
	}
}

func TestEvaluateNoAlloc(t *testing.T) {
	in := europa.inputs(0.0025, testRockDensity)
	in.AtmosphereColumn = 1
	opt := DefaultOptions()
	var d Derived
	if n := testing.AllocsPerRun(100, func() { Evaluate(in, opt, &d) }); n != 0 {
		t.Errorf("Evaluate allocates %v times per call", n)
	}
}

func BenchmarkEvaluate(b *testing.B) {
	opt := DefaultOptions()
	cases := []struct {
		name string
		in   Inputs
	}{
		{"three_layer", europa.inputs(0.0025, testRockDensity)},
		{"two_component", callisto.inputs(0.0025, testRockDensity)},
		{"with_column", func() Inputs { in := ganymede.inputs(0.001, testRockDensity); in.AtmosphereColumn = 1e-3; return in }()},
	}
	for _, c := range cases {
		b.Run(c.name, func(b *testing.B) {
			var d Derived
			b.ReportAllocs()
			for b.Loop() {
				Evaluate(c.in, opt, &d)
			}
		})
	}
}

func BenchmarkSolveThreeLayer(b *testing.B) {
	opt := DefaultOptions()
	rho := BulkDensity(europa.mass, europa.radius)
	for b.Loop() {
		SolveThreeLayer(europa.radius, rho, europa.moi, opt.CoreDensity, opt.MantleDensity, opt.WaterDensity)
	}
}

func BenchmarkCbrt(b *testing.B) {
	x := 0.3
	for b.Loop() {
		x = math.Cbrt(x + 0.5)
	}
	_ = x
}
