package physics

import (
	"math"
	"strconv"
)

// Number is a float64 whose JSON form is null when it is NaN or ±Inf
// (encoding/json refuses those values), and the shortest decimal that
// round-trips otherwise.
type Number float64

// MarshalJSON implements json.Marshaler.
func (v Number) MarshalJSON() ([]byte, error) {
	f := float64(v)
	if math.IsNaN(f) || math.IsInf(f, 0) {
		return []byte("null"), nil
	}
	return strconv.AppendFloat(nil, f, 'g', -1, 64), nil
}

// Valid reports whether v is a finite number (false for NaN and ±Inf).
func (v Number) Valid() bool {
	f := float64(v)
	return !math.IsNaN(f) && !math.IsInf(f, 0)
}

// CentralValues are the derived quantities of one evaluation under the metric
// names of the ranking contract, for the "derived" object of
// `tidesift show NAME --format json` (values at the central inputs). The
// contract's metrics come first; the rest are extras. A quantity that could not
// be computed is null. Maps are keyed by volatile formula (Volatiles).
type CentralValues struct {
	TidalPower          Number            `json:"tidal_power_w"`
	RadiogenicPower     Number            `json:"radiogenic_power_w"`
	HeatFlux            Number            `json:"heat_flux_w_m2"`
	TidalForce          Number            `json:"tidal_force_n"`
	SurfaceTemperature  Number            `json:"surface_temperature_k"`
	EscapeVelocity      Number            `json:"escape_velocity_m_s"`
	WaterLayerThickness Number            `json:"water_layer_thickness_m"`
	IceShellThickness   Number            `json:"ice_shell_thickness_m"`
	OceanProbability    Number            `json:"ocean_probability"` // 1 or 0 at central values; null when not computable
	Retention           map[string]Number `json:"retention"`         // 1 retained, 0 lost, null unknown

	EquilibriumTemperature Number            `json:"equilibrium_temperature_k"`
	MeanMotion             Number            `json:"mean_motion_rad_s"`
	TidalAcceleration      Number            `json:"tidal_acceleration_m_s2"`
	SurfaceGravity         Number            `json:"surface_gravity_m_s2"`
	BulkDensity            Number            `json:"bulk_density_kg_m3"`
	Interior               string            `json:"interior_model"` // "three_layer", "two_component" or "none"
	RockFraction           Number            `json:"rock_fraction"`
	CoreRadius             Number            `json:"core_radius_m"`
	RockRadius             Number            `json:"rock_radius_m"`
	ConductiveShell        Number            `json:"conductive_shell_thickness_m"` // before capping at the H₂O layer; null when infinite
	OceanThickness         Number            `json:"ocean_thickness_m"`
	JeansParameter         map[string]Number `json:"jeans_parameter"`
	MeanThermalSpeed       map[string]Number `json:"mean_thermal_speed_m_s"`
	RetentionTimeLog10     map[string]Number `json:"retention_time_log10_s"` // log10 of the Jeans e-folding time in s; null without an atmospheric column
	Flags                  []string          `json:"flags"`
}

// Named returns the derived quantities under the ranking contract's metric
// names. It allocates (maps and a slice) and is meant for single evaluations
// such as the `show` command, not for the Monte Carlo loop.
func (d *Derived) Named() CentralValues {
	c := CentralValues{
		TidalPower:             Number(d.TidalPower),
		RadiogenicPower:        Number(d.RadiogenicPower),
		HeatFlux:               Number(d.HeatFlux),
		TidalForce:             Number(d.TidalForce),
		SurfaceTemperature:     Number(d.SurfaceTemperature),
		EscapeVelocity:         Number(d.EscapeVelocity),
		WaterLayerThickness:    Number(d.WaterLayerThickness),
		IceShellThickness:      Number(d.IceShellThickness),
		OceanProbability:       Number(nan),
		EquilibriumTemperature: Number(d.EquilibriumTemperature),
		MeanMotion:             Number(d.MeanMotion),
		TidalAcceleration:      Number(d.TidalAcceleration),
		SurfaceGravity:         Number(d.SurfaceGravity),
		BulkDensity:            Number(d.BulkDensity),
		Interior:               d.Interior.String(),
		RockFraction:           Number(d.RockFraction),
		CoreRadius:             Number(d.CoreRadius),
		RockRadius:             Number(d.MantleRadius),
		ConductiveShell:        Number(d.ConductiveShellThickness),
		OceanThickness:         Number(d.OceanThickness),
		Retention:              make(map[string]Number, NumVolatiles),
		JeansParameter:         make(map[string]Number, NumVolatiles),
		MeanThermalSpeed:       make(map[string]Number, NumVolatiles),
		RetentionTimeLog10:     make(map[string]Number, NumVolatiles),
		Flags:                  d.Flags.Names(),
	}
	if c.Flags == nil {
		c.Flags = []string{}
	}
	if !math.IsNaN(d.OceanThickness) {
		c.OceanProbability = 0
		if d.OceanQualifies {
			c.OceanProbability = 1
		}
	}
	for j, v := range Volatiles {
		lam := d.JeansParameter[j]
		c.JeansParameter[v.Formula] = Number(lam)
		c.MeanThermalSpeed[v.Formula] = Number(MeanThermalSpeed(d.SurfaceTemperature, v.MolarMass))
		r := Number(nan)
		if !math.IsNaN(lam) {
			r = 0
			if d.Retained[j] {
				r = 1
			}
		}
		c.Retention[v.Formula] = r
		c.RetentionTimeLog10[v.Formula] = Number(retentionLog10(d.RetentionTime[j], lam, d.SurfaceTemperature, d.SurfaceGravity, v.MolarMass))
	}
	return c
}

// retentionLog10 returns log10 of the Jeans e-folding time, computed in
// logarithms where the time itself overflows:
// τ = 2√π k T e^λ / (μ g v₀ (1+λ)).
func retentionLog10(tau, lam, t, g, molarMass float64) float64 {
	switch {
	case math.IsNaN(tau):
		return nan
	case tau == 0:
		return math.Inf(-1) // empty column: null
	case !math.IsInf(tau, 1):
		return math.Log10(tau)
	}
	mu := molarMass / Avogadro
	v0 := math.Sqrt(2 * Boltzmann * t / mu)
	return math.Log10(2*math.SqrtPi*Boltzmann*t/(mu*g*v0*(1+lam))) + lam/math.Ln10
}
