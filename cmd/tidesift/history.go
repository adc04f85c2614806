package main

import (
	"context"
	"fmt"

	"github.com/spf13/cobra"

	"tidesift/schema"
)

type historyOptions struct {
	app    *app
	DB     string
	Name   string
	Key    string
	Planet string
	Format string
}

func newHistoryCmd(a *app, runF func(context.Context, *historyOptions) error) *cobra.Command {
	opts := &historyOptions{app: a}
	format := newFormatFlag("table", "table", "json")
	cmd := &cobra.Command{
		Use:   "history NAME [KEY]",
		Short: "Show how a moon's values changed, with their sources",
		Long: `Show every value a moon's parameters have held, oldest first: the value
with its uncertainty, its source, the revision that set it and the revision
that superseded it ('-' while current). With KEY, only that parameter.`,
		Example: `  tidesift history Ilmeth
  tidesift history Ilmeth eccentricity
  tidesift history "Teodra b I" mass --format json`,
		Args: usageArgs(cobra.RangeArgs(1, 2)),
		RunE: func(cmd *cobra.Command, args []string) error {
			opts.DB = a.db
			opts.Name = args[0]
			if len(args) == 2 {
				opts.Key = args[1]
				if _, ok := schema.LookupKey(opts.Key); !ok {
					return usageError(cmd, fmt.Errorf("unknown key %q; want one of %s", opts.Key, keyList()))
				}
			}
			opts.Format = format.value
			if runF != nil {
				return runF(cmd.Context(), opts)
			}
			return runHistory(cmd.Context(), opts)
		},
	}
	cmd.Flags().VarP(format, "format", "f", "output format: table or json")
	cmd.Flags().StringVar(&opts.Planet, "planet", "", "the moon's planet, when the name is ambiguous")
	return cmd
}

// keyList names the canonical keys, for messages.
func keyList() string {
	var ks []string
	for _, k := range schema.Keys {
		ks = append(ks, k.Key)
	}
	return joinComma(ks)
}

type historyJSON struct {
	inputJSON
	SupersededBy int64 `json:"superseded_by"` // 0 while current
}

func runHistory(ctx context.Context, opts *historyOptions) error {
	st, err := opts.app.openStore(ctx, opts.DB, true)
	if err != nil {
		return err
	}
	defer st.Close()
	// Resolve the name (aliases, ambiguity) against the latest catalog, so
	// history reports the same errors as show.
	cat, err := st.SnapshotOf(ctx, 0, opts.Name)
	if err != nil {
		return err
	}
	m, err := findMoon(cat, opts.Name, opts.Planet)
	if err != nil {
		return err
	}
	hist, err := st.History(ctx, m.Name, m.Parent, opts.Key)
	if err != nil {
		return err
	}
	w := opts.app.Out
	if opts.Format == "json" {
		out := []historyJSON{}
		for _, h := range hist {
			info, _ := schema.LookupKey(h.Key)
			p := h.Param
			out = append(out, historyJSON{inputJSON{Key: h.Key, Value: p.Value, Uncertainty: p.Unc, Unit: info.Unit,
				Source: p.Source, Revision: p.Revision, Status: p.Status}, h.SupersededBy})
		}
		return writeJSON(w, out)
	}
	fmt.Fprintf(w, "%s, moon of %s: %s\n\n", m.Name, m.Parent, plural(len(hist), "value"))
	tw := newTable(w)
	fmt.Fprintln(tw, "KEY\tVALUE\tUNIT\tSET IN\tSUPERSEDED IN\tSOURCE")
	for _, h := range hist {
		unit, _ := displayUnit(h.Key)
		sup := "-"
		if h.SupersededBy != 0 {
			sup = fmt.Sprint(h.SupersededBy)
		}
		p := h.Param
		fmt.Fprintf(tw, "%s\t%s\t%s\t%d\t%s\t%s\n", h.Key, keyedText(h.Key, p), orDash(unit), p.Revision, sup, orDash(p.Source))
	}
	return tw.Flush()
}
