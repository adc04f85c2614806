// Package units parses unit strings of astronomical tables into a factor to SI
// and a physical dimension. It is a leaf package: it imports only the
// standard library.
//
// Spellings follow the IVOA VOUnits 1.0 Recommendation (2014) first: m, km,
// AU or au, pc, s, min, h, d, a and yr (the Julian year), K, g and kg, deg,
// rad, W, solMass, solRad, solLum, jupiterMass, jupiterRad, earthMass,
// earthRad. VOUnits has no Jupiter or Earth units of its own in every
// version, so the CDS catalogue spellings Mjup, Rjup, Mgeo, Rgeo, jovMass and
// geoMass are accepted too, as are the plain ASCII aliases Msun, Rsun, Lsun,
// Mearth, Rearth, days, hours, years, degrees and a few like them (Symbols
// lists them all).
//
// SI prefixes (da, h, k, M, G, T, P, E, Z, Y, d, c, m, u or µ, n, p, f, a, z,
// y) apply to m, g, s, K, W, J and N; k, M and G to a, yr and pc (kyr, Myr,
// Gpc); m and u to rad. Astronomical units, days, hours and degrees take no
// prefix. An exact symbol always wins over a prefixed reading, so "min" is a
// minute and "Mjup" a Jupiter mass.
//
// Grammar (a blend of VOUnits and the older CDS and FITS forms):
//
//	unit     = [scale [sep]] product
//	scale    = decimal (1.898E27) | "10" ("+"|"-") int (CDS: 10+3) | "10" ("**"|"^") int
//	product  = factor { ("." | "*" | " " | "/") factor }   "/" divides by the next factor only
//	factor   = symbol [exponent] | "(" product ")" [exponent]
//	exponent = int (m3, m-3, m+2) | "**" int | "^" int     int may be in parentheses
//
// so kg/m3, kg.m-3, kg m**-3, g/cm3, g.cm**-3, W/m2, W.m-2, mW/m**2 and
// 1.898E27kg are all understood. Fractional exponents are refused.
//
// The conversion constants (constants.go) follow IAU 2012 Resolution B2 (the
// au, exact), IAU 2015 Resolution B2 (the parsec) and B3 (nominal solar,
// Earth and Jupiter radii, luminosity and GM), and CODATA 2018 (G). Masses
// are nominal GM divided by the CODATA 2018 G, as IAU 2015 B3 recommends for
// converting its nominal GM values.
//
// Example:
//
//	u, err := units.Parse("earthMass")   // u.Factor ≈ 5.97217e24, u.Dim == units.Mass
//	km, _ := units.Parse("km")
//	err = units.Expect("mass", "km", km, units.Mass)
//	// "unit km is a length; mass wants a mass unit such as kg, earthMass"
package units
