package physics

import (
	"math"
	"testing"
)

func TestMeanMotion(t *testing.T) {
	cases := []struct {
		name string
		got  float64
		want float64
		rel  float64
	}{
		// n = 2π / P, worked by hand for P = 1 day: 7.2722052e-5 rad/s.
		{"period 1 d", MeanMotionFromPeriod(day), 7.2722052e-5, 1e-7},
		// Kepler's third law must reproduce Io's fact-sheet period (1.769 d)
		// from its fact-sheet semi-major axis and Jupiter's mass (NSSDCA,
		// from memory) to the 0.1 % the rounded values allow.
		{"Io Kepler vs period", MeanMotionKepler(ioMoon.a, jupiterMass, ioMoon.mass), MeanMotionFromPeriod(ioMoon.period), 1e-3},
		// The Moon: 27.3217 d sidereal from a = 384400 km and the Earth–Moon
		// masses (NSSDCA Moon fact sheet); the mean distance differs from the
		// osculating semi-major axis, so allow 0.5 %.
		{"Moon Kepler vs period", MeanMotionKepler(moon.a, earthMass, moon.mass), MeanMotionFromPeriod(moon.period), 5e-3},
		{"moon mass unknown", MeanMotionKepler(1e9, 1e27, math.NaN()), math.Sqrt(G * 1e27 / 1e27), 1e-12},
		{"period 0", MeanMotionFromPeriod(0), math.NaN(), 0},
		{"period NaN", MeanMotionFromPeriod(math.NaN()), math.NaN(), 0},
		{"period -1", MeanMotionFromPeriod(-1), math.NaN(), 0},
		{"period +Inf", MeanMotionFromPeriod(math.Inf(1)), 0, 0},
		{"a 0", MeanMotionKepler(0, 1e27, 1e22), math.NaN(), 0},
		{"planet mass NaN", MeanMotionKepler(1e9, math.NaN(), 1e22), math.NaN(), 0},
	}
	for _, c := range cases {
		approx(t, c.name, c.got, c.want, c.rel)
	}
}
