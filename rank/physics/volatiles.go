package physics

import "math"

// Boltzmann is the Boltzmann constant k_B, J/K (CODATA 2018; exact in the 2019 SI).
const Boltzmann = 1.380649e-23

// Avogadro is the Avogadro constant N_A, mol⁻¹ (CODATA 2018; exact in the 2019 SI).
const Avogadro = 6.02214076e23

// RetentionFactor is the rule of thumb for holding a gas over geological time:
// a body retains a volatile when its escape velocity exceeds about six times the
// gas's mean thermal speed at the exobase (common practice; no single
// published derivation: it is a rule of thumb that λ ≳ 46 keeps Jeans escape
// negligible over the age of the Solar System).
const RetentionFactor = 6

// Standard atomic weights used for the molar masses of Volatiles: the IUPAC
// abridged values (CIAAW 2021; Prohaska et al. 2022, Pure Appl. Chem. 94,
// 573), in g/mol.
const (
	atomicWeightH  = 1.0080
	atomicWeightHe = 4.0026
	atomicWeightC  = 12.011
	atomicWeightN  = 14.007
	atomicWeightO  = 15.999
	atomicWeightS  = 32.06
)

// Volatile is one gas whose retention tidesift assesses.
type Volatile struct {
	Formula   string  // chemical formula in ASCII, the key used in outputs ("H2O")
	Name      string  // common name
	MolarMass float64 // kg/mol, from the IUPAC standard atomic weights
}

// Indices into Volatiles, in table order.
const (
	VolatileH2 = iota
	VolatileHe
	VolatileH2O
	VolatileCH4
	VolatileNH3
	VolatileN2
	VolatileCO
	VolatileO2
	VolatileCO2
	VolatileSO2
)

// Volatiles lists the gases whose retention Evaluate assesses.
// Molar masses are sums of the IUPAC abridged standard atomic weights (CIAAW
// 2021), converted from g/mol to kg/mol.
var Volatiles = [NumVolatiles]Volatile{
	{"H2", "hydrogen", 2 * atomicWeightH * 1e-3},
	{"He", "helium", atomicWeightHe * 1e-3},
	{"H2O", "water", (2*atomicWeightH + atomicWeightO) * 1e-3},
	{"CH4", "methane", (atomicWeightC + 4*atomicWeightH) * 1e-3},
	{"NH3", "ammonia", (atomicWeightN + 3*atomicWeightH) * 1e-3},
	{"N2", "nitrogen", 2 * atomicWeightN * 1e-3},
	{"CO", "carbon monoxide", (atomicWeightC + atomicWeightO) * 1e-3},
	{"O2", "oxygen", 2 * atomicWeightO * 1e-3},
	{"CO2", "carbon dioxide", (atomicWeightC + 2*atomicWeightO) * 1e-3},
	{"SO2", "sulfur dioxide", (atomicWeightS + 2*atomicWeightO) * 1e-3},
}

// EscapeVelocity returns the surface escape velocity √(2 G m / R) in m/s of a
// body of mass m (kg) and radius R (m), for a non-rotating sphere (Newtonian
// mechanics). Invalid inputs give NaN.
func EscapeVelocity(mass, radius float64) float64 {
	if !(mass >= 0) || !(radius > 0) {
		return nan
	}
	return math.Sqrt(2 * G * mass / radius)
}

// SurfaceGravity returns G m / R² in m/s² for a body of mass m (kg) and radius
// R (m). Invalid inputs give NaN.
func SurfaceGravity(mass, radius float64) float64 {
	if !(mass >= 0) || !(radius > 0) {
		return nan
	}
	return G * mass / (radius * radius)
}

// MeanThermalSpeed returns the mean speed √(8 k T / (π μ)) in m/s of a
// Maxwell–Boltzmann gas at temperature T (K) whose molecules have mass
// μ = molarMass / N_A (molarMass in kg/mol). Invalid inputs give NaN.
func MeanThermalSpeed(t, molarMass float64) float64 {
	if !(t >= 0) || !(molarMass > 0) {
		return nan
	}
	return math.Sqrt(8 * Boltzmann * t * Avogadro / (math.Pi * molarMass))
}

// RMSThermalSpeed returns the root-mean-square speed √(3 k T / μ) in m/s of a
// Maxwell–Boltzmann gas at temperature T (K), molar mass in kg/mol. Invalid
// inputs give NaN.
func RMSThermalSpeed(t, molarMass float64) float64 {
	if !(t >= 0) || !(molarMass > 0) {
		return nan
	}
	return math.Sqrt(3 * Boltzmann * t * Avogadro / molarMass)
}

// JeansParameter returns the Jeans escape parameter λ = G m μ / (k T R), the
// ratio of gravitational binding energy to kT of a molecule of mass
// μ = molarMass / N_A at the exobase of a body of mass m (kg) and radius R (m)
// at temperature T (K) (Jeans 1925, The Dynamical Theory of Gases; Chamberlain
// & Hunten 1987, Theory of Planetary Atmospheres). tidesift takes the exobase
// to be the surface, appropriate for airless or tenuous atmospheres and an
// underestimate of escape for extended ones. Equivalently λ = (v_esc / v₀)²
// with v₀ = √(2kT/μ) the most probable speed. Invalid inputs give NaN.
func JeansParameter(mass, radius, t, molarMass float64) float64 {
	if !(mass >= 0) || !(radius > 0) || !(t > 0) || !(molarMass > 0) {
		return nan
	}
	return G * mass * molarMass / (Boltzmann * Avogadro * t * radius)
}

// Retained reports whether a gas of mean thermal speed vMean is held by a body
// of escape velocity vEsc under the rule of thumb vEsc > RetentionFactor ×
// vMean (common practice). In terms of the Jeans parameter the rule is
// λ > RetentionFactor² · 4/π ≈ 45.8, the form Evaluate uses. NaN inputs give
// false.
func Retained(vEsc, vMean float64) bool {
	return vEsc > RetentionFactor*vMean
}

// retentionLambda is the Jeans parameter equivalent of the retention rule:
// v_esc > f v_mean ⇔ v_esc² μ/(2kT) > f² · 8/(2π) = 4f²/π.
const retentionLambda = 4 * RetentionFactor * RetentionFactor / math.Pi

// JeansFlux returns the Jeans (thermal) escape flux in molecules m⁻² s⁻¹ from an
// exobase where the number density of the gas is nExo (m⁻³), its temperature T
// (K), its molar mass molarMass (kg/mol) and its Jeans parameter lambda:
//
//	Φ = n v₀ (1 + λ) e^{−λ} / (2√π),  v₀ = √(2kT/μ)
//
// (Jeans 1925; Hunten 1973, J. Atmos. Sci. 30, 1481; Chamberlain & Hunten
// 1987). It assumes a Maxwellian velocity distribution at the exobase, taken
// by tidesift to be the surface. Invalid inputs give NaN.
func JeansFlux(nExo, t, molarMass, lambda float64) float64 {
	if !(nExo >= 0) || !(t > 0) || !(molarMass > 0) || !(lambda >= 0) {
		return nan
	}
	v0 := math.Sqrt(2 * Boltzmann * t * Avogadro / molarMass)
	return nExo * v0 * (1 + lambda) * math.Exp(-lambda) / (2 * math.SqrtPi)
}

// JeansMassFlux returns the Jeans escape mass flux in kg m⁻² s⁻¹: JeansFlux
// times the molecular mass μ = molarMass / N_A.
func JeansMassFlux(nExo, t, molarMass, lambda float64) float64 {
	return JeansFlux(nExo, t, molarMass, lambda) * molarMass / Avogadro
}

// SurfaceNumberDensity returns the number density in m⁻³ at the base of an
// isothermal, hydrostatic atmosphere of column mass per area column (kg/m²) at
// temperature T (K) under surface gravity g (m/s²): n = p/(kT) with p = column·g
// (ideal gas, plane-parallel atmosphere, self-gravity of the gas neglected).
// Invalid inputs give NaN.
func SurfaceNumberDensity(column, gravity, t float64) float64 {
	if !(column >= 0) || !(gravity > 0) || !(t > 0) {
		return nan
	}
	return column * gravity / (Boltzmann * t)
}

// RetentionTime returns the time in s for Jeans escape at a mass flux massFlux
// (kg m⁻² s⁻¹) to remove an atmospheric column (kg/m²): τ = column / massFlux.
// Because the escape flux is proportional to the exobase density, which is
// proportional to the column in an isothermal atmosphere whose exobase is the
// surface, τ is the e-folding time of the column and does not depend on it;
// an empty column gives 0, a zero flux +Inf. Invalid inputs give NaN.
func RetentionTime(column, massFlux float64) float64 {
	if !(column >= 0) || !(massFlux >= 0) {
		return nan
	}
	if column == 0 {
		return 0
	}
	return column / massFlux
}
