// Package uncertain turns catalog values with uncertainties into probability
// distributions that the Monte Carlo engine samples.
//
// Every distribution lives in its key's physical domain (schema.KeyInfo: mass
// and radius > 0, 0 ≤ e < 1, 0 ≤ albedo ≤ 1, ...) and a draw never leaves it:
// normal and split-normal errors are truncated to the domain by sampling the
// truncated distribution exactly (rejection with a capped number of tries, then
// inverse-CDF sampling, which needs no rejection at all).
//
// The mapping from a catalog Uncertainty (FromParam):
//
//	none or zero width     → Fixed (a point mass at the value)
//	symmetric σ            → normal N(value, σ²) truncated to the domain
//	asymmetric +σ/−σ       → split-normal with mode = value (Wallis 2014), truncated
//	range [min, max]       → uniform on [min, max] ∩ domain
//	factor ×/÷ f           → log-normal with median = value and σ_ln = ln f, truncated
//
// Profiles add log-uniform priors (for k2/Q, whose plausible values span
// decades) through New and Spec.
//
// A worked example:
//
//	info, _ := schema.LookupKey("eccentricity")
//	d := uncertain.FromParam(schema.Param{Key: "eccentricity", Value: 0.01,
//		Unc: schema.Uncertainty{Kind: schema.UncSymmetric, Sigma: 0.02}}, info)
//	d.Describe()  // "normal 0.01 ± 0.02 truncated to [0, 1)"
//	r := rand.New(rand.NewPCG(1, 1))
//	e := d.Sample(r) // always 0 ≤ e < 1
//
// The moments a Dist reports (Mean, Variance) are those of the truncated
// distribution actually sampled, from closed forms with their sources named
// beside each formula; the tests check them against sample moments.
package uncertain
