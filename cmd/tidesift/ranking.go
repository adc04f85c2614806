package main

import (
	"context"
	"fmt"
	"runtime/debug"

	"github.com/spf13/cobra"

	"tidesift/rank"
	"tidesift/rank/method"
	"tidesift/rank/profile"
	"tidesift/schema"
	"tidesift/store"
)

// defaultProfile is the profile rank, export, show and demo use unless
// --profile names another: the design's first question is where an ocean can
// persist.
const defaultProfile = "ocean"

// rankFlags are the ranking flags rank, export, diff --rank and show share.
type rankFlags struct {
	Top      int
	Planets  []string
	Stars    []string
	Samples  int
	Seed     uint64
	Profile  string
	Workers  int
	Revision int64
}

// addRankFlags defines the ranking flags on cmd. withFilters adds --top,
// --planet and --star, which only whole rankings take.
func addRankFlags(cmd *cobra.Command, f *rankFlags, withFilters bool) {
	fl := cmd.Flags()
	if withFilters {
		fl.IntVar(&f.Top, "top", 0, "show only the best N targets (0: all); statistics still use every target")
		fl.StringArrayVar(&f.Planets, "planet", nil, "rank only the moons of this planet (repeatable)")
		fl.StringArrayVar(&f.Stars, "star", nil, "rank only the moons of this star's planets (repeatable)")
	}
	fl.IntVar(&f.Samples, "samples", rank.DefaultSamples, "Monte Carlo samples per target")
	fl.Uint64Var(&f.Seed, "seed", 1, "random seed; the same catalog revision, profile, seed and samples give identical output")
	fl.StringVar(&f.Profile, "profile", defaultProfile, "scoring profile: a built-in name ('tidesift profile list') or a TOML file")
	fl.IntVar(&f.Workers, "workers", 0, "goroutines (0: one per CPU); results do not depend on it")
}

// validate checks the ranking flags' values, as usage errors.
func (f *rankFlags) validate(cmd *cobra.Command) error {
	switch {
	case f.Top < 0:
		return usageError(cmd, fmt.Errorf("invalid --top %d: want a count ≥ 1, or 0 for all", f.Top))
	case f.Samples < 1:
		return usageError(cmd, fmt.Errorf("invalid --samples %d: want at least 1", f.Samples))
	case f.Workers < 0:
		return usageError(cmd, fmt.Errorf("invalid --workers %d: want a count ≥ 1, or 0 for one per CPU", f.Workers))
	case f.Revision < 0:
		return usageError(cmd, fmt.Errorf("invalid --rev %d: want a revision number ≥ 1, or 0 for the latest", f.Revision))
	}
	return nil
}

// rankCatalog ranks cat under prof with the flags' options, drawing a
// progress bar on a terminal's error stream.
func (a *app) rankCatalog(ctx context.Context, cat *schema.Catalog, prof *profile.Profile, f rankFlags) (*rank.Result, error) {
	bar := newProgress(a.streams, "ranking")
	res, err := rank.Run(ctx, cat, prof, rank.Options{
		Samples: f.Samples, Seed: f.Seed, Workers: f.Workers,
		Filter:   rank.Filter{Planets: f.Planets, Stars: f.Stars},
		Progress: bar.Update,
	})
	bar.Done()
	if err != nil {
		return nil, err
	}
	for _, w := range res.Warnings {
		fmt.Fprintf(a.ErrOut, "warning: %s\n", w)
	}
	return res, nil
}

// rankAt opens nothing: it snapshots st at rev and ranks it.
func (a *app) rankAt(ctx context.Context, st *store.Store, rev int64, prof *profile.Profile, f rankFlags) (*rank.Result, *schema.Catalog, error) {
	cat, err := st.Snapshot(ctx, rev)
	if err != nil {
		return nil, nil, err
	}
	res, err := a.rankCatalog(ctx, cat, prof, f)
	return res, cat, err
}

// topOf returns r with only its best n targets (all for n = 0), for the
// JSON and CSV outputs of --top. r itself is not changed.
func topOf(r *rank.Result, n int) *rank.Result {
	if n <= 0 || n >= len(r.Targets) {
		return r
	}
	c := *r
	c.Targets = r.Targets[:n]
	return &c
}

// methodsText is the full method: the models (rank/method) and the
// uncertainty propagation and ranking statistics (rank), as one text for the
// methods command and the workbook's Method sheet.
func methodsText() string {
	return method.WithUncertainty(rank.MethodText())
}

// version is the tidesift version recorded in workbooks: the module version
// when built from a tagged module, else "devel".
func version() string {
	if bi, ok := debug.ReadBuildInfo(); ok && bi.Main.Version != "" && bi.Main.Version != "(devel)" {
		return bi.Main.Version
	}
	return "devel"
}
