package profile

import (
	"fmt"
	"strconv"
	"strings"
	"unicode/utf8"

	"tidesift/rank/uncertain"
)

// Caution is the line every rendered profile and every ranking output carries.
const Caution = "Scores are triage aids built on simplified models; they support, and never replace, expert review."

// TOML renders the profile in full — every model parameter, defaults
// included — as a TOML document that Parse reads back to an equal profile.
// The source's leading comment block, if any, comes first; otherwise a short
// header with the description and the caution.
func (p *Profile) TOML() string {
	var b strings.Builder
	if p.header != "" {
		b.WriteString(p.header)
		b.WriteString("\n\n")
	} else {
		fmt.Fprintf(&b, "# tidesift scoring profile %q.\n# %s\n\n", p.Name, Caution)
	}
	fmt.Fprintf(&b, "name = %s\n", quote(p.Name))
	fmt.Fprintf(&b, "description = %s\n", quote(p.Description))
	fmt.Fprintf(&b, "top_k = %d\n\n", p.TopK)

	m := p.Model
	b.WriteString("[model]\n")
	row := func(key string, v float64, unit string) {
		fmt.Fprintf(&b, "%s = %s # %s\n", key, fnum(v), unit)
	}
	row("ice_density_kg_m3", m.IceDensity, "kg/m³, H₂O end member of the two-component interior")
	row("core_density_kg_m3", m.CoreDensity, "kg/m³, metal core of the three-layer interior")
	row("mantle_density_kg_m3", m.MantleDensity, "kg/m³, rock mantle of the three-layer interior")
	row("water_density_kg_m3", m.WaterDensity, "kg/m³, H₂O layer of the three-layer interior")
	row("rock_heat_production_w_kg", m.RockHeatProduction, "W/kg, present-day radiogenic heating of rock")
	row("melting_temperature_k", m.MeltingTemperature, "K, base of the ice shell")
	row("ice_stability_temperature_k", m.IceStabilityTemperature, "K, surface H₂O ice unstable above this")
	row("min_ocean_thickness_m", m.MinOceanThickness, "m, thinnest liquid layer that counts as an ocean")

	for _, c := range p.Criteria {
		b.WriteString("\n[[criterion]]\n")
		fmt.Fprintf(&b, "metric = %s\n", quote(c.Metric))
		fmt.Fprintf(&b, "transfer = %s\n", quote(c.Transfer))
		fmt.Fprintf(&b, "lo = %s\n", fnum(c.Lo))
		fmt.Fprintf(&b, "hi = %s\n", fnum(c.Hi))
		if c.kind == tWindow {
			fmt.Fprintf(&b, "soft = %s\n", fnum(c.Soft))
		}
		fmt.Fprintf(&b, "weight = %s\n", fnum(c.Weight))
	}
	if len(p.Priors) > 0 {
		b.WriteString("\n[priors] # SI units of each key\n")
		for _, pr := range p.Priors {
			vals := map[string]float64{"value": pr.Spec.Value, "sigma": pr.Spec.Sigma, "plus": pr.Spec.Plus, "minus": pr.Spec.Minus,
				"min": pr.Spec.Min, "max": pr.Spec.Max, "factor": pr.Spec.Factor}
			fmt.Fprintf(&b, "%s = { dist = %s", bareKey(pr.Key), quote(pr.Spec.Dist))
			for _, f := range uncertain.Fields(pr.Spec.Dist) {
				fmt.Fprintf(&b, ", %s = %s", f, fnum(vals[f]))
			}
			b.WriteString(" }\n")
		}
	}
	return b.String()
}

// fnum writes a float so that TOML reads back the same float64.
func fnum(v float64) string {
	// 'g' gives "930" (a TOML integer, which decodes into float64 exactly),
	// "0.1" or "1e-05"; all are valid TOML numbers.
	return strconv.FormatFloat(v, 'g', -1, 64)
}

// quote writes a TOML basic string.
func quote(s string) string {
	var b strings.Builder
	b.WriteByte('"')
	for _, r := range s {
		switch {
		case r == '"':
			b.WriteString(`\"`)
		case r == '\\':
			b.WriteString(`\\`)
		case r == utf8.RuneError:
			b.WriteString(`\uFFFD`)
		case r < 0x20 || r == 0x7f:
			fmt.Fprintf(&b, `\u%04X`, r)
		default:
			b.WriteRune(r)
		}
	}
	b.WriteByte('"')
	return b.String()
}

// bareKey writes a key bare when TOML allows it, else quoted.
func bareKey(k string) string {
	if k == "" {
		return `""`
	}
	for _, r := range k {
		if !(r == '_' || r == '-' || r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z' || r >= '0' && r <= '9') {
			return quote(k)
		}
	}
	return k
}
