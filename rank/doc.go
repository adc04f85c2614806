// Package rank ranks a catalog's moons for habitability science under a
// scoring profile, with Monte Carlo uncertainty.
//
// Run turns every moon's inputs into distributions (package uncertain; gaps
// filled from the profile's priors and marked assumed), draws joint samples,
// evaluates the physics (package physics) and the profile's composite score
// in each, and summarises: metric and score quantiles, the ocean probability
// and per-gas retention probabilities with Monte Carlo standard errors, the
// rank of every moon in every sample (median rank, rank interval, P(rank ≤
// k)), and each moon's drivers — the share of its score variance owed to each
// uncertain input (package sensitivity). Central evaluates one moon at its
// central values for `show`. MethodText states the procedure with sources.
//
//	prof, _ := profile.Load("ocean", nil)
//	res, err := rank.Run(ctx, catalog, prof, rank.Options{Samples: 10000, Seed: 1})
//	best := res.Targets[0] // best first; best.PTop.P is P(rank ≤ best.PTop.K)
//
// Result's JSON form is the contract of `tidesift rank --format json`.
// Reproducibility: the same catalog, profile, seed and sample count give
// byte-identical output for any Workers. Memory: one float32 cell per
// (moon, sample) — 400 MB for 10,000 × 10,000 — plus per-worker buffers of a
// few MB; the score matrix is reused in place for the ranks.
//
// The scores are triage aids built on simplified models; they support, and
// never replace, expert review.
package rank
