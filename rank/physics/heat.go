package physics

import "math"

// ChondriticHeatProduction is the present-day radiogenic heat production of CI
// chondritic material, W/kg, used as the default heating of a moon's rock.
//
// It is the sum over the long-lived heat-producing elements of concentration ×
// specific heat production: CI concentrations K 558 ppm, Rb 2.30 ppm,
// Sm 0.147 ppm, Th 29.4 ppb, U 8.1 ppb (Anders & Grevesse 1989, Geochim.
// Cosmochim. Acta 53, 197, Table 1) and the present-day heat production per
// kilogram of element K 3.387×10⁻³, Rb 0.01139, Sm 0.04595, Th 26.18,
// U 98.29 µW/kg (McDonough, Šrámek & Wipperfurth 2020, Geochem. Geophys.
// Geosyst. 21, e2019GC008865, eq. 2). The result, 3.49×10⁻¹² W/kg, lies within
// the 3.5–5×10⁻¹² W/kg range commonly adopted for chondritic rock in
// icy-satellite studies. CI material contains water and organics; ordinary
// chondrites give about 50 % more per kilogram. Present-day heating only: the
// rate was several times higher early in the Solar System's history.
const ChondriticHeatProduction = 1e-6 * (3.387e-3*558e-6 + 0.01139*2.30e-6 + 0.04595*0.147e-6 + 26.18*29.4e-9 + 98.29*8.1e-9)

// RadiogenicPower returns the present-day radiogenic power in W of a moon of
// mass m (kg) whose rock mass fraction is fRock (0..1), with rock heat
// production h (W/kg): Ė_rad = f_rock · m · h. The H₂O component is taken to
// produce no heat. Invalid inputs give NaN.
func RadiogenicPower(fRock, mass, h float64) float64 {
	if !(fRock >= 0 && fRock <= 1) || !(mass > 0) || !(h >= 0) {
		return nan
	}
	return fRock * mass * h
}

// HeatFlux returns the mean surface heat flux in W/m² of a body of radius R (m)
// losing power p (W) uniformly through its surface: q = p / (4πR²). It assumes
// a steady state in which the internal heat production escapes at the rate it
// is generated. Invalid inputs give NaN.
func HeatFlux(power, radius float64) float64 {
	if !(power >= 0) || !(radius > 0) {
		return nan
	}
	return power / (4 * math.Pi * radius * radius)
}
