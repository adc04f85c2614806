// Package physics holds tidesift's physical models: pure functions on SI
// float64 values that turn a moon's measured (or sampled) parameters into the
// derived quantities a habitability triage needs — tidal and radiogenic heat,
// surface temperature, escape velocity and volatile retention, interior
// structure and water inventory, and a conductive ice shell above a possible
// ocean. The results are triage aids built on simplified models; they support,
// and never replace, expert review.
//
// One file per topic, each formula with its published source in the doc
// comment:
//
//	orbit.go      mean motion from the period or Kepler's third law (CODATA 2018 G)
//	tides.go      tidal dissipation (Peale et al. 1979; Segatz et al. 1988; Wisdom 2004), tidal force
//	heat.go       chondritic radiogenic heating, surface heat flux
//	thermal.go    equilibrium and surface temperature, ice vapour pressure and sublimation
//	volatiles.go  escape velocity, thermal speeds, Jeans parameter and escape, retention rule
//	interior.go   two-component ice–rock mixture, three-layer core–mantle–H₂O model
//	shell.go      conductive ice shell with k = 651/T, ocean beneath it
//	model.go      Inputs, Options, Derived, flags and Evaluate, the whole chain in order
//	named.go      Derived under the ranking contract's JSON names (NaN → null)
//
// The method text that a user reads (package tidesift/rank/method) states the
// same formulas, constants and simplifications in prose.
//
// # Using Evaluate
//
// Evaluate fills a Derived from one set of Inputs under model Options. It does
// not allocate, so a Monte Carlo engine calls it once per sample with a reused
// Derived. Missing inputs are NaN and make NaN only the quantities that need
// them (Evaluate's comment lists the dependencies); inputs outside their
// physical domain, and validity limits crossed (e ≥ 0.3, no three-layer
// solution, unstable surface ice, a surface above melting, ...), are reported
// in Derived.Flags, never as a silent number.
//
// # Worked example
//
// An invented icy moon (mass 6.0×10²² kg, radius 1650 km, C/MR² = 0.34) on
// an orbit of a = 6.0×10⁸ m, e = 0.01 about an invented 1.6×10²⁷ kg planet,
// k2/Q = 0.003, Bond albedo 0.6, 7.0×10¹¹ m from a star of 3.0×10²⁶ W, with
// the period left out:
//
//	var d physics.Derived
//	physics.Evaluate(in, physics.DefaultOptions(), &d)
//
// gives n = 2.224×10⁻⁵ rad/s from Kepler's third law (flag
// mean_motion_from_kepler); a tidal power of (3/2)(0.003)(nR)⁵/G · 7e² =
// 3.14 TW and radiogenic heating of 0.197 TW from its rock fraction of 0.94
// (three-layer solution with the default densities); a heat flux of
// 0.0975 W/m²; T_eq = 96.3 K and T_s = 96.8 K; an H₂O layer of 110 km; a
// conductive shell of (651/0.0975) ln(273.15/96.8) = 6.9 km; and an ocean of
// 104 km beneath it. ExampleEvaluate runs exactly this case.
package physics
