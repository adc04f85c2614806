package main

import (
	"context"
	"errors"
	"fmt"
	"io/fs"
	"os"

	"github.com/spf13/cobra"
)

type initOptions struct {
	app *app
	DB  string
}

func newInitCmd(a *app, runF func(context.Context, *initOptions) error) *cobra.Command {
	opts := &initOptions{app: a}
	return &cobra.Command{
		Use:   "init",
		Short: "Create an empty catalog, or upgrade an existing one",
		Long: `Create an empty catalog at --db (default tidesift.db). An existing catalog is
opened and, if a older tidesift wrote it, upgraded to the current schema; one
written by a newer tidesift is refused and left untouched.

'tidesift import' creates the catalog too; init is for starting empty.`,
		Example: `  tidesift init
  tidesift --db review.db init`,
		Args: usageArgs(cobra.NoArgs),
		RunE: func(cmd *cobra.Command, args []string) error {
			opts.DB = a.db
			if runF != nil {
				return runF(cmd.Context(), opts)
			}
			return runInit(cmd.Context(), opts)
		},
	}
}

func runInit(ctx context.Context, opts *initOptions) error {
	_, err := os.Stat(opts.DB)
	existed := !errors.Is(err, fs.ErrNotExist)
	st, err := opts.app.openStore(ctx, opts.DB, false)
	if err != nil {
		return err
	}
	if err := st.Close(); err != nil {
		return fmt.Errorf("close catalog %s: %w", opts.DB, err)
	}
	if existed {
		_, err = fmt.Fprintf(opts.app.Out, "catalog %s is ready (schema up to date)\n", opts.DB)
	} else {
		_, err = fmt.Fprintf(opts.app.Out, "created empty catalog %s\n", opts.DB)
	}
	return err
}
