package physics

import (
	"math"
	"testing"
)

func TestShellThickness(t *testing.T) {
	cases := []struct {
		name      string
		q, ts, tm float64
		want      float64
	}{
		// Worked by hand: (651 / 0.05) ln(273.15/100) = 13020 × 1.004851 = 13083.16 m.
		{"worked example", 0.05, 100, 273.15, 13083.16},
		// Ammonia–water eutectic base (176 K): 651/0.01 × ln(1.76) = 65100 × 0.565314 = 36801.9 m.
		{"ammonia", 0.01, 100, AmmoniaWaterEutectic, 36801.9},
		{"surface at melting", 0.05, 273.15, 273.15, 0},
		{"surface above melting", 0.05, 300, 273.15, 0},
		{"no heat flux", 0, 100, 273.15, math.Inf(1)},
		{"q NaN", math.NaN(), 100, 273.15, math.NaN()},
		{"q negative", -0.1, 100, 273.15, math.NaN()},
		{"ts 0", 0.05, 0, 273.15, math.NaN()},
		{"ts NaN", 0.05, math.NaN(), 273.15, math.NaN()},
	}
	for _, c := range cases {
		approx(t, c.name, ShellThickness(c.q, c.ts, c.tm), c.want, 1e-6)
	}
}

func TestOceanThickness(t *testing.T) {
	cases := []struct {
		name                 string
		water, shell, ts, tm float64
		want                 float64
		ok                   bool
	}{
		{"ocean", 100e3, 20e3, 100, 273.15, 80e3, true},
		{"frozen through", 100e3, 120e3, 100, 273.15, 0, false},
		{"exactly frozen", 100e3, 100e3, 100, 273.15, 0, false},
		{"no water", 0, 20e3, 100, 273.15, 0, false},
		{"warm surface", 100e3, 0, 280, 273.15, 0, false},
		{"infinite shell", 100e3, math.Inf(1), 100, 273.15, 0, false},
		{"water NaN", math.NaN(), 20e3, 100, 273.15, math.NaN(), false},
	}
	for _, c := range cases {
		got, ok := OceanThickness(c.water, c.shell, c.ts, c.tm)
		approx(t, c.name, got, c.want, 1e-12)
		if ok != c.ok {
			t.Errorf("%s: exists %v, want %v", c.name, ok, c.ok)
		}
	}
}
