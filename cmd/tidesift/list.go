package main

import (
	"context"
	"encoding/csv"
	"fmt"
	"io"
	"strings"

	"github.com/spf13/cobra"

	"tidesift/export"
	"tidesift/schema"
)

type listOptions struct {
	app      *app
	DB       string
	Format   string
	Planet   string
	Star     string
	Revision int64
}

func newListCmd(a *app, runF func(context.Context, *listOptions) error) *cobra.Command {
	opts := &listOptions{app: a}
	format := newFormatFlag("table", "table", "json", "csv")
	cmd := &cobra.Command{
		Use:   "list",
		Short: "List the moons of the catalog with their key inputs",
		Long: `List the catalog's moons with their key inputs and uncertainties: mass,
radius, semi-major axis, eccentricity, k2/Q and Bond albedo. A '-' marks a
value the catalog does not have (a ranking fills it from the profile's prior).

--format json prints every input of every moon (its own, its planet's and its
star's) in SI units with uncertainty, source, revision and status. --format csv
prints the catalog in the canonical table layout, in SI units, so it can be
edited and imported again. --rev reads the catalog as it was at a revision.`,
		Example: `  tidesift list
  tidesift list --planet "Velmira b"
  tidesift list --format csv > catalog.csv
  tidesift list --rev 1 --format json`,
		Args: usageArgs(cobra.NoArgs),
		RunE: func(cmd *cobra.Command, args []string) error {
			opts.DB = a.db
			opts.Format = format.value
			if opts.Revision < 0 {
				return usageError(cmd, fmt.Errorf("invalid --rev %d: want a revision number ≥ 1, or 0 for the latest", opts.Revision))
			}
			if runF != nil {
				return runF(cmd.Context(), opts)
			}
			return runList(cmd.Context(), opts)
		},
	}
	cmd.Flags().VarP(format, "format", "f", "output format: table, json or csv")
	cmd.Flags().StringVar(&opts.Planet, "planet", "", "only the moons of this planet")
	cmd.Flags().StringVar(&opts.Star, "star", "", "only the moons of this star's planets")
	cmd.Flags().Int64Var(&opts.Revision, "rev", 0, "read the catalog as of this revision (0: latest)")
	return cmd
}

func runList(ctx context.Context, opts *listOptions) error {
	st, err := opts.app.openStore(ctx, opts.DB, true)
	if err != nil {
		return err
	}
	defer st.Close()
	cat, err := st.Snapshot(ctx, opts.Revision)
	if err != nil {
		return err
	}
	moons := filterMoons(cat, opts.Planet, opts.Star)
	w := opts.app.Out
	switch opts.Format {
	case "json":
		return writeJSON(w, listJSON(cat, moons))
	case "csv":
		return writeCanonicalCSV(w, cat, moons)
	}
	if len(moons) == 0 {
		_, err := fmt.Fprintln(w, "no moons in the catalog; import a file with 'tidesift import FILE'")
		return err
	}
	return writeListTable(w, cat, moons)
}

// listColumns are the inputs the list table shows.
var listColumns = []struct{ key, head string }{
	{"mass", "MASS"},
	{"radius", "RADIUS"},
	{"semi_major_axis", "A"},
	{"eccentricity", "ECC"},
	{"k2_q", "K2/Q"},
	{"bond_albedo", "ALBEDO"},
}

func writeListTable(w io.Writer, cat *schema.Catalog, moons []*schema.Body) error {
	tw := newTable(w)
	head := []string{"NAME", "PLANET", "STAR"}
	for _, c := range listColumns {
		h := c.head
		if u, _ := displayUnit(c.key); u != "" {
			h += " [" + u + "]"
		}
		head = append(head, h)
	}
	fmt.Fprintln(tw, strings.Join(head, "\t"))
	for _, m := range moons {
		in := cat.Inputs(m)
		row := []string{m.Name, m.Parent, orDash(cat.StarOf(m))}
		for _, c := range listColumns {
			row = append(row, listCell(in, c.key))
		}
		fmt.Fprintln(tw, strings.Join(row, "\t"))
	}
	return tw.Flush()
}

func listCell(in map[string]schema.Param, key string) string {
	if p, ok := in[key]; ok {
		return paramText(p)
	}
	if key == "k2_q" {
		// k2 and Q given separately: show their ratio at central values.
		k2, ok1 := in["k2"]
		q, ok2 := in["q"]
		if ok1 && ok2 && q.Value > 0 {
			return num(k2.Value/q.Value, 3) + " from k2, Q"
		}
	}
	return "-"
}

func orDash(s string) string {
	if s == "" {
		return "-"
	}
	return s
}

type moonJSON struct {
	Name    string      `json:"name"`
	Planet  string      `json:"planet"`
	Star    string      `json:"star"`
	Aliases []string    `json:"aliases,omitempty"`
	Inputs  []inputJSON `json:"inputs"`
}

type listDoc struct {
	CatalogRevision int64      `json:"catalog_revision"`
	Moons           []moonJSON `json:"moons"`
}

func listJSON(cat *schema.Catalog, moons []*schema.Body) listDoc {
	doc := listDoc{CatalogRevision: cat.Revision.ID, Moons: []moonJSON{}}
	for _, m := range moons {
		doc.Moons = append(doc.Moons, moonJSON{
			Name: m.Name, Planet: m.Parent, Star: cat.StarOf(m), Aliases: m.Aliases,
			Inputs: inputsJSON(cat.Inputs(m)),
		})
	}
	return doc
}

// writeCanonicalCSV writes moons in the canonical table layout, in SI units:
// a `key [unit]` column for every key any moon has, the uncertainty companions
// its values use, and a `key_source` column.
func writeCanonicalCSV(w io.Writer, cat *schema.Catalog, moons []*schema.Body) error {
	type col struct {
		head string
		cell func(p schema.Param) string
		key  string
	}
	inputs := make([]map[string]schema.Param, len(moons))
	kinds := map[string]map[schema.UncKind]bool{}
	hasSource := map[string]bool{}
	aliases := false
	for i, m := range moons {
		inputs[i] = cat.Inputs(m)
		aliases = aliases || len(m.Aliases) > 0
		for k, p := range inputs[i] {
			if kinds[k] == nil {
				kinds[k] = map[schema.UncKind]bool{}
			}
			kinds[k][p.Unc.Kind] = true
			hasSource[k] = hasSource[k] || p.Source != ""
		}
	}
	var cols []col
	for _, info := range schema.Keys {
		ks, ok := kinds[info.Key]
		if !ok {
			continue
		}
		head := info.Key
		if info.Unit != "" {
			head += " [" + info.Unit + "]"
		}
		cols = append(cols, col{head, func(p schema.Param) string { return csvFloat(p.Value) }, info.Key})
		add := func(kind schema.UncKind, suffix string, f func(schema.Uncertainty) float64) {
			if ks[kind] {
				cols = append(cols, col{info.Key + suffix, func(p schema.Param) string {
					if p.Unc.Kind != kind {
						return ""
					}
					return csvFloat(f(p.Unc))
				}, info.Key})
			}
		}
		add(schema.UncSymmetric, "_err", func(u schema.Uncertainty) float64 { return u.Sigma })
		add(schema.UncAsymmetric, "_err_plus", func(u schema.Uncertainty) float64 { return u.Plus })
		add(schema.UncAsymmetric, "_err_minus", func(u schema.Uncertainty) float64 { return u.Minus })
		add(schema.UncRange, "_min", func(u schema.Uncertainty) float64 { return u.Min })
		add(schema.UncRange, "_max", func(u schema.Uncertainty) float64 { return u.Max })
		add(schema.UncFactor, "_factor", func(u schema.Uncertainty) float64 { return u.Factor })
		if hasSource[info.Key] {
			cols = append(cols, col{info.Key + "_source", func(p schema.Param) string { return export.SafeText(p.Source) }, info.Key})
		}
	}
	cw := csv.NewWriter(w)
	head := []string{"name", "planet", "star"}
	if aliases {
		head = append(head, "alias")
	}
	for _, c := range cols {
		head = append(head, c.head)
	}
	if err := cw.Write(head); err != nil {
		return err
	}
	for i, m := range moons {
		row := []string{export.SafeText(m.Name), export.SafeText(m.Parent), export.SafeText(cat.StarOf(m))}
		if aliases {
			row = append(row, export.SafeText(strings.Join(m.Aliases, "; ")))
		}
		for _, c := range cols {
			p, ok := inputs[i][c.key]
			if !ok {
				row = append(row, "")
				continue
			}
			row = append(row, c.cell(p))
		}
		if err := cw.Write(row); err != nil {
			return err
		}
	}
	cw.Flush()
	return cw.Error()
}
