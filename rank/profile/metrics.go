package profile

import (
	"math"
	"strings"

	"tidesift/rank/physics"
)

// Metric identifies a per-sample quantity a criterion scores.
type Metric uint8

// The metrics a criterion may name. The first eight are the contract's metric
// names (rank.Metrics); the others are further per-sample quantities.
const (
	MetricTidalPower Metric = iota
	MetricRadiogenicPower
	MetricHeatFlux
	MetricTidalForce
	MetricSurfaceTemperature
	MetricEscapeVelocity
	MetricWaterLayerThickness
	MetricIceShellThickness
	MetricOcean
	MetricOceanThickness
	MetricTidalAcceleration
	MetricEquilibriumTemperature
	MetricRockFraction
	MetricSurfaceGravity
	MetricBulkDensity
	MetricOceanShell
	MetricRetains // needs a volatile: "retains:N2"
	MetricJeans   // needs a volatile: "jeans:N2"
	numMetrics
)

// MetricInfo documents one metric name.
type MetricInfo struct {
	Name        string // as written in a profile; per-volatile names end in ":GAS"
	Unit        string // SI unit; "" for dimensionless, "0/1" for an indicator
	Description string
}

var metricInfo = [numMetrics]MetricInfo{
	{"tidal_power_w", "W", "tidal dissipation (eccentricity and obliquity tides)"},
	{"radiogenic_power_w", "W", "present-day radiogenic heating of the rock fraction"},
	{"heat_flux_w_m2", "W/m2", "surface heat flux from tidal and radiogenic power"},
	{"tidal_force_n", "N", "differential tidal force across the moon"},
	{"surface_temperature_k", "K", "mean surface temperature"},
	{"escape_velocity_m_s", "m/s", "surface escape velocity"},
	{"water_layer_thickness_m", "m", "H2O layer thickness (0 where surface ice is unstable)"},
	{"ice_shell_thickness_m", "m", "conductive ice shell thickness"},
	{"ocean", "0/1", "1 when an ocean at least min_ocean_thickness_m thick exists"},
	{"ocean_thickness_m", "m", "liquid layer thickness beneath the shell (0 when none)"},
	{"tidal_acceleration_m_s2", "m/s2", "differential tidal acceleration across the moon"},
	{"equilibrium_temperature_k", "K", "radiative equilibrium temperature"},
	{"rock_fraction", "", "rock mass fraction of the interior"},
	{"surface_gravity_m_s2", "m/s2", "surface gravity"},
	{"bulk_density_kg_m3", "kg/m3", "bulk density"},
	{"ocean_shell_thickness_m", "m", "ice shell thickness above a qualifying ocean (not computable, so scoring 0, where there is none)"},
	{"retains:GAS", "0/1", "1 when the escape velocity exceeds six mean thermal speeds of GAS"},
	{"jeans:GAS", "", "Jeans escape parameter of GAS at the surface"},
}

// Metrics lists every metric name a criterion may use, for help texts.
func Metrics() []MetricInfo { return append([]MetricInfo(nil), metricInfo[:]...) }

// metricNames lists the valid spellings for error messages, with the
// per-volatile families written out for every gas.
func metricNames() []string {
	var out []string
	for m := range MetricRetains {
		out = append(out, metricInfo[m].Name)
	}
	out = append(out, "retains:GAS", "jeans:GAS")
	return out
}

// VolatileNames returns the formulas accepted after "retains:" and "jeans:".
func VolatileNames() []string {
	out := make([]string, len(physics.Volatiles))
	for i, v := range physics.Volatiles {
		out[i] = v.Formula
	}
	return out
}

// parseMetric resolves a metric name; vol is the volatile index for the
// per-volatile families. ok is false for an unknown name; badGas is set when
// the family is known but the gas is not.
func parseMetric(s string) (m Metric, vol int, ok bool, badGas bool) {
	if fam, gas, found := strings.Cut(s, ":"); found {
		switch fam {
		case "retains":
			m = MetricRetains
		case "jeans":
			m = MetricJeans
		default:
			return 0, 0, false, false
		}
		for i, v := range physics.Volatiles {
			if v.Formula == gas {
				return m, i, true, false
			}
		}
		return m, 0, false, true
	}
	for i := range MetricRetains {
		if metricInfo[i].Name == s {
			return i, 0, true, false
		}
	}
	return 0, 0, false, false
}

func b2f(b bool) float64 {
	if b {
		return 1
	}
	return 0
}

// Value extracts the criterion's metric from one evaluation; NaN when the
// model could not compute it.
func (c *Criterion) Value(d *physics.Derived) float64 {
	switch c.metric {
	case MetricTidalPower:
		return d.TidalPower
	case MetricRadiogenicPower:
		return d.RadiogenicPower
	case MetricHeatFlux:
		return d.HeatFlux
	case MetricTidalForce:
		return d.TidalForce
	case MetricSurfaceTemperature:
		return d.SurfaceTemperature
	case MetricEscapeVelocity:
		return d.EscapeVelocity
	case MetricWaterLayerThickness:
		return d.WaterLayerThickness
	case MetricIceShellThickness:
		return d.IceShellThickness
	case MetricOcean:
		if math.IsNaN(d.OceanThickness) {
			return math.NaN()
		}
		return b2f(d.OceanQualifies)
	case MetricOceanThickness:
		return d.OceanThickness
	case MetricTidalAcceleration:
		return d.TidalAcceleration
	case MetricEquilibriumTemperature:
		return d.EquilibriumTemperature
	case MetricRockFraction:
		return d.RockFraction
	case MetricSurfaceGravity:
		return d.SurfaceGravity
	case MetricBulkDensity:
		return d.BulkDensity
	case MetricOceanShell:
		// Only a shell over an ocean counts: a body without ice has a
		// "shell" of 0 m, which a decreasing ramp would otherwise reward.
		if !d.OceanQualifies {
			return math.NaN()
		}
		return d.IceShellThickness
	case MetricRetains:
		if math.IsNaN(d.JeansParameter[c.volatile]) {
			return math.NaN()
		}
		return b2f(d.Retained[c.volatile])
	case MetricJeans:
		return d.JeansParameter[c.volatile]
	}
	return math.NaN()
}

// Transfer kinds.
const (
	TransferRamp    = "ramp"
	TransferLogRamp = "log_ramp"
	TransferWindow  = "window"
)

// TransferNames lists the transfer functions, for help texts and errors.
var TransferNames = []string{TransferRamp, TransferLogRamp, TransferWindow}

type transferKind uint8

const (
	tRamp transferKind = iota
	tLogRamp
	tWindow
)

// Apply is the transfer function: it maps a metric value to [0, 1]:
//
//	ramp      0 at Lo, 1 at Hi, linear between, clamped (Lo > Hi: decreasing)
//	log_ramp  the same on log10 of the value (Lo, Hi > 0; a value ≤ 0 counts as −∞)
//	window    1 on [Lo, Hi], falling linearly to 0 over Soft outside each edge
//
// NaN (the model could not compute the metric) maps to 0, so an unknown
// quantity never helps a target.
func (c *Criterion) Apply(x float64) float64 {
	if x != x {
		return 0
	}
	switch c.kind {
	case tLogRamp:
		// Outside [lo, hi] the answer needs no logarithm (most samples of
		// a wide prior fall there); x ≤ 0 counts as −∞.
		if c.Lo < c.Hi {
			if x <= c.Lo {
				return 0
			}
			if x >= c.Hi {
				return 1
			}
		} else {
			if x >= c.Lo {
				return 0
			}
			if x <= c.Hi {
				return 1
			}
		}
		return ramp(math.Log10(x), c.logLo, c.logHi)
	case tWindow:
		switch {
		case x < c.Lo:
			if c.Soft == 0 {
				return 0
			}
			return math.Max(0, 1-(c.Lo-x)/c.Soft)
		case x > c.Hi:
			if c.Soft == 0 {
				return 0
			}
			return math.Max(0, 1-(x-c.Hi)/c.Soft)
		}
		return 1
	}
	return ramp(x, c.Lo, c.Hi)
}

func ramp(x, lo, hi float64) float64 {
	t := (x - lo) / (hi - lo)
	switch {
	case t <= 0:
		return 0
	case t >= 1:
		return 1
	case t != t:
		return 0
	}
	return t
}

// Needs returns the optional outputs of physics.EvaluateSome that the
// criteria read (the Jeans parameters for "retains:" and "jeans:"), so that
// the Monte Carlo engine computes nothing the score does not use.
func (p *Profile) Needs() physics.Need {
	var n physics.Need
	for i := range p.Criteria {
		if m := p.Criteria[i].metric; m == MetricRetains || m == MetricJeans {
			n |= physics.NeedJeans
		}
	}
	return n
}
