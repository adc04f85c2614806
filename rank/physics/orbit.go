package physics

import "math"

// G is the Newtonian constant of gravitation, m³ kg⁻¹ s⁻² (CODATA 2018
// recommended value, Tiesinga et al. 2021, Rev. Mod. Phys. 93, 025010).
const G = 6.67430e-11

// MeanMotionFromPeriod returns the mean motion n = 2π/P in rad/s of an orbit of
// period P seconds. P must be positive; otherwise the result is NaN.
func MeanMotionFromPeriod(period float64) float64 {
	if !(period > 0) {
		return nan
	}
	return 2 * math.Pi / period
}

// MeanMotionKepler returns the mean motion n = √(G (M_p + m) / a³) in rad/s
// from Kepler's third law for a moon of mass moonMass (kg) on an orbit of
// semi-major axis a (m) about a planet of mass planetMass (kg). It is the
// two-body result; perturbations by other moons and the planet's oblateness
// are neglected. A missing moon mass (NaN) is treated as negligible against the
// planet's, which is true to better than 10⁻⁴ for the large moons of the giant
// planets; invalid a or planet mass give NaN.
func MeanMotionKepler(a, planetMass, moonMass float64) float64 {
	if !(a > 0) || !(planetMass > 0) {
		return nan
	}
	mt := planetMass
	if moonMass > 0 {
		mt += moonMass
	}
	return math.Sqrt(G * mt / (a * a * a))
}
