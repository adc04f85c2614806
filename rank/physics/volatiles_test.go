package physics

import (
	"math"
	"testing"
)

func TestEscapeVelocityPublished(t *testing.T) {
	// NSSDCA fact sheets (from memory): mass, the radius the sheet uses for
	// its escape velocity, and the escape velocity it prints.
	cases := []struct {
		name         string
		mass, radius float64
		want         float64 // m/s
	}{
		{"Earth", earthMass, earthRadius, 11186},         // Earth fact sheet: 11.186 km/s, volumetric mean radius
		{"Moon", 0.07346e24, 1737.4 * km, 2380},          // Moon fact sheet: 2.38 km/s
		{"Mars", 0.64169e24, 3389.5 * km, 5027},          // Mars fact sheet: 5.027 km/s
		{"Jupiter", jupiterMass, jupiterEqRadius, 59500}, // Jupiter fact sheet: 59.5 km/s at the 1-bar equatorial radius
	}
	for _, c := range cases {
		approx(t, c.name, EscapeVelocity(c.mass, c.radius), c.want, 0.01)
	}
	approx(t, "mass 0", EscapeVelocity(0, 1e6), 0, 0)
	approx(t, "radius 0", EscapeVelocity(1e22, 0), math.NaN(), 0)
	approx(t, "mass NaN", EscapeVelocity(math.NaN(), 1e6), math.NaN(), 0)
}

func TestThermalSpeedsByHand(t *testing.T) {
	// N₂ at 300 K, worked by hand with R = k_B N_A = 8.314462618 J mol⁻¹ K⁻¹
	// (CODATA 2018) and M = 2 × 14.007 g/mol (IUPAC): v̄ = √(8RT/(πM)) =
	// √(19954.71 / 0.0880084) = 476.168 m/s; v_rms = √(3RT/M) = 516.834 m/s.
	approx(t, "N2 mean", MeanThermalSpeed(300, Volatiles[VolatileN2].MolarMass), 476.168, 1e-5)
	approx(t, "N2 rms", RMSThermalSpeed(300, Volatiles[VolatileN2].MolarMass), 516.834, 1e-5)
	// v_rms / v̄ = √(3π/8) for any gas (Maxwell–Boltzmann).
	approx(t, "rms/mean", RMSThermalSpeed(123, 0.05)/MeanThermalSpeed(123, 0.05), math.Sqrt(3*math.Pi/8), 1e-14)
	// SO₂/CO₂ mean-speed ratio at equal temperature: √(44.01/64.07) (the
	// issue's check, with M(SO₂) from the older S = 32.065); the IUPAC 2021
	// abridged S = 32.06 shifts the fourth digit, so 2e-4 relative.
	r := MeanThermalSpeed(150, Volatiles[VolatileSO2].MolarMass) / MeanThermalSpeed(150, Volatiles[VolatileCO2].MolarMass)
	approx(t, "SO2/CO2", r, math.Sqrt(44.01/64.07), 2e-4)
	approx(t, "T NaN", MeanThermalSpeed(math.NaN(), 0.03), math.NaN(), 0)
	approx(t, "M 0", MeanThermalSpeed(100, 0), math.NaN(), 0)
	approx(t, "T 0", MeanThermalSpeed(0, 0.03), 0, 0)
}

func TestVolatileTable(t *testing.T) {
	// Molar masses in g/mol from the IUPAC abridged standard atomic weights
	// (CIAAW 2021), summed by hand.
	want := map[string]float64{
		"H2": 2.016, "He": 4.0026, "H2O": 18.015, "CH4": 16.043, "NH3": 17.031,
		"N2": 28.014, "CO": 28.010, "O2": 31.998, "CO2": 44.009, "SO2": 64.058,
	}
	seen := map[string]bool{}
	for i, v := range Volatiles {
		w, ok := want[v.Formula]
		if !ok {
			t.Errorf("Volatiles[%d] = %q not expected", i, v.Formula)
			continue
		}
		seen[v.Formula] = true
		approx(t, v.Formula, v.MolarMass, w*1e-3, 1e-12)
		if v.Name == "" {
			t.Errorf("%s has no name", v.Formula)
		}
	}
	if len(seen) != len(want) {
		t.Errorf("table has %d distinct volatiles, want %d", len(seen), len(want))
	}
	if Volatiles[VolatileH2O].Formula != "H2O" || Volatiles[VolatileSO2].Formula != "SO2" || Volatiles[VolatileN2].Formula != "N2" {
		t.Error("index constants do not match the table")
	}
}

func TestJeansAndRetention(t *testing.T) {
	// λ = G m μ / (k T R) = v_esc² μ / (2 k T) (identity of the definitions).
	m, r, T := 1.5e23, 2.6e6, 110.0
	for _, v := range Volatiles {
		lam := JeansParameter(m, r, T, v.MolarMass)
		ve := EscapeVelocity(m, r)
		approx(t, v.Formula+" λ identity", lam, ve*ve*v.MolarMass/(2*Boltzmann*Avogadro*T), 1e-12)
		// The retention rule in λ form used by Evaluate is the v_esc > 6 v̄ rule.
		if got, want := lam > retentionLambda, Retained(ve, MeanThermalSpeed(T, v.MolarMass)); got != want {
			t.Errorf("%s: λ form %v, speed form %v", v.Formula, got, want)
		}
	}
	approx(t, "retention λ", retentionLambda, 144/math.Pi, 1e-15)
	// The Moon at 270 K (fact-sheet mass and radius; temperature from
	// T_eq with A = 0.11, common knowledge) cannot hold H₂O by the rule,
	// while Jupiter at 165 K holds even H₂ (common practice examples).
	ve := EscapeVelocity(0.07346e24, 1737.4*km)
	if Retained(ve, MeanThermalSpeed(270, Volatiles[VolatileH2O].MolarMass)) {
		t.Error("the Moon should not retain H2O at 270 K")
	}
	if !Retained(EscapeVelocity(jupiterMass, jupiterEqRadius), MeanThermalSpeed(165, Volatiles[VolatileH2].MolarMass)) {
		t.Error("Jupiter should retain H2")
	}
	if Retained(math.NaN(), 1) || Retained(1, math.NaN()) {
		t.Error("NaN must not count as retained")
	}
	approx(t, "λ T=0", JeansParameter(m, r, 0, 0.03), math.NaN(), 0)
}

func TestJeansFluxAndTimescale(t *testing.T) {
	// By hand for n = 1e12 m⁻³, T = 100 K, M = 0.028014 kg/mol, λ = 10:
	// v₀ = √(2RT/M) = √(1662.8925/0.028014) = 243.64 m/s;
	// Φ = 1e12 × 243.638 × 11 × 4.539993e-5 / 3.5449077 = 3.43232e10 m⁻² s⁻¹.
	approx(t, "flux", JeansFlux(1e12, 100, 0.028014, 10), 3.43232e10, 1e-5)
	approx(t, "mass flux", JeansMassFlux(1e12, 100, 0.028014, 10), 3.43232e10*0.028014/Avogadro, 1e-5)
	approx(t, "flux λ NaN", JeansFlux(1e12, 100, 0.03, math.NaN()), math.NaN(), 0)
	// n = column g / (kT): 1 kg/m² at g = 1 m/s², 100 K → 1/(1.380649e-21).
	approx(t, "surface density", SurfaceNumberDensity(1, 1, 100), 1/1.380649e-21, 1e-12)
	approx(t, "τ", RetentionTime(10, 2), 5, 1e-15)
	approx(t, "τ empty", RetentionTime(0, 0), 0, 0)
	approx(t, "τ no flux", RetentionTime(1, 0), math.Inf(1), 0)
	approx(t, "τ NaN", RetentionTime(math.NaN(), 1), math.NaN(), 0)
}
