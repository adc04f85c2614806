package physics

import (
	"math"
	"math/rand/v2"
	"testing"
)

// TestEvaluateSomeMatchesEvaluate draws random inputs, in and out of their
// domains and with missing (NaN) ones, and checks that EvaluateSome gives bit
// for bit Evaluate's values in every field it computes (fixed seed; common
// practice for an equivalence test of two code paths).
func TestEvaluateSomeMatchesEvaluate(t *testing.T) {
	r := rand.New(rand.NewPCG(1, 1))
	pick := func(typical float64) float64 {
		switch r.IntN(12) {
		case 0:
			return math.NaN()
		case 1:
			return math.Inf(1)
		case 2:
			return -typical
		case 3:
			return 0
		}
		return typical * math.Exp(r.NormFloat64())
	}
	same := func(a, b float64) bool { return math.Float64bits(a) == math.Float64bits(b) || (a != a && b != b) }
	opt := DefaultOptions()
	for i := range 20000 {
		in := Inputs{
			Mass: pick(1e22), Radius: pick(1.5e6), SemiMajorAxis: pick(6e8), Eccentricity: pick(0.01),
			Obliquity: pick(0.01), Period: pick(3e5), K2Q: pick(0.01), BondAlbedo: pick(0.5),
			SurfaceTemperature: pick(100), MomentOfInertia: pick(0.35), AtmosphereColumn: pick(10),
			PlanetMass: pick(2e27), StarDistance: pick(7e11), StarLuminosity: pick(3.8e26), RockDensity: pick(3300),
		}
		if r.IntN(3) == 0 {
			in.SurfaceTemperature = math.NaN()
		}
		var want, got Derived
		Evaluate(in, opt, &want)
		cp := in
		EvaluateSome(&cp, &opt, &got, 0)
		// The optional outputs are not compared; blank them on both sides.
		want.JeansParameter, got.JeansParameter = [NumVolatiles]float64{}, [NumVolatiles]float64{}
		want.RetentionTime, got.RetentionTime = [NumVolatiles]float64{}, [NumVolatiles]float64{}
		want.ConductiveShellThickness, got.ConductiveShellThickness = 0, 0
		for _, f := range [][2]float64{
			{want.MeanMotion, got.MeanMotion}, {want.TidalPower, got.TidalPower}, {want.RadiogenicPower, got.RadiogenicPower},
			{want.HeatFlux, got.HeatFlux}, {want.TidalForce, got.TidalForce}, {want.TidalAcceleration, got.TidalAcceleration},
			{want.EquilibriumTemperature, got.EquilibriumTemperature}, {want.SurfaceTemperature, got.SurfaceTemperature},
			{want.EscapeVelocity, got.EscapeVelocity}, {want.RockFraction, got.RockFraction},
			{want.WaterLayerThickness, got.WaterLayerThickness}, {want.IceShellThickness, got.IceShellThickness},
			{want.OceanThickness, got.OceanThickness}, {want.SurfaceGravity, got.SurfaceGravity},
			{want.BulkDensity, got.BulkDensity}, {want.CoreRadius, got.CoreRadius}, {want.MantleRadius, got.MantleRadius},
		} {
			if !same(f[0], f[1]) {
				t.Fatalf("case %d %+v: EvaluateSome differs from Evaluate:\n got %+v\nwant %+v", i, in, got, want)
			}
		}
		if got.Flags != want.Flags || got.Ocean != want.Ocean || got.OceanQualifies != want.OceanQualifies ||
			got.Retained != want.Retained || got.Interior != want.Interior {
			t.Fatalf("case %d %+v: EvaluateSome differs from Evaluate:\n got %+v\nwant %+v", i, in, got, want)
		}
		var all Derived
		cp = in
		EvaluateSome(&cp, &opt, &all, NeedAll)
		Evaluate(in, opt, &want)
		for j := range NumVolatiles {
			if !same(all.JeansParameter[j], want.JeansParameter[j]) || !same(all.RetentionTime[j], want.RetentionTime[j]) {
				t.Fatalf("case %d: NeedAll volatile %d differs", i, j)
			}
		}
		if !same(all.ConductiveShellThickness, want.ConductiveShellThickness) {
			t.Fatalf("case %d: NeedAll shell differs", i)
		}
	}
}
