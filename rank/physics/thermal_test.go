package physics

import (
	"math"
	"testing"
)

func TestEquilibriumTemperatureEarth(t *testing.T) {
	// Textbook worked example: the Earth with Bond albedo 0.3 at 1 au has
	// T_eq ≈ 255 K (IAU 2015 nominal solar luminosity, IAU 2012 au).
	approx(t, "Earth T_eq", EquilibriumTemperature(solarLuminosity, 0.3, au), 255, 0.005)
}

func TestEquilibriumTemperatureScaling(t *testing.T) {
	// T_eq ∝ d^−½ and ∝ (1−A)^¼ (from the formula).
	t1 := EquilibriumTemperature(solarLuminosity, 0.2, au)
	approx(t, "4× distance halves T", EquilibriumTemperature(solarLuminosity, 0.2, 4*au), t1/2, 1e-12)
	approx(t, "A=1", EquilibriumTemperature(solarLuminosity, 1, au), 0, 0)
	approx(t, "L=0", EquilibriumTemperature(0, 0.3, au), 0, 0)
	approx(t, "A>1", EquilibriumTemperature(solarLuminosity, 1.2, au), math.NaN(), 0)
	approx(t, "d=0", EquilibriumTemperature(solarLuminosity, 0.3, 0), math.NaN(), 0)
	approx(t, "L NaN", EquilibriumTemperature(math.NaN(), 0.3, au), math.NaN(), 0)
	approx(t, "L Inf", EquilibriumTemperature(math.Inf(1), 0.3, au), math.NaN(), 0)
}

func TestSurfaceTemperature(t *testing.T) {
	// By hand: T_eq = 0 and q = σ × 100⁴ gives exactly 100 K; T_eq = 100 K and
	// q = σ × (2 − 1) × 100⁴ gives 100 × 2^¼ = 118.9207 K.
	approx(t, "internal only", SurfaceTemperature(0, StefanBoltzmann*1e8), 100, 1e-12)
	approx(t, "both", SurfaceTemperature(100, StefanBoltzmann*1e8), 118.9207115, 1e-9)
	approx(t, "no internal heat", SurfaceTemperature(90, 0), 90, 1e-15)
	approx(t, "q NaN", SurfaceTemperature(90, math.NaN()), math.NaN(), 0)
	approx(t, "q negative", SurfaceTemperature(90, -1), math.NaN(), 0)
}

func TestIceSublimation(t *testing.T) {
	// Murphy & Koop 2005 (Q. J. R. Meteorol. Soc. 131, 1539) give 611.657 Pa
	// at the triple point 273.16 K from their eq. 7 (their Table 2 check
	// value is 611.657 Pa at 273.16 K).
	approx(t, "p_v(273.16 K)", IceVapourPressure(273.16), 611.657, 1e-3)
	// The default ice-stability temperature: free sublimation removes of the
	// order of half a kilometre of ice (density 930) in 4.5 Gyr at 125 K,
	// and less than a metre at the classic 110 K limit (Watson, Murray &
	// Brown 1961; Vasavada et al. 1999; from memory).
	const age = 4.5e9 * 365.25 * day
	loss := func(T float64) float64 { return IceSublimationRate(T) * age / 930 }
	opt := DefaultOptions()
	if l := loss(opt.IceStabilityTemperature); l < 200 || l > 1000 {
		t.Errorf("loss at %g K = %.3g m, want a few hundred metres", opt.IceStabilityTemperature, l)
	}
	if l := loss(110); l > 1 {
		t.Errorf("loss at 110 K = %.3g m, want under a metre", l)
	}
	approx(t, "p_v NaN", IceVapourPressure(math.NaN()), math.NaN(), 0)
	approx(t, "p_v 0 K", IceVapourPressure(0), math.NaN(), 0)
}
