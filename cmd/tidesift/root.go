package main

import (
	"context"
	"errors"
	"fmt"
	"os"
	"os/signal"
	"strings"
	"time"

	"github.com/spf13/cobra"
)

// Exit statuses, documented in the root command's help.
const (
	exitOK       = 0 // success
	exitError    = 1 // any other failure (I/O, a broken catalog, …)
	exitUsage    = 2 // bad command line: unknown command or flag, wrong arguments
	exitRefused  = 3 // an import was refused by validation; nothing was written
	exitProblems = 4 // `check` found problems in the catalog
)

// cautions is the caveat every ranking-related help text carries.
const cautions = `The scores are triage aids computed on simplified models: homogeneous layers
without self-compression, heat carried through ice shells by conduction only,
present-day radiogenic heating, tides of a synchronous moon to second order in
eccentricity (unreliable above e ≈ 0.3), and profile priors for every missing
input. They help decide where to look; they support, and never replace, expert
review of each target.`

// app is what every command shares: the streams, the catalog path of the
// global --db flag, the environment and the clock.
type app struct {
	streams
	db     string              // --db, or TIDESIFT_DB, or tidesift.db
	getenv func(string) string // os.Getenv; tests replace it
}

// run executes the command line args and returns the process exit status. It
// is the whole program but for os.Exit, so tests can drive it.
func run(args []string, s streams) int {
	a := &app{streams: s, getenv: os.Getenv}
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt)
	defer stop()
	root := newRootCmd(a)
	root.SetArgs(args)
	err := root.ExecuteContext(ctx)
	return report(s.ErrOut, err)
}

// report prints err once to w (nothing for nil) and returns its exit status.
func report(w interface{ Write([]byte) (int, error) }, err error) int {
	if err == nil {
		return exitOK
	}
	code := exitStatus(err)
	fmt.Fprintf(w, "tidesift: %v\n", err)
	var ee *exitErr
	if errors.As(err, &ee) && ee.hint != "" {
		fmt.Fprintln(w, ee.hint)
	}
	return code
}

// exitErr carries an exit status and an optional hint line with an error.
type exitErr struct {
	code int
	err  error
	hint string
}

func (e *exitErr) Error() string { return e.err.Error() }
func (e *exitErr) Unwrap() error { return e.err }

// usageError marks err as a command-line mistake (exit status 2), with a hint
// naming the help of cmd.
func usageError(cmd *cobra.Command, err error) error {
	hint := ""
	if cmd != nil {
		hint = fmt.Sprintf("Run '%s --help' for usage.", cmd.CommandPath())
	}
	return &exitErr{code: exitUsage, err: err, hint: hint}
}

// refusedError marks err as an import refused by validation (exit status 3).
func refusedError(err error) error { return &exitErr{code: exitRefused, err: err} }

// exitStatus maps an error to the documented exit status.
func exitStatus(err error) int {
	var ee *exitErr
	switch {
	case err == nil:
		return exitOK
	case errors.As(err, &ee):
		return ee.code
	case strings.HasPrefix(err.Error(), "unknown command "):
		// Cobra's own error for `tidesift bogus`; it has no type to test.
		return exitUsage
	}
	return exitError
}

func newRootCmd(a *app) *cobra.Command {
	root := newBareRootCmd(a)
	root.AddCommand(
		newInitCmd(a, nil),
		newImportCmd(a, nil),
		newListCmd(a, nil),
		newShowCmd(a, nil),
		newRevisionsCmd(a, nil),
		newDemoCmd(a, nil),
		newProfileCmd(a),
		newHistoryCmd(a, nil),
		newDiffCmd(a, nil),
		newMethodsCmd(a, nil),
		newRankCmd(a, nil),
		newExportCmd(a, nil),
		newCheckCmd(a, nil),
	)
	return root
}

// newBareRootCmd is the root command with its global flags and no
// subcommands; tests attach the one command they exercise.
func newBareRootCmd(a *app) *cobra.Command {
	root := &cobra.Command{
		Use:   "tidesift",
		Short: "Catalog, model and rank candidate moons for habitability science",
		Long: `tidesift keeps a local catalog of candidate moons — in our solar system or
around other stars — in which every value carries its uncertainty and its
source. From it, it derives tidal and radiogenic heating, surface temperature,
volatile retention and the likelihood of a subsurface ocean, propagates the
uncertainties by Monte Carlo, and ranks the candidates under an explicit
scoring profile, saying how robust the ranking is and which measurement would
sharpen it most.

` + cautions + `

The catalog is one SQLite file: --db PATH, else $TIDESIFT_DB, else tidesift.db
in the working directory. Every import is a revision; nothing is ever
overwritten without keeping the value it replaced.

Exit status:
  0  success
  1  error (a file or the catalog could not be read or written, …)
  2  usage error (unknown command or flag, wrong arguments)
  3  an import was refused by validation; nothing was written
  4  check found problems in the catalog`,
		Example: `  tidesift demo                      # a tour on an invented catalog
  tidesift import moons.csv --note "first table"
  tidesift list
  tidesift show Varkesh`,
		SilenceErrors: true,
		SilenceUsage:  true,
		Version:       version(),
	}
	root.SetIn(a.In)
	root.SetOut(a.Out)
	root.SetErr(a.ErrOut)
	def := "tidesift.db"
	if v := a.getenv("TIDESIFT_DB"); v != "" {
		def = v
	}
	root.PersistentFlags().StringVar(&a.db, "db", def, "catalog file (or set $TIDESIFT_DB)")
	root.SetFlagErrorFunc(func(c *cobra.Command, err error) error { return usageError(c, err) })
	return root
}

// now returns the clock for revisions: TIDESIFT_NOW (RFC 3339) when set, so
// tests and reproducible builds get stable times, else the wall clock.
func (a *app) now() (func() time.Time, error) {
	v := a.getenv("TIDESIFT_NOW")
	if v == "" {
		return func() time.Time { return time.Now().UTC() }, nil
	}
	t, err := time.Parse(time.RFC3339, v)
	if err != nil {
		return nil, fmt.Errorf("TIDESIFT_NOW=%q: want an RFC 3339 time such as 2026-01-02T15:04:05Z", v)
	}
	return func() time.Time { return t.UTC() }, nil
}

// exactArgs is cobra.ExactArgs with its error marked as a usage error.
func exactArgs(n int) cobra.PositionalArgs { return usageArgs(cobra.ExactArgs(n)) }

// usageArgs marks the errors of an argument validator as usage errors.
func usageArgs(f cobra.PositionalArgs) cobra.PositionalArgs {
	return func(cmd *cobra.Command, args []string) error {
		if err := f(cmd, args); err != nil {
			return usageError(cmd, err)
		}
		return nil
	}
}
