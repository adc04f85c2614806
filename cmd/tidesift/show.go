package main

import (
	"context"
	"encoding/csv"
	"fmt"
	"io"
	"strconv"

	"github.com/spf13/cobra"

	"tidesift/export"
	"tidesift/rank/physics"
	"tidesift/schema"
)

type showOptions struct {
	app      *app
	DB       string
	Name     string
	Planet   string
	Format   string
	Revision int64
	Profile  string
}

func newShowCmd(a *app, runF func(context.Context, *showOptions) error) *cobra.Command {
	opts := &showOptions{app: a}
	format := newFormatFlag("table", "table", "json", "csv")
	cmd := &cobra.Command{
		Use:   "show NAME",
		Short: "Show every input of one moon, with uncertainty, unit, source and revision",
		Long: `Show one moon: every input that bears on it (its own, its planet's and its
star's) with its value, uncertainty, unit, source, the revision that set it and
its status, followed by the derived quantities at the central input values.

The moon is matched by name or alias, ignoring case and extra spaces; when two
planets have moons of that name, choose one with --planet.

--format json prints {"name", "planet", "star", "inputs": [...], "derived": {...}}
in SI units; "derived" uses the metric names of the ranking document with plain
numbers. --format csv prints one row per input.

Derived values are computed on simplified models at central values only; see
'tidesift rank' for their uncertainty, and 'tidesift methods' for the method.`,
		Example: `  tidesift show Varkesh
  tidesift show "teodra b i" --format json
  tidesift show Ilmeth --planet "Velmira b" --rev 1`,
		Args: exactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			opts.DB = a.db
			opts.Name = args[0]
			opts.Format = format.value
			if opts.Revision < 0 {
				return usageError(cmd, fmt.Errorf("invalid --rev %d: want a revision number ≥ 1, or 0 for the latest", opts.Revision))
			}
			if runF != nil {
				return runF(cmd.Context(), opts)
			}
			return runShow(cmd.Context(), opts)
		},
	}
	cmd.Flags().VarP(format, "format", "f", "output format: table, json or csv")
	cmd.Flags().StringVar(&opts.Planet, "planet", "", "the moon's planet, when the name is ambiguous")
	cmd.Flags().Int64Var(&opts.Revision, "rev", 0, "read the catalog as of this revision (0: latest)")
	cmd.Flags().StringVar(&opts.Profile, "profile", defaultProfile, "profile whose priors fill missing inputs for the derived values")
	return cmd
}

// showDoc is the JSON form of `show`.
type showDoc struct {
	Name            string      `json:"name"`
	Planet          string      `json:"planet"`
	Star            string      `json:"star"`
	Aliases         []string    `json:"aliases,omitempty"`
	CatalogRevision int64       `json:"catalog_revision"`
	Inputs          []inputJSON `json:"inputs"`
	Derived         any         `json:"derived"` // *physics.CentralValues, or {} when not computable
	Notes           []string    `json:"notes,omitempty"`

	params  map[string]schema.Param // catalog inputs and assumed ones, by key
	central *physics.CentralValues
	profile string
}

func runShow(ctx context.Context, opts *showOptions) error {
	st, err := opts.app.openStore(ctx, opts.DB, true)
	if err != nil {
		return err
	}
	defer st.Close()
	// Only the moons of that name, with their planets and stars: a
	// command about one moon reads no more of a large catalog.
	cat, err := st.SnapshotOf(ctx, opts.Revision, opts.Name)
	if err != nil {
		return err
	}
	m, err := findMoon(cat, opts.Name, opts.Planet)
	if err != nil {
		return err
	}
	prof, err := loadProfile(opts.Profile)
	if err != nil {
		return err
	}
	central, assumed, notes, err := derivedAtCentral(cat, m, prof)
	if err != nil {
		return err
	}
	in := cat.Inputs(m)
	for _, p := range assumed {
		if _, ok := in[p.Key]; !ok && isCatalogKey(p.Key) {
			in[p.Key] = p
		}
	}
	doc := showDoc{
		Name: m.Name, Planet: m.Parent, Star: cat.StarOf(m), Aliases: m.Aliases,
		CatalogRevision: cat.Revision.ID, Inputs: inputsJSON(in), Notes: notes,
		params: in, central: central, profile: prof.Name, Derived: map[string]any{},
	}
	if central != nil {
		doc.Derived = central
	}
	w := opts.app.Out
	switch opts.Format {
	case "json":
		return writeJSON(w, doc)
	case "csv":
		return writeShowCSV(w, doc)
	}
	return writeShowTable(w, doc)
}

func writeShowTable(w io.Writer, doc showDoc) error {
	star := ""
	if doc.Star != "" {
		star = ", star " + doc.Star
	}
	fmt.Fprintf(w, "%s, moon of %s%s (catalog revision %d)\n", doc.Name, doc.Planet, star, doc.CatalogRevision)
	if len(doc.Aliases) > 0 {
		fmt.Fprintf(w, "also known as: %s\n", joinComma(doc.Aliases))
	}
	fmt.Fprintln(w)
	tw := newTable(w)
	fmt.Fprintln(tw, "INPUT\tVALUE\tUNCERTAINTY\tUNIT\tSTATUS\tREV\tSOURCE")
	for _, k := range schema.SortedKeys(doc.params) {
		p := doc.params[k]
		unit, f := displayUnit(k)
		unc := uncText(p.Unc, f)
		if unc == "" {
			unc = "-"
		}
		rev := "-"
		if p.Revision != 0 {
			rev = strconv.FormatInt(p.Revision, 10)
		}
		fmt.Fprintf(tw, "%s\t%s\t%s\t%s\t%s\t%s\t%s\n", k, num(p.Value/f, 6), unc, orDash(unit), p.Status, rev, orDash(p.Source))
	}
	if err := tw.Flush(); err != nil {
		return err
	}
	return writeDerivedTable(w, doc)
}

func writeShowCSV(w io.Writer, doc showDoc) error {
	cw := csv.NewWriter(w)
	cw.Write([]string{"key", "value", "unit", "uncertainty", "sigma", "plus", "minus", "min", "max", "factor", "source", "revision", "status"})
	for _, in := range doc.Inputs {
		u := in.Uncertainty
		cell := func(kind schema.UncKind, v float64) string {
			if u.Kind != kind {
				return ""
			}
			return csvFloat(v)
		}
		cw.Write([]string{
			in.Key, csvFloat(in.Value), in.Unit, u.Kind.String(),
			cell(schema.UncSymmetric, u.Sigma), cell(schema.UncAsymmetric, u.Plus), cell(schema.UncAsymmetric, u.Minus),
			cell(schema.UncRange, u.Min), cell(schema.UncRange, u.Max), cell(schema.UncFactor, u.Factor),
			export.SafeText(in.Source), strconv.FormatInt(in.Revision, 10), string(in.Status),
		})
	}
	cw.Flush()
	return cw.Error()
}

func joinComma(ss []string) string {
	out := ""
	for i, s := range ss {
		if i > 0 {
			out += ", "
		}
		out += s
	}
	return out
}

// isCatalogKey reports whether key is a catalog key (profile priors may also
// set model parameters such as the rock density, which are not inputs).
func isCatalogKey(key string) bool {
	_, ok := schema.LookupKey(key)
	return ok
}
