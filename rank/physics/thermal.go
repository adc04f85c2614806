package physics

import "math"

// StefanBoltzmann is the Stefan–Boltzmann constant σ, W m⁻² K⁻⁴ (CODATA 2018;
// exact in the 2019 SI, quoted to the ten digits CODATA gives).
const StefanBoltzmann = 5.670374419e-8

// EquilibriumTemperature returns the radiative equilibrium temperature in K of
// a body at distance d (m) from a star of luminosity L (W) with Bond albedo A:
//
//	T_eq = [L (1 − A) / (16 π σ d²)]^¼
//
// the global mean for a body that redistributes absorbed sunlight over its whole
// surface (fast rotator), with unit emissivity and no internal heat (the
// standard textbook radiative balance; common practice).
// The moon's distance from the star is taken to be its planet's. Eclipses by
// the planet and the planet's own thermal emission are neglected. Invalid
// inputs give NaN.
func EquilibriumTemperature(luminosity, albedo, d float64) float64 {
	if !(luminosity >= 0) || !(albedo >= 0 && albedo <= 1) || !(d > 0) || math.IsInf(luminosity, 0) {
		return nan
	}
	x := luminosity * (1 - albedo) / (16 * math.Pi * StefanBoltzmann * d * d)
	return math.Sqrt(math.Sqrt(x))
}

// SurfaceTemperature returns the mean surface temperature in K of a body of
// equilibrium temperature teq (K) that also radiates an internal heat flux q
// (W/m²): T_s = (T_eq⁴ + q/σ)^¼, the grey-body energy balance with unit
// emissivity and no atmosphere (no greenhouse warming). Invalid inputs give NaN.
func SurfaceTemperature(teq, q float64) float64 {
	if !(teq >= 0) || !(q >= 0) {
		return nan
	}
	t2 := teq * teq
	return math.Sqrt(math.Sqrt(t2*t2 + q/StefanBoltzmann))
}

// IceVapourPressure returns the saturation vapour pressure in Pa of hexagonal
// water ice at temperature T (K), from Murphy & Koop (2005, Q. J. R. Meteorol.
// Soc. 131, 1539, eq. 7), stated valid for T > 110 K; below that it is an
// extrapolation. Invalid T gives NaN.
func IceVapourPressure(t float64) float64 {
	if !(t > 0) || math.IsInf(t, 1) {
		return nan
	}
	return math.Exp(9.550426 - 5723.265/t + 3.53068*math.Log(t) - 0.00728332*t)
}

// IceSublimationRate returns the free-sublimation mass flux in kg m⁻² s⁻¹ of
// water ice into vacuum at temperature T (K), from the Hertz–Knudsen relation
// E = p_v(T) √(μ / (2π k T)) with unit sticking coefficient and no
// recondensation, μ the H₂O molecular mass and p_v from IceVapourPressure. It
// is an upper bound: a regolith cover and redeposition slow the loss. It
// supports the default of Options.IceStabilityTemperature. Invalid T gives NaN.
func IceSublimationRate(t float64) float64 {
	mu := Volatiles[VolatileH2O].MolarMass / Avogadro
	return IceVapourPressure(t) * math.Sqrt(mu/(2*math.Pi*Boltzmann*t))
}
