package uncertain_test

import (
	"fmt"
	"math/rand/v2"

	"tidesift/rank/uncertain"
	"tidesift/schema"
)

func ExampleFromParam() {
	info, _ := schema.LookupKey("eccentricity")
	d := uncertain.FromParam(schema.Param{Key: "eccentricity", Value: 0.01,
		Unc: schema.Uncertainty{Kind: schema.UncSymmetric, Sigma: 0.02}}, info)
	fmt.Println(d.Describe())
	// Truncation at e = 0 moves the mean up from 0.01 to μ + σφ(α)/(1 − Φ(α)),
	// α = −0.5: 0.01 + 0.02 × 0.3521/0.6915 (JKB 1994, eq. 13.134).
	fmt.Printf("mean %.4f\n", d.Mean())
	r := rand.New(rand.NewPCG(1, 1))
	ok := true
	for range 1000 {
		ok = ok && info.Check(d.Sample(r)) == nil
	}
	fmt.Println("all draws in [0, 1):", ok)
	// Output:
	// normal 0.01 ± 0.02 truncated to [0, 1)
	// mean 0.0202
	// all draws in [0, 1): true
}
