package main

import (
	"io"

	"tidesift/schema"
)

// derivedAtCentral computes the derived quantities of moon m at the central
// input values, keyed by the ranking document's metric names. It returns nil
// until the physics models are wired in.
func derivedAtCentral(cat *schema.Catalog, m *schema.Body) (map[string]any, []string) {
	return map[string]any{}, nil
}

// writeDerivedTable prints the derived section of `show`.
func writeDerivedTable(w io.Writer, doc showDoc) error {
	return nil
}
