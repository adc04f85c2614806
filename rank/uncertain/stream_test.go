package uncertain

import (
	"math"
	"math/rand/v2"
	"testing"
)

// TestStreamMatchesRand: Stream's raw, uniform and normal draws equal those
// of math/rand/v2's PCG and Rand seeded alike, bit for bit, over enough draws
// to pass through the ziggurat's wedges and its tail many times.
func TestStreamMatchesRand(t *testing.T) {
	for _, seed := range [][2]uint64{{1, 2}, {0, 0}, {0xdeadbeef, 42}} {
		r := rand.New(rand.NewPCG(seed[0], seed[1]))
		s := NewStream()
		s.Seed(seed[0], seed[1])
		n := 2_000_000
		if testing.Short() {
			n = 200_000
		}
		for i := range n {
			var a, b float64
			switch i % 3 {
			case 0:
				a, b = r.NormFloat64(), s.NormFloat64()
			case 1:
				a, b = r.Float64(), s.Float64()
			default:
				a, b = float64(r.Uint64()>>11), float64(s.Uint64()>>11)
			}
			if math.Float64bits(a) != math.Float64bits(b) {
				t.Fatalf("seed %v draw %d: Stream %v, rand %v", seed, i, b, a)
			}
		}
	}
}

// TestFillFromMatchesFill: FillFrom draws exactly what Fill draws from a
// rand.Rand over an equally seeded rand.PCG, and leaves the stream in the
// same state.
func TestFillFromMatchesFill(t *testing.T) {
	mass, ecc := key(t, "mass"), key(t, "eccentricity")
	for _, d := range []Dist{
		mk(t)(NewNormal(1, 0.5, mass)), mk(t)(NewNormal(0.95, 0.1, ecc)), mk(t)(NewNormal(-3, 1, mass)),
		mk(t)(NewNormal(0.02, 0.05, ecc)), mk(t)(NewSplitNormal(0.1, 0.2, 0.05, ecc)),
		mk(t)(NewLogNormal(0.5, 3, ecc)), mk(t)(NewLogNormal(1e22, 2, mass)), mk(t)(NewUniform(0, 1, ecc)),
		mk(t)(NewLogUniform(1e-4, 0.1, ecc)), NewFixed(3),
	} {
		r := rand.New(rand.NewPCG(3, 4))
		s := NewStream()
		s.Seed(3, 4)
		want, got := make([]float64, 20000), make([]float64, 20000)
		d.Fill(r, want)
		FillFrom(d, s, got)
		for i := range want {
			if math.Float64bits(want[i]) != math.Float64bits(got[i]) {
				t.Fatalf("%s: draw %d: FillFrom %v, Fill %v", d.Describe(), i, got[i], want[i])
			}
		}
		if a, b := r.Uint64(), s.Uint64(); a != b {
			t.Fatalf("%s: generator states differ after the fill", d.Describe())
		}
	}
}

func BenchmarkFillNormal(b *testing.B) {
	d := mk(b)(NewNormal(1, 0.5, key(b, "mass")))
	r := rand.New(rand.NewPCG(1, 2))
	s := NewStream()
	dst := make([]float64, 1024)
	b.Run("Fill", func(b *testing.B) {
		for range b.N {
			d.Fill(r, dst)
		}
	})
	b.Run("FillFrom", func(b *testing.B) {
		for range b.N {
			FillFrom(d, s, dst)
		}
	})
}
