package physics

import "math"

// IceConductivityCoefficient is the constant c of the thermal conductivity of
// ice Ih, k(T) = c/T, in W/m (Klinger 1980, Science 209, 271; Petrenko &
// Whitworth 1999, Physics of Ice, OUP), giving k ≈ 6.5 W m⁻¹ K⁻¹ at 100 K and
// 2.4 W m⁻¹ K⁻¹ at 273 K.
const IceConductivityCoefficient = 651

// WaterMeltingTemperature is the default melting temperature at the base of an
// ice shell, K: the 1-bar melting point of pure water ice (273.15 K). Pressure
// lowers it by up to about 10 K at the base of a shell 100 km thick (ice Ih
// phase boundary, Petrenko & Whitworth 1999); salts lower it further. Common
// practice.
const WaterMeltingTemperature = 273.15

// AmmoniaWaterEutectic is the ammonia–water eutectic (peritectic of ammonia
// dihydrate) temperature, ≈ 176 K (Kargel 1992, Icarus 100, 556; Desch et al.
// 2009, Icarus 202, 694), the lowest melting temperature a profile can set to
// model an ammonia-rich ocean.
const AmmoniaWaterEutectic = 176

// ShellThickness returns the thickness in m of a conductive ice shell with
// k(T) = 651/T (IceConductivityCoefficient) carrying a steady heat flux q
// (W/m²) from its base at the melting temperature tm (K) to its surface at ts
// (K): integrating q = k(T) dT/dz gives
//
//	d = (651 / q) ln(T_m / T_s)
//
// Conduction only (no solid-state convection, which would thin a thick shell's
// conductive lid), no internal heating in the shell, plane-parallel (d ≪ R).
// A surface at or above the melting temperature gives 0 (no shell); q = 0
// gives +Inf (the shell freezes through). Invalid inputs give NaN.
func ShellThickness(q, ts, tm float64) float64 {
	if !(q >= 0) || !(ts > 0) || !(tm > 0) || math.IsInf(ts, 0) || math.IsInf(tm, 0) {
		return nan
	}
	if ts >= tm {
		return 0
	}
	if q == 0 {
		return math.Inf(1)
	}
	return IceConductivityCoefficient / q * math.Log(tm/ts)
}

// OceanThickness returns the thickness in m of the liquid layer beneath a
// conductive ice shell of thickness shell (m) in an H₂O layer of thickness
// water (m), and whether there is one: an ocean exists when the surface is
// below the melting temperature (ts < tm, K) and the shell is thinner than the
// H₂O layer; its thickness is then water − shell, otherwise 0. Invalid inputs
// give NaN and false.
func OceanThickness(water, shell, ts, tm float64) (float64, bool) {
	if !(water >= 0) || !(shell >= 0) || !(ts > 0) || !(tm > 0) || math.IsInf(water, 0) {
		return nan, false
	}
	if ts >= tm || shell >= water {
		return 0, false
	}
	return water - shell, true
}
