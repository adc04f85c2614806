package physics

import "math"

// Inputs are the quantities one evaluation of the model needs, in SI units.
// A missing optional input is NaN. Angles are in radians.
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
// between Monte Carlo samples.
type Options struct {
	IceDensity              float64 // kg/m³, H₂O end member of the two-component interior
	CoreDensity             float64 // kg/m³, metal core of the three-layer interior
	MantleDensity           float64 // kg/m³, rock mantle of the three-layer interior
	WaterDensity            float64 // kg/m³, H₂O layer of the three-layer interior
	RockHeatProduction      float64 // W/kg, present-day chondritic radiogenic heating of rock
	MeltingTemperature      float64 // K, base of the ice shell
	IceStabilityTemperature float64 // K, surface ice unstable above this
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
}

// Flag records validity warnings of one evaluation.
type Flag uint32

// NumVolatiles is the number of entries in Volatiles.
const NumVolatiles = 10

var nan = math.NaN()
