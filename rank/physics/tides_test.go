package physics

import (
	"math"
	"testing"
)

func TestTidalPowerIo(t *testing.T) {
	// Lainey et al. 2009 (Nature 459, 957): k2/Q = 0.015 from astrometry and
	// e = 0.0041, with their dissipation estimate 93 ± 19 TW. Io's radius and
	// period from the NSSDCA Jovian Satellite Fact Sheet (from memory).
	n := MeanMotionFromPeriod(ioMoon.period)
	got := TidalPower(0.015, n, ioMoon.radius, 0.0041, 0)
	approx(t, "Io tidal power", got, 93e12, 0.05)
}

func TestTidalPowerTable(t *testing.T) {
	n, r := 4e-5, 1.5e6
	// Worked by hand: (3/2)(0.01)(n R)⁵/G = 0.015 × 60⁵ / 6.6743e-11 ...
	// (n R = 60 m/s, 60⁵ = 7.776e8) = 1.74760e17 W, times (7e² + sin²θ).
	base := 0.015 * 7.776e8 / 6.67430e-11
	cases := []struct {
		name              string
		k2q, n, r, e, obl float64
		want              float64
	}{
		{"eccentricity only", 0.01, n, r, 0.01, 0, base * 7e-4},
		{"obliquity only", 0.01, n, r, 0, math.Pi / 6, base * 0.25},
		{"both", 0.01, n, r, 0.01, math.Pi / 6, base * (7e-4 + 0.25)},
		{"circular, zero obliquity", 0.01, n, r, 0, 0, 0},
		{"k2/Q zero", 0, n, r, 0.01, 0, 0},
		{"k2/Q NaN", math.NaN(), n, r, 0.01, 0, math.NaN()},
		{"k2/Q negative", -1, n, r, 0.01, 0, math.NaN()},
		{"e NaN", 0.01, n, r, math.NaN(), 0, math.NaN()},
		{"e 1", 0.01, n, r, 1, 0, math.NaN()},
		{"e negative", 0.01, n, r, -0.1, 0, math.NaN()},
		{"obliquity NaN", 0.01, n, r, 0.01, math.NaN(), math.NaN()},
		{"obliquity Inf", 0.01, n, r, 0.01, math.Inf(1), math.NaN()},
		{"radius 0", 0.01, n, 0, 0.01, 0, math.NaN()},
		{"n NaN", 0.01, math.NaN(), r, 0.01, 0, math.NaN()},
		{"k2/Q Inf", math.Inf(1), n, r, 0.01, 0, math.Inf(1)},
	}
	for _, c := range cases {
		approx(t, c.name, TidalPower(c.k2q, c.n, c.r, c.e, c.obl), c.want, 1e-9)
	}
}

func TestK2QFrom(t *testing.T) {
	approx(t, "0.3/100", K2QFrom(0.3, 100), 0.003, 1e-15)
	for _, c := range [][2]float64{{0, 100}, {0.3, 0}, {math.NaN(), 1}, {0.3, math.Inf(1)}, {-1, 10}} {
		approx(t, "invalid", K2QFrom(c[0], c[1]), math.NaN(), 0)
	}
}

func TestTidalForceGalileanOrdering(t *testing.T) {
	// Published masses, radii and semi-major axes (NSSDCA fact sheets, from
	// memory). The ordering holds: computed with these values,
	// ΔF/(4G) = M_p m R / a³ is Io 4.1e30, Ganymede 6.0e29, Europa 4.7e29,
	// Callisto 7.4e28 and the Moon 1.3e28 (kg² m⁻²), i.e. Io > Ganymede >
	// Europa > Callisto and the Moon about 5.5 times below Callisto.
	f := func(b body) float64 { return TidalForce(b.planetMass, b.mass, b.radius, b.a) }
	fi, fe, fg, fc, fm := f(ioMoon), f(europa), f(ganymede), f(callisto), f(moon)
	if !(fi > fg && fg > fe && fe > fc) {
		t.Errorf("ordering Io %.3g > Ganymede %.3g > Europa %.3g > Callisto %.3g does not hold", fi, fg, fe, fc)
	}
	if !(fm < fc/3) {
		t.Errorf("Moon %.3g not well below Callisto %.3g", fm, fc)
	}
	// Io by hand: 2 G M_J m_Io (2 R_Io) / a³ = 4 × 6.6743e-11 × 1.89813e27 ×
	// 8.932e22 × 1.8216e6 / (4.218e8)³ = 8.24505e46 / 7.50446e25 = 1.09869e21 N.
	approx(t, "Io tidal force", fi, 1.09869e21, 1e-4)
	approx(t, "Io tidal acceleration", TidalAcceleration(jupiterMass, ioMoon.radius, ioMoon.a), fi/ioMoon.mass, 1e-12)
}

func TestTidalForceSpecial(t *testing.T) {
	cases := []struct {
		name              string
		mp, m, r, a, want float64
	}{
		{"zero moon mass", 1e27, 0, 1e6, 1e9, math.NaN()},
		{"NaN planet", math.NaN(), 1e22, 1e6, 1e9, math.NaN()},
		{"zero distance", 1e27, 1e22, 1e6, 0, math.NaN()},
		{"Inf distance", 1e27, 1e22, 1e6, math.Inf(1), 0},
	}
	for _, c := range cases {
		approx(t, c.name, TidalForce(c.mp, c.m, c.r, c.a), c.want, 0)
	}
}

func TestDimensionalSanity(t *testing.T) {
	// n ∝ a^−1.5 (Kepler), so the eccentricity-tide power ∝ n⁵ ∝ a^−7.5, and the
	// tidal force ∝ a^−3 (common practice: scaling of the formulas).
	mp, m, r, e := 1.9e27, 8.9e22, 1.8e6, 0.004
	for _, a := range []float64{2e8, 4.2e8, 1e9} {
		p1 := TidalPower(0.01, MeanMotionKepler(a, mp, m), r, e, 0)
		p2 := TidalPower(0.01, MeanMotionKepler(2*a, mp, m), r, e, 0)
		approx(t, "power ratio", p1/p2, math.Pow(2, 7.5), 1e-12)
		approx(t, "force ratio", TidalForce(mp, m, r, a)/TidalForce(mp, m, r, 2*a), 8, 1e-12)
	}
	// The same scaling through Evaluate with the period missing.
	in := ioMoon.inputs(0.015, 3250)
	in.Period = math.NaN()
	var d1, d2 Derived
	Evaluate(in, DefaultOptions(), &d1)
	in.SemiMajorAxis *= 2
	Evaluate(in, DefaultOptions(), &d2)
	approx(t, "Evaluate power ratio", d1.TidalPower/d2.TidalPower, math.Pow(2, 7.5), 1e-12)
	approx(t, "Evaluate force ratio", d1.TidalForce/d2.TidalForce, 8, 1e-12)
}
