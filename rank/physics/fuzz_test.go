package physics

import (
	"math"
	"math/rand/v2"
	"testing"
)

// TestThreeLayerRandomRecovery forward-models many random three-layer bodies,
// including near-degenerate ones (tiny core, thin mantle, thin water), and
// checks that SolveThreeLayer recovers them (fixed seed; common practice for
// a solver's property test).
func TestThreeLayerRandomRecovery(t *testing.T) {
	r := rand.New(rand.NewPCG(1, 1))
	const R = 2e6
	n := 5000
	if testing.Short() {
		n = 500
	}
	for i := range n {
		rw := 900 + 200*r.Float64()
		rm := rw + 500 + 3000*r.Float64()
		rc := rm + 500 + 5000*r.Float64()
		y := 0.3 + 0.7*r.Float64()
		x := y * r.Float64()
		switch i % 5 { // push some cases to the edges
		case 1:
			x = y * 1e-3 * r.Float64()
		case 2:
			y = 1 - 1e-4*r.Float64()
		case 3:
			x = y * (1 - 1e-4*r.Float64())
		}
		rho, moi := ThreeLayerForward(R, x*R, y*R, rc, rm, rw)
		sol, ok := SolveThreeLayer(R, rho, moi, rc, rm, rw)
		if !ok {
			t.Fatalf("case %d (x=%g y=%g ρ=%g,%g,%g): no solution", i, x, y, rc, rm, rw)
		}
		// The mantle radius is well conditioned except when the mantle is a
		// film over the core (dg/dy = 5 a y² (y² − x²) → 0); the core radius
		// of a tiny core is not (dx/dy ∝ 1/x²). Check radii to 1 cm and the
		// solution through the density and moment of inertia it reproduces.
		if math.Abs(sol.MantleRadius-y*R) > 1e-2 {
			t.Fatalf("case %d: mantle %.6f km, want %.6f km (x=%g y=%g ρ=%g,%g,%g)", i, sol.MantleRadius/1e3, y*R/1e3, x, y, rc, rm, rw)
		}
		rho2, moi2 := ThreeLayerForward(R, sol.CoreRadius, sol.MantleRadius, rc, rm, rw)
		if math.Abs(rho2-rho) > 1e-9*rho || math.Abs(moi2-moi) > 1e-12 {
			t.Fatalf("case %d: forward of solution gives ρ %g (want %g), C/MR² %g (want %g); x %g (want %g), y %.15g (want %.15g)", i, rho2, rho, moi2, moi, sol.CoreRadius/R, x, sol.MantleRadius/R, y)
		}
	}
}

// FuzzEvaluate checks that Evaluate never panics and that its outputs keep
// their invariants for arbitrary inputs.
func FuzzEvaluate(f *testing.F) {
	f.Add(4.8e22, 1.56e6, 6.7e8, 0.009, 0.0, 3.07e5, 0.0025, 0.68, math.NaN(), 0.346, math.NaN(), 1.9e27, 7.8e11, 3.8e26, 3250.0)
	f.Add(0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0)
	f.Add(math.Inf(1), math.Inf(-1), math.NaN(), 2.0, 1e300, -1.0, 1e-300, 0.5, 5.0, 0.66, 1.0, 1e30, 1e-10, 1e40, 1e5)
	f.Add(1e20, 2e5, 1e8, 0.5, 1.0, math.NaN(), 0.1, 0.1, 300.0, 0.2, 1e4, 1e26, 1e11, 1e26, 2500.0)
	f.Fuzz(func(t *testing.T, mass, radius, a, e, obl, period, k2q, albedo, ts, moi, col, mp, dist, lum, rock float64) {
		in := Inputs{mass, radius, a, e, obl, period, k2q, albedo, ts, moi, col, mp, dist, lum, rock}
		var d Derived
		Evaluate(in, DefaultOptions(), &d)
		if !(d.RockFraction >= 0 && d.RockFraction <= 1) && !math.IsNaN(d.RockFraction) {
			t.Errorf("rock fraction %g", d.RockFraction)
		}
		if d.WaterLayerThickness < 0 || d.IceShellThickness < 0 || d.OceanThickness < 0 {
			t.Errorf("negative thickness: water %g shell %g ocean %g", d.WaterLayerThickness, d.IceShellThickness, d.OceanThickness)
		}
		if d.Ocean {
			if !(d.OceanThickness > 0) || math.Abs(d.IceShellThickness+d.OceanThickness-d.WaterLayerThickness) > 1e-9*d.WaterLayerThickness {
				t.Errorf("ocean %g + shell %g ≠ water %g", d.OceanThickness, d.IceShellThickness, d.WaterLayerThickness)
			}
		}
		if d.OceanQualifies && !d.Ocean {
			t.Error("qualifying ocean that does not exist")
		}
		if d.IceShellThickness > d.WaterLayerThickness {
			t.Errorf("shell %g thicker than water %g", d.IceShellThickness, d.WaterLayerThickness)
		}
		for j := range NumVolatiles {
			if d.Retained[j] && !(d.JeansParameter[j] > retentionLambda) {
				t.Errorf("%s retained with λ = %g", Volatiles[j].Formula, d.JeansParameter[j])
			}
		}
		if _, err := jsonMarshal(d.Named()); err != nil {
			t.Errorf("JSON: %v", err)
		}
	})
}
