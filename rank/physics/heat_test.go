package physics

import (
	"math"
	"testing"
)

func TestChondriticHeatProduction(t *testing.T) {
	// Worked by hand from Anders & Grevesse 1989 CI abundances and
	// McDonough et al. 2020 eq. 2 (see the constant's comment):
	// K 1.8899e-6, Rb 2.620e-8, Sm 6.75e-9, Th 7.697e-7, U 7.961e-7 µW/kg,
	// sum 3.4887e-6 µW/kg = 3.4887e-12 W/kg.
	approx(t, "H", ChondriticHeatProduction, 3.4887e-12, 1e-4)
	// Within the 3.5–5 pW/kg band commonly adopted for chondritic rock
	// (common practice), allowing for rounding.
	if ChondriticHeatProduction < 3.4e-12 || ChondriticHeatProduction > 5e-12 {
		t.Errorf("H = %g W/kg outside the chondritic band", ChondriticHeatProduction)
	}
}

func TestRadiogenicPowerAndFlux(t *testing.T) {
	cases := []struct {
		name    string
		f, m, h float64
		want    float64
	}{
		{"by hand", 0.5, 2e22, 4e-12, 4e10},
		{"no rock", 0, 2e22, 4e-12, 0},
		{"f > 1", 1.1, 2e22, 4e-12, math.NaN()},
		{"f NaN", math.NaN(), 2e22, 4e-12, math.NaN()},
		{"mass 0", 0.5, 0, 4e-12, math.NaN()},
		{"h negative", 0.5, 2e22, -1, math.NaN()},
	}
	for _, c := range cases {
		approx(t, c.name, RadiogenicPower(c.f, c.m, c.h), c.want, 1e-12)
	}
	// q = P / (4πR²): 4π × (1e6)² = 1.2566371e13 m², by hand.
	approx(t, "flux", HeatFlux(1.2566371e11, 1e6), 0.01, 1e-7)
	approx(t, "flux zero power", HeatFlux(0, 1e6), 0, 0)
	approx(t, "flux NaN power", HeatFlux(math.NaN(), 1e6), math.NaN(), 0)
	approx(t, "flux zero radius", HeatFlux(1, 0), math.NaN(), 0)
	approx(t, "flux negative power", HeatFlux(-1, 1e6), math.NaN(), 0)
}
