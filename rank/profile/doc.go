// Package profile reads scoring profiles: TOML files that say what makes a
// moon a good target, which priors fill the inputs a catalog lacks, and the
// model parameters of the physics.
//
// A profile (the built-ins live in sampledata/profiles; `tidesift profile show
// NAME` prints one in full):
//
//	name = "mine"
//	description = "Thin-shelled ocean worlds"
//	top_k = 5                          # k of P(rank ≤ k)
//
//	[model]                            # optional; unset keys take physics.DefaultOptions()
//	melting_temperature_k = 176        # an ammonia–water ocean
//	min_ocean_thickness_m = 1000
//
//	[[criterion]]                      # one table per scored quantity
//	metric = "ocean"                   # per-sample indicator: 0 or 1
//	transfer = "ramp"                  # ramp | log_ramp | window
//	lo = 0
//	hi = 1
//	weight = 3                         # > 0; default 1
//
//	[[criterion]]
//	metric = "surface_temperature_k"
//	transfer = "window"
//	lo = 60                            # full score on [lo, hi] …
//	hi = 200
//	soft = 40                          # … fading to 0 over 40 K outside each edge
//
//	[priors]                           # SI units of each key
//	k2_q = { dist = "log-uniform", min = 1e-4, max = 0.1 }
//	bond_albedo = { dist = "uniform", min = 0.1, max = 0.8 }
//	rock_density = { dist = "normal", value = 3300, sigma = 250 }
//
// Metrics are evaluated per Monte Carlo sample: the contract's metric names
// (tidal_power_w, heat_flux_w_m2, ...), further quantities (ocean_thickness_m,
// rock_fraction, ...), the indicator "ocean" (1 when an ocean at least
// min_ocean_thickness_m thick exists), and the per-gas families "retains:GAS"
// (1 when the gas is retained by the six-thermal-speeds rule) and "jeans:GAS"
// (the Jeans parameter), GAS being a formula of physics.Volatiles ("N2").
// Because an indicator is 0 or 1 per sample, its mean over samples is a
// probability: weighting "ocean" makes the mean score track P(ocean).
//
// Transfers: ramp is 0 at lo and 1 at hi, linear between and clamped (lo > hi
// scores low values higher); log_ramp is the same on log10 of the value;
// window is 1 on [lo, hi] with linear edges of width soft. A metric the model
// could not compute in a sample (NaN) scores 0 there. The composite score of a
// sample is Σ wᵢ Tᵢ / Σ wᵢ, in [0, 1].
//
// Priors: dist is one of fixed (value), normal (value, sigma), split-normal
// (value, plus, minus), uniform (min, max), log-normal (value = median,
// factor), log-uniform (min, max); see package uncertain. Prior keys are the
// catalog keys plus rock_density. A prior only fills a missing input; it never
// overrides or changes a catalog value.
//
// Errors: Parse reports a syntax error or unknown key as *Error with line and
// column, and every semantic problem (unknown metric, transfer, gas,
// distribution or prior key; missing or invalid parameters) in an ErrorList,
// each naming its key and listing the valid choices:
//
//	mine.toml:11:1: criterion[2].metric: unknown metric "tidal_pwr" (valid: tidal_power_w, ...)
//
// Scores are triage aids built on simplified models; they support, and never
// replace, expert review.
package profile
