// Package sampledata holds tidesift's embedded, invented sample data: the demo
// catalog that `tidesift demo` imports, and the built-in scoring profiles.
//
// Everything here is made up. The demo scenario has two invented systems:
//
//   - Velmira, a Sun-like star, with the cold giant planet Velmira b at 5.6 AU and
//     eight moons of different kinds: Varkesh (volcanic, tidally heated by a
//     resonant eccentricity), Ilmeth (an ice-covered ocean candidate with a
//     moment of inertia), Korvanne (a large ice–rock moon), Pellisk (a small moon
//     with active plumes), Dusmere (a cold, dead, rocky moon), Otharo (a captured
//     moon on an inclined, eccentric orbit with a large obliquity), Halvane (a
//     thick nitrogen atmosphere) and Quennet (distant and cold). All but two
//     have an (invented) obliquity; Dusmere and Quennet have none, so a
//     ranking fills theirs from the profile's prior and marks them assumed;
//   - Teodra, a cooler star, with the giant Teodra b and four exomoon candidates,
//     Teodra b I–IV, whose values have wide (asymmetric, range and factor)
//     uncertainties and some gaps (no k2/Q, no albedo, no mass).
//
// Every row's source says "invented demo value"; no value describes a real body.
// The values are chosen to be physically plausible so that a ranking of them is
// worth looking at, nothing more. The file is in tidesift's canonical table
// layout (see README.md at the repository root):
//
//	data := sampledata.DemoCatalog()
//	res, err := importers.Read(sampledata.DemoFileName, bytes.NewReader(data), importers.Options{})
package sampledata
