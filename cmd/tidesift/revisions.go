package main

import (
	"context"
	"fmt"
	"time"

	"github.com/spf13/cobra"

	"tidesift/schema"
)

type revisionsOptions struct {
	app    *app
	DB     string
	Format string
}

func newRevisionsCmd(a *app, runF func(context.Context, *revisionsOptions) error) *cobra.Command {
	opts := &revisionsOptions{app: a}
	format := newFormatFlag("table", "table", "json")
	cmd := &cobra.Command{
		Use:   "revisions",
		Short: "List the catalog's revisions, oldest first",
		Long: `List every revision of the catalog, oldest first: its number, time (UTC),
file, the start of the file's SHA-256, the number of values it added or
changed, and its note. Any revision number can be given to 'list --rev',
'show --rev' and 'diff'.`,
		Example: `  tidesift revisions
  tidesift revisions --format json`,
		Args: usageArgs(cobra.NoArgs),
		RunE: func(cmd *cobra.Command, args []string) error {
			opts.DB = a.db
			opts.Format = format.value
			if runF != nil {
				return runF(cmd.Context(), opts)
			}
			return runRevisions(cmd.Context(), opts)
		},
	}
	cmd.Flags().VarP(format, "format", "f", "output format: table or json")
	return cmd
}

func runRevisions(ctx context.Context, opts *revisionsOptions) error {
	st, err := opts.app.openStore(ctx, opts.DB, true)
	if err != nil {
		return err
	}
	defer st.Close()
	revs, err := st.Revisions(ctx)
	if err != nil {
		return err
	}
	w := opts.app.Out
	if opts.Format == "json" {
		if revs == nil {
			revs = []schema.Revision{}
		}
		return writeJSON(w, revs)
	}
	if len(revs) == 0 {
		_, err := fmt.Fprintln(w, "no revisions yet; import a file with 'tidesift import FILE'")
		return err
	}
	tw := newTable(w)
	fmt.Fprintln(tw, "REV\tTIME (UTC)\tFILE\tSHA-256\tCHANGES\tNOTE")
	for _, r := range revs {
		sha := r.SHA256
		if len(sha) > 12 {
			sha = sha[:12]
		}
		fmt.Fprintf(tw, "%d\t%s\t%s\t%s\t%d\t%s\n", r.ID, r.Time.UTC().Format(time.DateTime), orDash(r.File), orDash(sha), r.Changes, orDash(r.Note))
	}
	return tw.Flush()
}
