package main

import (
	"context"
	"errors"
	"fmt"
	"os"

	"github.com/spf13/cobra"

	"tidesift/rank/profile"
)

func newProfileCmd(a *app) *cobra.Command {
	cmd := &cobra.Command{
		Use:   "profile",
		Short: "List and show scoring profiles",
		Long: `A scoring profile says what makes a target promising: criteria (a derived
quantity, a transfer function to [0, 1] and a weight), the priors for inputs the
catalog lacks, the interior densities, the melting temperature of the ocean,
the minimum ocean thickness and the k of P(rank ≤ k). Profiles are TOML.

tidesift has built-in profiles; 'profile show NAME > mine.toml' gives a file to
edit, and '--profile mine.toml' ranks with it.`,
		Args: usageArgs(cobra.NoArgs),
		RunE: func(cmd *cobra.Command, args []string) error { return cmd.Help() },
	}
	cmd.AddCommand(newProfileListCmd(a, nil), newProfileShowCmd(a, nil))
	return cmd
}

type profileListOptions struct{ app *app }

func newProfileListCmd(a *app, runF func(context.Context, *profileListOptions) error) *cobra.Command {
	opts := &profileListOptions{app: a}
	return &cobra.Command{
		Use:   "list",
		Short: "List the built-in scoring profiles",
		Long: `List the built-in scoring profiles with their k of P(rank ≤ k), their number
of criteria and what they favour. 'tidesift profile show NAME' prints one in
full.`,
		Example: `  tidesift profile list`,
		Args:    usageArgs(cobra.NoArgs),
		RunE: func(cmd *cobra.Command, args []string) error {
			if runF != nil {
				return runF(cmd.Context(), opts)
			}
			return runProfileList(cmd.Context(), opts)
		},
	}
}

func runProfileList(_ context.Context, opts *profileListOptions) error {
	tw := newTable(opts.app.Out)
	fmt.Fprintln(tw, "NAME\tTOP K\tCRITERIA\tDESCRIPTION")
	for _, name := range profile.BuiltinNames() {
		p, err := profile.Builtin(name)
		if err != nil {
			return fmt.Errorf("built-in profile %s: %w", name, err)
		}
		fmt.Fprintf(tw, "%s\t%d\t%d\t%s\n", p.Name, p.TopK, len(p.Criteria), p.Description)
	}
	return tw.Flush()
}

type profileShowOptions struct {
	app  *app
	Name string
}

func newProfileShowCmd(a *app, runF func(context.Context, *profileShowOptions) error) *cobra.Command {
	opts := &profileShowOptions{app: a}
	return &cobra.Command{
		Use:   "show NAME|FILE",
		Short: "Print a profile in full as TOML, ready to copy and edit",
		Long: `Print a built-in profile (or a profile file, after validating it) in full as
TOML: every criterion, prior and model parameter, defaults included. Redirect it
to a file, edit it, and rank with --profile FILE.`,
		Example: `  tidesift profile show ocean > my-ocean.toml
  tidesift rank --profile my-ocean.toml`,
		Args: exactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			opts.Name = args[0]
			if runF != nil {
				return runF(cmd.Context(), opts)
			}
			return runProfileShow(cmd.Context(), opts)
		},
	}
}

func runProfileShow(_ context.Context, opts *profileShowOptions) error {
	p, err := loadProfile(opts.Name)
	if err != nil {
		return err
	}
	_, err = fmt.Fprint(opts.app.Out, p.TOML())
	return err
}

// loadProfile resolves a --profile argument (a built-in name or a file). An
// unknown name is a usage error naming the built-ins; a bad file's problems
// are listed with their lines.
func loadProfile(nameOrFile string) (*profile.Profile, error) {
	p, err := profile.Load(nameOrFile, os.ReadFile)
	if err == nil {
		return p, nil
	}
	if errors.Is(err, profile.ErrUnknownProfile) {
		return nil, &exitErr{code: exitUsage, err: err, hint: "'tidesift profile list' shows the built-in profiles."}
	}
	var list profile.ErrorList
	if errors.As(err, &list) && len(list) > 0 {
		// Each problem already names the file, line and key.
		msg := ""
		if len(list) > 1 {
			msg = fmt.Sprintf("profile %s: %s:\n", nameOrFile, plural(len(list), "problem"))
		}
		for i, e := range list {
			if i > 0 {
				msg += "\n"
			}
			msg += e.Error()
			if e.Excerpt != "" {
				msg += "\n" + e.Excerpt
			}
		}
		return nil, errors.New(msg)
	}
	var pe *profile.Error
	if errors.As(err, &pe) && pe.Excerpt != "" {
		return nil, fmt.Errorf("%w\n%s", err, pe.Excerpt)
	}
	return nil, err
}
