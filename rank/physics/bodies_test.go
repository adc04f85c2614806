package physics

import "math"

// Published solar-system values used as check data. Real bodies appear only in
// tests. Sources:
//
//   - fact sheets: NASA NSSDCA Planetary, Earth, Moon, Mars, Jupiter and
//     Jovian Satellite Fact Sheets (D. R. Williams, NASA GSFC). The numbers
//     below are as recalled from those sheets (from memory); they agree with
//     the rounded table values the sheets print.
//   - moments of inertia: Io 0.37824 (Anderson et al. 2001, J. Geophys. Res.
//     106, 32963); Europa 0.346 (Anderson et al. 1998, Science 281, 2019);
//     Ganymede 0.3115 (Anderson et al. 1996, Nature 384, 541); Moon 0.3929
//     (Williams et al. / Konopliv et al. lunar gravity analyses, as quoted
//     in issue 3; from memory).
//   - Io k2/Q = 0.015 and e = 0.0041 (Lainey et al. 2009, Nature 459, 957).
//   - Bond albedos: from memory of published photometry (Io 0.63, Europa 0.68,
//     Ganymede 0.43, Callisto 0.13, Moon 0.11); used only for surface
//     temperatures far from any threshold the tests depend on.
//   - Sun: IAU 2015 Resolution B3 nominal solar luminosity 3.828e26 W;
//     au = 149597870700 m (IAU 2012 Resolution B2).

const (
	day = 86400.0 // s
	km  = 1e3     // m

	solarLuminosity = 3.828e26       // W, IAU 2015 B3 nominal
	au              = 149597870700.0 // m, IAU 2012 B2

	jupiterMass     = 1898.13e24    // kg, NSSDCA Jupiter fact sheet (from memory)
	jupiterEqRadius = 71492 * km    // m, NSSDCA Jupiter fact sheet (1-bar equatorial)
	jupiterSunDist  = 778.57e6 * km // m, NSSDCA Jupiter fact sheet semi-major axis

	earthMass   = 5.9722e24 // kg, NSSDCA Earth fact sheet (from memory)
	earthRadius = 6371.0 * km
)

// body is one moon or planet with published parameters.
type body struct {
	name         string
	mass, radius float64 // kg, m
	a, period, e float64 // m, s, -
	albedo       float64 // Bond
	moi          float64 // C/MR²
	planetMass   float64 // kg
	starDist     float64 // m
}

var (
	ioMoon = body{"Io", 893.2e20, 1821.6 * km, 421.8e3 * km, 1.769 * day, 0.0041, 0.63, 0.37824, jupiterMass, jupiterSunDist}
	// Europa's e = 0.009, Ganymede's 0.001 and Callisto's 0.007 as printed on
	// the Jovian Satellite Fact Sheet.
	europa   = body{"Europa", 480.0e20, 1560.8 * km, 671.1e3 * km, 3.551 * day, 0.009, 0.68, 0.346, jupiterMass, jupiterSunDist}
	ganymede = body{"Ganymede", 1481.9e20, 2631.2 * km, 1070.4e3 * km, 7.155 * day, 0.001, 0.43, 0.3115, jupiterMass, jupiterSunDist}
	callisto = body{"Callisto", 1075.9e20, 2410.3 * km, 1882.7e3 * km, 16.689 * day, 0.007, 0.13, math.NaN(), jupiterMass, jupiterSunDist}
	moon     = body{"Moon", 0.07346e24, 1737.4 * km, 0.3844e6 * km, 27.3217 * day, 0.0549, 0.11, 0.3929, earthMass, au}
)

// inputs returns the model inputs of b with the given k2/Q and rock density;
// obliquity 0 (the Galilean satellites' obliquities are below 0.1°, which
// changes no result here), no measured surface temperature, no atmosphere.
func (b body) inputs(k2q, rockDensity float64) Inputs {
	return Inputs{
		Mass: b.mass, Radius: b.radius, SemiMajorAxis: b.a, Eccentricity: b.e,
		Obliquity: 0, Period: b.period, K2Q: k2q, BondAlbedo: b.albedo,
		SurfaceTemperature: math.NaN(), MomentOfInertia: b.moi,
		AtmosphereColumn: math.NaN(), PlanetMass: b.planetMass,
		StarDistance: b.starDist, StarLuminosity: solarLuminosity,
		RockDensity: rockDensity,
	}
}
