package physics

import (
	"errors"
	"fmt"
	"math"
	"strings"
)

// Inputs are the quantities one evaluation of the model needs, in SI units.
// A missing optional input is NaN. Angles are in radians. An input that is ±Inf
// or outside its physical domain is treated as missing and raises
// FlagOutOfDomain.
type Inputs struct {
	Mass               float64 // moon mass, kg
	Radius             float64 // moon mean radius, m
	SemiMajorAxis      float64 // moon's orbit about the planet, m
	Eccentricity       float64 // orbital eccentricity
	Obliquity          float64 // rad
	Period             float64 // orbital period, s; NaN: from Kepler's third law
	K2Q                float64 // k2/Q
	BondAlbedo         float64
	SurfaceTemperature float64 // K; NaN: computed from the energy balance
	MomentOfInertia    float64 // C/MR²; NaN: two-component interior from bulk density
	AtmosphereColumn   float64 // kg/m²; NaN: no retention timescale
	PlanetMass         float64 // kg
	StarDistance       float64 // planet–star distance, m
	StarLuminosity     float64 // W
	RockDensity        float64 // kg/m³, density of the rock end member (an uncertain prior)
}

// Options are the model parameters a scoring profile sets; they do not vary
// between Monte Carlo samples. DefaultOptions gives cited defaults.
type Options struct {
	IceDensity              float64 // kg/m³, H₂O end member of the two-component interior
	CoreDensity             float64 // kg/m³, metal core of the three-layer interior
	MantleDensity           float64 // kg/m³, rock mantle of the three-layer interior
	WaterDensity            float64 // kg/m³, H₂O layer of the three-layer interior
	RockHeatProduction      float64 // W/kg, present-day chondritic radiogenic heating of rock
	MeltingTemperature      float64 // K, base of the ice shell
	IceStabilityTemperature float64 // K, surface ice unstable above this
	MinOceanThickness       float64 // m, thinnest liquid layer that counts as an ocean (Derived.OceanQualifies)
}

// DefaultOptions returns the default model parameters, each from the source
// named beside it (see also the method text in package rank/method).
func DefaultOptions() Options {
	return Options{
		// Ice Ih near 100 K (Petrenko & Whitworth 1999, Physics of Ice, OUP).
		IceDensity: 930,
		// Fe–FeS eutectic core, the lighter end of the core compositions
		// considered by Anderson et al. 1996 (Nature 384, 541) and 1998
		// (Science 281, 2019); pure iron would be about 8000.
		CoreDensity: 5150,
		// Anhydrous silicate rock; within the 3000–3800 range explored by
		// Anderson et al. 1998 and close to the mantle density of Io's
		// water-free two-layer fits (Anderson et al. 2001, J. Geophys. Res.
		// 106, 32963).
		MantleDensity: 3250,
		// Mixed liquid water and ice, the H₂O layer density adopted by
		// Anderson et al. 1998.
		WaterDensity: 1000,
		// CI chondrite, present day (ChondriticHeatProduction).
		RockHeatProduction: ChondriticHeatProduction,
		// Pure water ice at 1 bar (WaterMeltingTemperature); a profile sets
		// AmmoniaWaterEutectic for an ammonia–water ocean.
		MeltingTemperature: WaterMeltingTemperature,
		// Temperature at which free sublimation into vacuum (Hertz–Knudsen
		// with the Murphy & Koop 2005 vapour pressure, IceSublimationRate)
		// removes about half a kilometre of ice in 4.5 Gyr; at the classic
		// 110 K stability limit of lunar cold-trap studies (Watson, Murray &
		// Brown 1961, J. Geophys. Res. 66, 3033; Vasavada, Paige & Wood 1999,
		// Icarus 141, 179) the loss is under a metre. The limit applies to a
		// global mean surface temperature, so it is set where a whole ice
		// layer, not a frost, would be lost.
		IceStabilityTemperature: 125,
		// Any liquid layer counts; a profile may ask for more.
		MinOceanThickness: 0,
	}
}

// Validate reports whether the options can be used by Evaluate: every density
// positive and finite, ρ_w < ρ_m < ρ_c for the three-layer model, temperatures
// positive, heat production and minimum ocean thickness non-negative.
func (o Options) Validate() error {
	var errs []error
	pos := func(name string, v float64) {
		if !(v > 0) || math.IsInf(v, 0) {
			errs = append(errs, fmt.Errorf("%s = %g: want a positive finite number", name, v))
		}
	}
	pos("ice density", o.IceDensity)
	pos("core density", o.CoreDensity)
	pos("mantle density", o.MantleDensity)
	pos("water density", o.WaterDensity)
	pos("melting temperature", o.MeltingTemperature)
	pos("ice-stability temperature", o.IceStabilityTemperature)
	if !(o.RockHeatProduction >= 0) || math.IsInf(o.RockHeatProduction, 0) {
		errs = append(errs, fmt.Errorf("rock heat production = %g W/kg: want a non-negative finite number", o.RockHeatProduction))
	}
	if !(o.MinOceanThickness >= 0) || math.IsInf(o.MinOceanThickness, 0) {
		errs = append(errs, fmt.Errorf("minimum ocean thickness = %g m: want a non-negative finite number", o.MinOceanThickness))
	}
	if !(o.WaterDensity < o.MantleDensity && o.MantleDensity < o.CoreDensity) {
		errs = append(errs, fmt.Errorf("three-layer densities water %g, mantle %g, core %g kg/m³: want water < mantle < core", o.WaterDensity, o.MantleDensity, o.CoreDensity))
	}
	return errors.Join(errs...)
}

// Derived holds every derived quantity of one evaluation, in SI units.
// Fields that could not be computed are NaN. Flags says which validity limits
// were crossed.
type Derived struct {
	MeanMotion             float64 // rad/s
	TidalPower             float64 // W
	RadiogenicPower        float64 // W
	HeatFlux               float64 // W/m²
	TidalForce             float64 // N
	TidalAcceleration      float64 // m/s², differential acceleration across the moon
	EquilibriumTemperature float64 // K
	SurfaceTemperature     float64 // K
	EscapeVelocity         float64 // m/s
	RockFraction           float64 // rock mass fraction, 0..1
	WaterLayerThickness    float64 // m
	IceShellThickness      float64 // m
	OceanThickness         float64 // m (0 when no ocean)
	Ocean                  bool    // an ocean exists beneath the shell
	Retained               [NumVolatiles]bool
	JeansParameter         [NumVolatiles]float64
	Flags                  Flag

	SurfaceGravity           float64               // m/s²
	BulkDensity              float64               // kg/m³
	Interior                 InteriorModel         // which interior model gave RockFraction and the water layer
	CoreRadius               float64               // m, three-layer model only (NaN otherwise)
	MantleRadius             float64               // m, outer radius of the rock (three-layer mantle, or two-component rock core)
	ConductiveShellThickness float64               // m, d = (651/q) ln(T_m/T_s) before capping at the H₂O layer; may be +Inf
	OceanQualifies           bool                  // Ocean and OceanThickness ≥ Options.MinOceanThickness
	RetentionTime            [NumVolatiles]float64 // s, Jeans e-folding time of the atmospheric column; NaN without a column; may be +Inf
}

// Flag records validity warnings of one evaluation, one bit each.
type Flag uint32

// Flags raised by Evaluate.
const (
	// FlagOutOfDomain: an input was ±Inf or outside its physical domain and
	// was treated as missing.
	FlagOutOfDomain Flag = 1 << iota
	// FlagMeanMotionFromKepler: the period was missing; the mean motion comes
	// from Kepler's third law.
	FlagMeanMotionFromKepler
	// FlagHighEccentricity: e ≥ MaxSmallEccentricity, outside the validity of
	// the small-eccentricity tidal formula; TidalPower is unreliable.
	FlagHighEccentricity
	// FlagNoThreeLayerSolution: a moment of inertia was given but the
	// three-layer model has no physical solution with the profile's
	// densities; the two-component interior was used instead.
	FlagNoThreeLayerSolution
	// FlagDensityBelowIce: bulk density below the H₂O end member; the rock
	// fraction was set to 0.
	FlagDensityBelowIce
	// FlagDensityAboveRock: bulk density above the rock end member; the rock
	// fraction was set to 1 (no H₂O).
	FlagDensityAboveRock
	// FlagIceUnstable: the surface temperature is at or above the
	// ice-stability temperature; the H₂O layer was set to zero.
	FlagIceUnstable
	// FlagNoIce: the body has no H₂O layer, so no ice shell and no ocean.
	FlagNoIce
	// FlagSurfaceAboveMelting: the surface temperature is at or above the
	// melting temperature; there is no ice shell, and no subsurface ocean.
	FlagSurfaceAboveMelting
	// FlagFrozenThrough: the conductive shell is at least as thick as the
	// H₂O layer: the layer is frozen solid.
	FlagFrozenThrough

	numFlags = iota
)

var flagNames = [numFlags]string{
	"out_of_domain",
	"mean_motion_from_kepler",
	"high_eccentricity",
	"no_three_layer_solution",
	"density_below_ice",
	"density_above_rock",
	"ice_unstable",
	"no_ice",
	"surface_above_melting",
	"frozen_through",
}

// Names returns the names of the set flags, in bit order (lower snake case,
// the spelling used in JSON outputs).
func (f Flag) Names() []string {
	var out []string
	for i := range numFlags {
		if f&(1<<i) != 0 {
			out = append(out, flagNames[i])
		}
	}
	return out
}

// String returns the set flags' names joined by "|", or "none".
func (f Flag) String() string {
	n := f.Names()
	if len(n) == 0 {
		return "none"
	}
	return strings.Join(n, "|")
}

// NumVolatiles is the number of entries in Volatiles.
const NumVolatiles = 10

var nan = math.NaN()

// invSqrtMolarMass holds 1/√M of each volatile (M in kg/mol), so that
// Evaluate's loop over volatiles needs no square root.
var invSqrtMolarMass = func() (r [NumVolatiles]float64) {
	for j, v := range Volatiles {
		r[j] = 1 / math.Sqrt(v.MolarMass)
	}
	return r
}()

// sanitize replaces inputs that are ±Inf or outside their physical domain by
// NaN (missing) and reports whether it did.
func sanitize(in *Inputs) bool {
	n := fix(&in.Mass, in.Mass > 0) +
		fix(&in.Radius, in.Radius > 0) +
		fix(&in.SemiMajorAxis, in.SemiMajorAxis > 0) +
		fix(&in.Eccentricity, in.Eccentricity >= 0 && in.Eccentricity < 1) +
		fix(&in.Obliquity, true) +
		fix(&in.Period, in.Period > 0) +
		fix(&in.K2Q, in.K2Q >= 0) +
		fix(&in.BondAlbedo, in.BondAlbedo >= 0 && in.BondAlbedo <= 1) +
		fix(&in.SurfaceTemperature, in.SurfaceTemperature > 0) +
		fix(&in.MomentOfInertia, in.MomentOfInertia > 0 && in.MomentOfInertia <= 2.0/3.0) +
		fix(&in.AtmosphereColumn, in.AtmosphereColumn >= 0) +
		fix(&in.PlanetMass, in.PlanetMass > 0) +
		fix(&in.StarDistance, in.StarDistance > 0) +
		fix(&in.StarLuminosity, in.StarLuminosity >= 0) +
		fix(&in.RockDensity, in.RockDensity > 0)
	return n > 0
}

// fix sets *v to NaN and returns 1 when *v is not NaN but is infinite or not
// inDomain; a NaN (missing) input is left alone.
func fix(v *float64, inDomain bool) int {
	x := *v
	if x != x || (inDomain && x-x == 0) { // NaN; or finite and in its domain
		return 0
	}
	*v = nan
	return 1
}

// Evaluate computes every derived quantity of one moon from in, under the
// model parameters opt, into out (overwriting every field). It does not
// allocate, so the Monte Carlo engine can call it once per sample.
//
// Order and dependencies (a NaN input makes NaN exactly the quantities
// listed after it, and their dependants):
//
//  1. MeanMotion: 2π/Period; with Period NaN, Kepler's third law from
//     SemiMajorAxis and PlanetMass (+ Mass if known), FlagMeanMotionFromKepler.
//  2. TidalPower: K2Q, MeanMotion, Radius, Eccentricity, Obliquity
//     (FlagHighEccentricity for e ≥ 0.3). TidalForce, TidalAcceleration:
//     PlanetMass, Mass (force only), Radius, SemiMajorAxis.
//  3. BulkDensity, SurfaceGravity, EscapeVelocity: Mass, Radius.
//  4. Interior: with MomentOfInertia, SolveThreeLayer with opt's densities;
//     without it, or with no physical solution (FlagNoThreeLayerSolution),
//     the two-component RockFraction from BulkDensity, RockDensity and
//     opt.IceDensity. Gives RockFraction and a provisional H₂O layer.
//     RockDensity is needed only by the two-component model; when the
//     three-layer model fails and RockDensity is NaN, opt.MantleDensity
//     stands in for it.
//  5. RadiogenicPower: RockFraction, Mass, opt.RockHeatProduction.
//  6. HeatFlux: TidalPower + RadiogenicPower over the surface (Radius).
//  7. EquilibriumTemperature: StarLuminosity, BondAlbedo, StarDistance.
//     SurfaceTemperature: the input when given, else from
//     EquilibriumTemperature and HeatFlux.
//  8. JeansParameter and Retained per volatile: Mass, Radius,
//     SurfaceTemperature (Retained is false when its JeansParameter is NaN).
//     RetentionTime: also AtmosphereColumn.
//  9. WaterLayerThickness: the provisional layer, set to 0 with
//     FlagIceUnstable when SurfaceTemperature ≥ opt.IceStabilityTemperature
//     (NaN when SurfaceTemperature is NaN).
//  10. IceShellThickness: ShellThickness from HeatFlux, SurfaceTemperature and
//     opt.MeltingTemperature, capped at WaterLayerThickness; OceanThickness,
//     Ocean and OceanQualifies from OceanThickness.
func Evaluate(in Inputs, opt Options, out *Derived) {
	evaluateNeed(&in, &opt, out, NeedAll)
}

// Need selects the optional outputs of EvaluateSome. Every other field of
// Derived is always computed.
type Need uint8

// Optional outputs of EvaluateSome.
const (
	// NeedJeans: JeansParameter (Retained is always computed).
	NeedJeans Need = 1 << iota
	// NeedRetentionTime: RetentionTime.
	NeedRetentionTime
	// NeedConductiveShell: ConductiveShellThickness in every case, not only
	// where the ice shell needs it.
	NeedConductiveShell

	// NeedAll is what Evaluate computes.
	NeedAll = NeedJeans | NeedRetentionTime | NeedConductiveShell
)

// EvaluateSome is Evaluate for a Monte Carlo loop: it reads *in and *opt
// without copying them, may overwrite *in (out-of-domain inputs become NaN, as
// in Evaluate), and computes the optional outputs only when need asks for
// them; the fields it skips hold unspecified values. Every computed field is
// bit for bit what Evaluate gives (one code path serves both).
func EvaluateSome(in *Inputs, opt *Options, out *Derived, need Need) {
	evaluateNeed(in, opt, out, need)
}

// suspect reports whether any input might be ±Inf or outside its domain: a
// cheap test (NaN passes, as sanitize leaves it alone) that lets the common
// all-valid case skip sanitize.
func suspect(in *Inputs) bool {
	inf := math.Inf(1)
	return in.Mass <= 0 || in.Mass >= inf ||
		in.Radius <= 0 || in.Radius >= inf ||
		in.SemiMajorAxis <= 0 || in.SemiMajorAxis >= inf ||
		in.Eccentricity < 0 || in.Eccentricity >= 1 ||
		in.Obliquity >= inf || in.Obliquity <= -inf ||
		in.Period <= 0 || in.Period >= inf ||
		in.K2Q < 0 || in.K2Q >= inf ||
		in.BondAlbedo < 0 || in.BondAlbedo > 1 ||
		in.SurfaceTemperature <= 0 || in.SurfaceTemperature >= inf ||
		in.MomentOfInertia <= 0 || in.MomentOfInertia > 2.0/3.0 ||
		in.AtmosphereColumn < 0 || in.AtmosphereColumn >= inf ||
		in.PlanetMass <= 0 || in.PlanetMass >= inf ||
		in.StarDistance <= 0 || in.StarDistance >= inf ||
		in.StarLuminosity < 0 || in.StarLuminosity >= inf ||
		in.RockDensity <= 0 || in.RockDensity >= inf
}

func evaluateNeed(inp *Inputs, opt *Options, out *Derived, need Need) {
	var fl Flag
	if suspect(inp) && sanitize(inp) {
		fl |= FlagOutOfDomain
	}
	in := inp

	// 1. Mean motion.
	n := nan
	if !math.IsNaN(in.Period) {
		n = MeanMotionFromPeriod(in.Period)
	} else {
		n = MeanMotionKepler(in.SemiMajorAxis, in.PlanetMass, in.Mass)
		if !math.IsNaN(n) {
			fl |= FlagMeanMotionFromKepler
		}
	}
	out.MeanMotion = n

	// 2. Tides.
	out.TidalPower = TidalPower(in.K2Q, n, in.Radius, in.Eccentricity, in.Obliquity)
	if in.Eccentricity >= MaxSmallEccentricity {
		fl |= FlagHighEccentricity
	}
	out.TidalAcceleration = TidalAcceleration(in.PlanetMass, in.Radius, in.SemiMajorAxis)
	out.TidalForce = in.Mass * out.TidalAcceleration

	// 3. Bulk properties.
	rho := BulkDensity(in.Mass, in.Radius)
	out.BulkDensity = rho
	g := SurfaceGravity(in.Mass, in.Radius)
	out.SurfaceGravity = g
	vesc := EscapeVelocity(in.Mass, in.Radius)
	out.EscapeVelocity = vesc

	// 4. Interior.
	out.Interior = InteriorNone
	out.CoreRadius, out.MantleRadius = nan, nan
	f, water := nan, nan
	twoComponent := !math.IsNaN(rho)
	if !math.IsNaN(rho) && !math.IsNaN(in.MomentOfInertia) {
		sol, ok := SolveThreeLayer(in.Radius, rho, in.MomentOfInertia, opt.CoreDensity, opt.MantleDensity, opt.WaterDensity)
		if ok {
			twoComponent = false
			out.Interior = InteriorThreeLayer
			f, water = sol.RockFraction, sol.WaterThickness
			out.CoreRadius, out.MantleRadius = sol.CoreRadius, sol.MantleRadius
		} else {
			fl |= FlagNoThreeLayerSolution
		}
	}
	rockDensity := in.RockDensity
	if math.IsNaN(rockDensity) && fl&FlagNoThreeLayerSolution != 0 {
		// The fallback of a failed three-layer solution uses the profile's
		// rock mantle as the rock end member when no rock density is given.
		rockDensity = opt.MantleDensity
	}
	if twoComponent && !math.IsNaN(rockDensity) {
		var ff Flag
		f, ff = RockFraction(rho, rockDensity, opt.IceDensity)
		fl |= ff
		water = TwoComponentWaterLayer(in.Radius, rho, f, rockDensity)
		if !math.IsNaN(water) {
			out.Interior = InteriorTwoComponent
			out.MantleRadius = in.Radius - water
		}
	}
	out.RockFraction = f

	// 5–6. Heat budget.
	out.RadiogenicPower = RadiogenicPower(f, in.Mass, opt.RockHeatProduction)
	q := HeatFlux(out.TidalPower+out.RadiogenicPower, in.Radius)
	out.HeatFlux = q

	// 7. Temperatures.
	out.EquilibriumTemperature = EquilibriumTemperature(in.StarLuminosity, in.BondAlbedo, in.StarDistance)
	ts := in.SurfaceTemperature
	if math.IsNaN(ts) {
		ts = SurfaceTemperature(out.EquilibriumTemperature, q)
	}
	out.SurfaceTemperature = ts

	// 8. Volatiles. λ_j = (G m / (k T R)) · M_j/N_A; retention v_esc > 6 v̄ ⇔ λ > 4·6²/π.
	base := nan
	if ts > 0 {
		base = G * in.Mass / (Boltzmann * Avogadro * ts * in.Radius)
	}
	column := in.AtmosphereColumn
	var nSurf, tau0, v0Scale float64 = nan, nan, nan
	if !math.IsNaN(column) && !math.IsNaN(base) {
		// τ = column / (μ Φ) with Φ = n v₀ (1+λ) e^{−λ} / (2√π), n = column g / (kT),
		// v₀ = √(2kT N_A / M).
		nSurf = SurfaceNumberDensity(column, g, ts)
		tau0 = 2 * math.SqrtPi
		v0Scale = math.Sqrt(2 * Boltzmann * Avogadro * ts)
	}
	if need&(NeedJeans|NeedRetentionTime) == 0 {
		for j := range NumVolatiles {
			lam := base * Volatiles[j].MolarMass
			out.Retained[j] = lam > retentionLambda
		}
	}
	for j := range NumVolatiles {
		if need&(NeedJeans|NeedRetentionTime) == 0 {
			break
		}
		mm := Volatiles[j].MolarMass
		lam := base * mm
		out.JeansParameter[j] = lam
		out.Retained[j] = lam > retentionLambda
		switch {
		case need&NeedRetentionTime == 0:
		case math.IsNaN(tau0):
			out.RetentionTime[j] = nan
		case column == 0:
			out.RetentionTime[j] = 0
		default:
			v0 := v0Scale * invSqrtMolarMass[j]
			massFlux := nSurf * (mm / Avogadro) * v0 * (1 + lam) * math.Exp(-lam) / tau0
			out.RetentionTime[j] = column / massFlux
		}
	}

	// 9. Water layer and ice stability.
	if !math.IsNaN(water) {
		if math.IsNaN(ts) {
			water = nan
		} else if ts >= opt.IceStabilityTemperature {
			fl |= FlagIceUnstable
			water = 0
		}
	}
	out.WaterLayerThickness = water

	// 10. Ice shell and ocean.
	tm := opt.MeltingTemperature
	// The shell's logarithm is needed only by the last two cases of the
	// switch below, unless the caller wants ConductiveShellThickness itself.
	d := nan
	if need&NeedConductiveShell != 0 || (water == water && water != 0 && !(ts >= tm)) {
		d = ShellThickness(q, ts, tm)
	}
	out.ConductiveShellThickness = d
	out.Ocean, out.OceanQualifies = false, false
	switch {
	case math.IsNaN(water):
		out.IceShellThickness, out.OceanThickness = nan, nan
	case water == 0:
		fl |= FlagNoIce
		out.IceShellThickness, out.OceanThickness = 0, 0
		if ts >= tm {
			fl |= FlagSurfaceAboveMelting
		}
	case ts >= tm:
		fl |= FlagSurfaceAboveMelting
		out.IceShellThickness, out.OceanThickness = 0, 0
	case math.IsNaN(d):
		out.IceShellThickness, out.OceanThickness = nan, nan
	default:
		out.IceShellThickness = math.Min(d, water)
		out.OceanThickness, out.Ocean = OceanThickness(water, d, ts, tm)
		if !out.Ocean {
			fl |= FlagFrozenThrough
		}
		out.OceanQualifies = out.Ocean && out.OceanThickness >= opt.MinOceanThickness
	}
	out.Flags = fl
}
