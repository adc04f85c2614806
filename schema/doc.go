// Package schema is tidesift's data model: the Go types every other package
// shares, and the catalog's SQL form as numbered migrations.
//
// A catalog holds three kinds of body (stars, planets and moons). Every numeric
// parameter is a Param in SI units with an Uncertainty of one form (none,
// symmetric σ, asymmetric +σ/−σ, a [min, max] range or a ×/÷ factor), a free-text
// source, a status (measured, or assumed from a profile prior) and the Revision
// that set it. Keys lists the canonical parameter keys with their units and
// physical domains:
//
//	info, _ := schema.LookupKey("eccentricity")
//	err := info.Check(1.2) // wraps ErrOutOfDomain: "eccentricity = 1.2, expected [0, 1)"
//
// Importers turn files into Records; the store turns Records into revisions and
// reads a Catalog back at any revision; the ranking reads a Catalog. This package
// imports only the standard library.
package schema
