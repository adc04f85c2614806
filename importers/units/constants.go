package units

import "math"

// Conversion constants, in SI. Each names the published source it follows.
const (
	// AstronomicalUnit is the au in metres, exact by definition:
	// IAU 2012 Resolution B2.
	AstronomicalUnit = 149_597_870_700.0

	// Parsec is 648000/π au: IAU 2015 Resolution B2.
	Parsec = AstronomicalUnit * 648000 / math.Pi

	// G is the Newtonian constant of gravitation, m³ kg⁻¹ s⁻²: CODATA 2018
	// recommended value (Tiesinga et al. 2021, Rev. Mod. Phys. 93, 025010).
	G = 6.67430e-11

	// Nominal values of IAU 2015 Resolution B3 (Prša et al. 2016, AJ 152, 41).
	NominalSolarRadius        = 6.957e8      // R_sun, m
	NominalSolarLuminosity    = 3.828e26     // L_sun, W
	NominalSolarGM            = 1.3271244e20 // (GM)_sun, m³ s⁻²
	NominalEarthEquatorialR   = 6.3781e6     // R_E equatorial, m
	NominalEarthGM            = 3.986004e14  // (GM)_E, m³ s⁻²
	NominalJupiterEquatorialR = 7.1492e7     // R_J equatorial, m
	NominalJupiterGM          = 1.2668653e17 // (GM)_J, m³ s⁻²

	// Masses derived as nominal GM / G with G from CODATA 2018. IAU 2015 B3
	// gives GM, not mass, because G is known far less precisely than GM; these
	// masses therefore carry G's relative uncertainty (2.2e-5).
	SolarMass   = NominalSolarGM / G   // ≈ 1.98841e30 kg
	EarthMass   = NominalEarthGM / G   // ≈ 5.97217e24 kg
	JupiterMass = NominalJupiterGM / G // ≈ 1.89812e27 kg

	// Day is 86400 s (SI brochure, 9th edition, 2019, Table 8: non-SI units
	// accepted for use with the SI).
	Day = 86400.0
	// JulianYear is 365.25 d, the Julian year the IAU uses as its year unit;
	// IVOA VOUnits 1.0 defines both "a" and "yr" as this year.
	JulianYear = 365.25 * Day

	// Degree is π/180 rad (SI brochure, 9th edition, Table 8).
	Degree = math.Pi / 180
)
