package main

import (
	"fmt"
	"io"
	"sort"
	"strings"

	"tidesift/export"
	"tidesift/rank"
	"tidesift/rank/physics"
	"tidesift/rank/profile"
	"tidesift/schema"
)

// derivedAtCentral evaluates the model for moon m at its central input
// values (rank.Central: catalog values, and the median of the profile's
// prior for each missing input). It returns the derived quantities under the
// ranking document's metric names, the assumed inputs it used, and notes on
// what could not be computed.
func derivedAtCentral(cat *schema.Catalog, m *schema.Body, prof *profile.Profile) (*physics.CentralValues, []schema.Param, []string, error) {
	d, params, err := rank.Central(cat, m, prof)
	var assumed []schema.Param
	for _, p := range params {
		if p.Status == schema.StatusAssumed {
			assumed = append(assumed, p)
		}
	}
	if err != nil {
		// The inputs are still worth showing: say why there are no derived
		// values (usually ErrMissingInputs: a required input with no prior).
		return nil, assumed, []string{err.Error()}, nil
	}
	c := d.Named()
	return &c, assumed, nil, nil
}

// derivedRows are the quantities the show table prints, with their SI units.
var derivedRows = []struct {
	label, unit string
	get         func(*physics.CentralValues) physics.Number
}{
	{"tidal power", "W", func(c *physics.CentralValues) physics.Number { return c.TidalPower }},
	{"radiogenic power", "W", func(c *physics.CentralValues) physics.Number { return c.RadiogenicPower }},
	{"surface heat flux", "W/m2", func(c *physics.CentralValues) physics.Number { return c.HeatFlux }},
	{"tidal force", "N", func(c *physics.CentralValues) physics.Number { return c.TidalForce }},
	{"equilibrium temperature", "K", func(c *physics.CentralValues) physics.Number { return c.EquilibriumTemperature }},
	{"surface temperature", "K", func(c *physics.CentralValues) physics.Number { return c.SurfaceTemperature }},
	{"escape velocity", "m/s", func(c *physics.CentralValues) physics.Number { return c.EscapeVelocity }},
	{"bulk density", "kg/m3", func(c *physics.CentralValues) physics.Number { return c.BulkDensity }},
	{"rock mass fraction", "", func(c *physics.CentralValues) physics.Number { return c.RockFraction }},
	{"H2O layer thickness", "m", func(c *physics.CentralValues) physics.Number { return c.WaterLayerThickness }},
	{"ice shell thickness", "m", func(c *physics.CentralValues) physics.Number { return c.IceShellThickness }},
	{"ocean thickness", "m", func(c *physics.CentralValues) physics.Number { return c.OceanThickness }},
}

// writeDerivedTable prints the derived section of `show`.
func writeDerivedTable(w io.Writer, doc showDoc) error {
	fmt.Fprintf(w, "\nDerived at central values (profile %s) — a triage aid on simplified models:\n", doc.profile)
	c := doc.central
	if c == nil {
		for _, n := range doc.Notes {
			fmt.Fprintf(w, "  not computed: %s\n", n)
		}
		return nil
	}
	tw := newTable(w)
	for _, r := range derivedRows {
		v := float64(r.get(c))
		text := "n/a"
		if r.get(c).Valid() {
			text = export.FormatRange(rank.Quantiles{P05: v, P50: v, P95: v}, r.unit)
		}
		fmt.Fprintf(tw, "  %s\t%s\n", r.label, text)
	}
	ocean := "n/a"
	switch {
	case !c.OceanProbability.Valid():
	case c.OceanProbability == 1:
		ocean = "yes, at least the profile's minimum thickness"
	default:
		ocean = "no"
	}
	fmt.Fprintf(tw, "  ocean\t%s\n", ocean)
	fmt.Fprintf(tw, "  interior model\t%s\n", c.Interior)
	var kept, lost []string
	for _, v := range sortedKeys(c.Retention) {
		switch r := c.Retention[v]; {
		case !r.Valid():
		case r == 1:
			kept = append(kept, v)
		default:
			lost = append(lost, v)
		}
	}
	fmt.Fprintf(tw, "  volatiles retained\t%s\n", orDash(strings.Join(kept, " ")))
	fmt.Fprintf(tw, "  volatiles lost\t%s\n", orDash(strings.Join(lost, " ")))
	fmt.Fprintf(tw, "  model flags\t%s\n", orDash(strings.Join(c.Flags, ", ")))
	return tw.Flush()
}

func sortedKeys[V any](m map[string]V) []string {
	out := make([]string, 0, len(m))
	for k := range m {
		out = append(out, k)
	}
	sort.Strings(out)
	return out
}
