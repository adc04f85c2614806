package physics

import "math"

// MaxSmallEccentricity is the eccentricity at and above which TidalPower's
// second-order expansion in e is no longer trustworthy; Evaluate raises
// FlagHighEccentricity there. The expansion of the eccentricity tide in powers
// of e (Peale, Cassen & Reynolds 1979; Segatz et al. 1988) drops terms of order
// e⁴, which reach tens of percent of the e² term near e ≈ 0.3 (Wisdom 2008,
// Icarus 193, 637, gives the closed form in e for comparison).
const MaxSmallEccentricity = 0.3

// K2QFrom returns k2/Q from the tidal Love number k2 and the tidal quality
// factor Q. Both must be positive and finite; otherwise the result is NaN.
func K2QFrom(k2, q float64) float64 {
	if !(k2 > 0) || !(q > 0) || math.IsInf(k2, 0) || math.IsInf(q, 0) {
		return nan
	}
	return k2 / q
}

// TidalPower returns the tidal dissipation in W of a synchronously rotating
// moon from its eccentricity and obliquity tides:
//
//	Ė = (3/2) (k2/Q) (n⁵ R⁵ / G) (7 e² + sin² θ)
//
// with k2/Q dimensionless, n the mean motion (rad/s), R the moon's radius (m),
// e the orbital eccentricity and θ the obliquity (rad). The eccentricity term
// is that of Peale, Cassen & Reynolds (1979, Science 203, 892) and Segatz et al.
// (1988, Icarus 75, 187); the obliquity term follows Wisdom (2004, Astron. J.
// 128, 484). Assumptions: synchronous rotation, a homogeneous body
// characterised by a single k2/Q, and small eccentricity (e ≪ 1; see
// MaxSmallEccentricity). The formula is evaluated for any e in [0, 1) but its
// result is unreliable for e ≥ MaxSmallEccentricity. Invalid inputs give NaN.
func TidalPower(k2q, n, radius, e, obliquity float64) float64 {
	if !(k2q >= 0) || !(n >= 0) || !(radius > 0) || !(e >= 0 && e < 1) || math.IsInf(obliquity, 0) || math.IsNaN(obliquity) {
		return nan
	}
	nr := n * radius
	nr2 := nr * nr
	s := math.Sin(obliquity)
	return 1.5 * k2q * nr2 * nr2 * nr / G * (7*e*e + s*s)
}

// TidalForce returns the differential (tidal) force in N that a planet of mass
// planetMass (kg) exerts across a moon of mass moonMass (kg) and radius R (m)
// at distance a (m):
//
//	ΔF = 2 G M_p m D / a³,  D = 2R,
//
// the first-order difference of the planet's pull between the near and far
// sides, taken over the moon's diameter (the leading term of the expansion of
// G M_p m [1/(a−R)² − 1/(a+R)²] for R ≪ a; common practice, e.g. Murray &
// Dermott 1999, Solar System Dynamics, ch. 4). Invalid inputs give NaN.
func TidalForce(planetMass, moonMass, radius, a float64) float64 {
	if !(moonMass > 0) {
		return nan
	}
	return moonMass * TidalAcceleration(planetMass, radius, a)
}

// TidalAcceleration returns the differential acceleration in m/s² across a
// moon of radius R (m) at distance a (m) from a planet of mass planetMass (kg):
// Δg = 2 G M_p D / a³ with D = 2R, the tidal force per unit mass (see
// TidalForce). Invalid inputs give NaN.
func TidalAcceleration(planetMass, radius, a float64) float64 {
	if !(planetMass > 0) || !(radius > 0) || !(a > 0) {
		return nan
	}
	return 2 * G * planetMass * (2 * radius) / (a * a * a)
}
