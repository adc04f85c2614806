package main

import (
	"context"
	"fmt"

	"github.com/spf13/cobra"

	"tidesift/store"
)

type checkOptions struct {
	app    *app
	DB     string
	Format string
}

func newCheckCmd(a *app, runF func(context.Context, *checkOptions) error) *cobra.Command {
	opts := &checkOptions{app: a}
	format := newFormatFlag("table", "table", "json")
	cmd := &cobra.Command{
		Use:   "check",
		Short: "Check the catalog's integrity and every stored value",
		Long: `Check the catalog without changing it: SQLite's integrity and foreign-key
checks, every stored value (current and superseded) against its key's physical
domain and the form of its uncertainty, rows that refer to missing bodies or
revisions, the order of revisions, and whether each revision holds as many
values as it says it changed (a half-written revision would show there).

Prints a report and exits 0 when the catalog is sound, or 4 when anything is
wrong.`,
		Example: `  tidesift check
  tidesift --db review.db check --format json`,
		Args: usageArgs(cobra.NoArgs),
		RunE: func(cmd *cobra.Command, args []string) error {
			opts.DB = a.db
			opts.Format = format.value
			if runF != nil {
				return runF(cmd.Context(), opts)
			}
			return runCheck(cmd.Context(), opts)
		},
	}
	cmd.Flags().VarP(format, "format", "f", "output format: table or json")
	return cmd
}

// checkDoc is the JSON form of check's report.
type checkDoc struct {
	OK        bool          `json:"ok"`
	Revisions int           `json:"revisions"`
	Bodies    int           `json:"bodies"`
	Values    int           `json:"values"`
	Problems  []problemJSON `json:"problems"`
}

type problemJSON struct {
	Kind     string `json:"kind,omitempty"`
	Body     string `json:"body,omitempty"`
	Parent   string `json:"parent,omitempty"`
	Key      string `json:"key,omitempty"`
	Revision int64  `json:"revision,omitempty"`
	What     string `json:"what"`
}

func runCheck(ctx context.Context, opts *checkOptions) error {
	st, err := opts.app.openStore(ctx, opts.DB, true)
	if err != nil {
		return err
	}
	defer st.Close()
	rep, err := st.Check(ctx)
	if err != nil {
		return err
	}
	w := opts.app.Out
	if opts.Format == "json" {
		if err := writeJSON(w, checkJSON(rep)); err != nil {
			return err
		}
	} else if _, err := fmt.Fprintln(w, rep.String()); err != nil {
		return err
	}
	if rep.OK() {
		return nil
	}
	return &exitErr{code: exitProblems, err: fmt.Errorf("check found %s in %s", plural(len(rep.Problems), "problem"), opts.DB)}
}

func checkJSON(rep *store.CheckReport) checkDoc {
	doc := checkDoc{OK: rep.OK(), Revisions: rep.Revisions, Bodies: rep.Bodies, Values: rep.Values, Problems: []problemJSON{}}
	for _, p := range rep.Problems {
		doc.Problems = append(doc.Problems, problemJSON{Kind: string(p.Kind), Body: p.Body, Parent: p.Parent, Key: p.Key, Revision: p.Revision, What: p.What})
	}
	return doc
}
