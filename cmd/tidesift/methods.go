package main

import (
	"context"
	"fmt"

	"github.com/spf13/cobra"
)

type methodsOptions struct{ app *app }

func newMethodsCmd(a *app, runF func(context.Context, *methodsOptions) error) *cobra.Command {
	opts := &methodsOptions{app: a}
	return &cobra.Command{
		Use:   "methods",
		Short: "Print the method: every formula, constant and simplification with its source",
		Long: `Print the method tidesift computes with: the constants, every formula of the
derived quantities with the publication it follows, the interior and ice-shell
models, the uncertainty propagation and ranking statistics, and the
simplifications. The same text fills the Method sheet of an exported workbook.

` + cautions,
		Example: `  tidesift methods | less`,
		Args:    usageArgs(cobra.NoArgs),
		RunE: func(cmd *cobra.Command, args []string) error {
			if runF != nil {
				return runF(cmd.Context(), opts)
			}
			return runMethods(cmd.Context(), opts)
		},
	}
}

func runMethods(_ context.Context, opts *methodsOptions) error {
	_, err := fmt.Fprint(opts.app.Out, methodsText())
	return err
}
