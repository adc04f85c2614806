package main

import (
	"context"
	"fmt"
	"strconv"

	"github.com/spf13/cobra"

	"tidesift/schema"
	"tidesift/store"
)

type diffOptions struct {
	app    *app
	DB     string
	From   int64
	To     int64
	Format string
}

func newDiffCmd(a *app, runF func(context.Context, *diffOptions) error) *cobra.Command {
	opts := &diffOptions{app: a}
	format := newFormatFlag("table", "table", "json")
	cmd := &cobra.Command{
		Use:   "diff REV_A REV_B",
		Short: "List the values added, removed and changed between two revisions",
		Long: `List every value added, removed or changed between revisions REV_A and REV_B
of the catalog ('tidesift revisions' lists them), with the body, the key and the
old and new values with their uncertainties. 0 stands for the latest revision.`,
		Example: `  tidesift diff 1 2
  tidesift diff 1 0 --format json`,
		Args: usageArgs(cobra.ExactArgs(2)),
		RunE: func(cmd *cobra.Command, args []string) error {
			opts.DB = a.db
			opts.Format = format.value
			for i, p := range []*int64{&opts.From, &opts.To} {
				v, err := strconv.ParseInt(args[i], 10, 64)
				if err != nil || v < 0 {
					return usageError(cmd, fmt.Errorf("invalid revision %q: want a revision number (0: the latest)", args[i]))
				}
				*p = v
			}
			if runF != nil {
				return runF(cmd.Context(), opts)
			}
			return runDiff(cmd.Context(), opts)
		},
	}
	cmd.Flags().VarP(format, "format", "f", "output format: table or json")
	return cmd
}

// changeJSON is one value change in `diff --format json`, in SI units.
type changeJSON struct {
	Change string     `json:"change"` // "added", "removed" or "changed"
	Kind   string     `json:"kind"`   // "moon", "planet" or "star"
	Body   string     `json:"body"`
	Parent string     `json:"parent,omitempty"`
	Key    string     `json:"key"`
	Old    *inputJSON `json:"old,omitempty"`
	New    *inputJSON `json:"new,omitempty"`
}

func changeKind(c store.ValueChange) string {
	switch {
	case c.Old == nil:
		return "added"
	case c.New == nil:
		return "removed"
	}
	return "changed"
}

func paramJSON(key string, p *schema.Param) *inputJSON {
	if p == nil {
		return nil
	}
	info, _ := schema.LookupKey(key)
	return &inputJSON{Key: key, Value: p.Value, Uncertainty: p.Unc, Unit: info.Unit, Source: p.Source, Revision: p.Revision, Status: p.Status}
}

func runDiff(ctx context.Context, opts *diffOptions) error {
	st, err := opts.app.openStore(ctx, opts.DB, true)
	if err != nil {
		return err
	}
	defer st.Close()
	changes, err := st.Diff(ctx, opts.From, opts.To)
	if err != nil {
		return err
	}
	w := opts.app.Out
	if opts.Format == "json" {
		out := []changeJSON{}
		for _, c := range changes {
			out = append(out, changeJSON{Change: changeKind(c), Kind: string(c.Kind), Body: c.Body, Parent: c.Parent,
				Key: c.Key, Old: paramJSON(c.Key, c.Old), New: paramJSON(c.Key, c.New)})
		}
		return writeJSON(w, out)
	}
	if len(changes) == 0 {
		_, err := fmt.Fprintf(w, "no values differ between revisions %d and %d\n", opts.From, opts.To)
		return err
	}
	return writeChangesTable(w, changes)
}

func writeChangesTable(w interface{ Write([]byte) (int, error) }, changes []store.ValueChange) error {
	tw := newTable(w)
	fmt.Fprintln(tw, "CHANGE\tBODY\tKEY\tOLD\tNEW\tUNIT")
	for _, c := range changes {
		old, nw := "-", "-"
		if c.Old != nil {
			old = keyedText(c.Key, *c.Old)
		}
		if c.New != nil {
			nw = keyedText(c.Key, *c.New)
		}
		unit, _ := displayUnit(c.Key)
		body := c.Body
		if c.Parent != "" {
			body += " (" + c.Parent + ")"
		}
		fmt.Fprintf(tw, "%s\t%s\t%s\t%s\t%s\t%s\n", changeKind(c), body, c.Key, old, nw, orDash(unit))
	}
	return tw.Flush()
}
