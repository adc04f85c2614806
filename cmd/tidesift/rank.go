package main

import (
	"context"

	"github.com/spf13/cobra"

	"tidesift/export"
)

type rankOptions struct {
	app *app
	DB  string
	rankFlags
	Format string
}

func newRankCmd(a *app, runF func(context.Context, *rankOptions) error) *cobra.Command {
	opts := &rankOptions{app: a}
	format := newFormatFlag("table", "table", "json", "csv")
	cmd := &cobra.Command{
		Use:   "rank",
		Short: "Rank the catalog's moons under a scoring profile, with uncertainty",
		Long: `Rank the catalog's moons under a scoring profile by Monte Carlo: every
uncertain input is sampled from its distribution (missing inputs from the
profile's priors, marked as assumed), the derived quantities and the profile's
score are computed in every sample, and the moons are ranked sample by sample.

The table shows each moon's median rank with its 5–95 % interval, the score's
median and range, P(rank ≤ k), the ocean probability and the input that drives
most of the score's uncertainty: the measurement that would sharpen the
ranking most. '*' marks a moon with assumed inputs.

--format json prints the ranking document (catalog_revision, profile, samples,
seed and targets with rank, rank_p05, rank_p95, p_top, score, assumed_inputs,
drivers and metrics; see DEVELOPERS.md); --format csv one row per target. The
same catalog revision, profile, seed and samples give identical output.

` + cautions,
		Example: `  tidesift rank
  tidesift rank --top 5 --profile tidal
  tidesift rank --planet "Velmira b" --samples 2000 --seed 7 --format json
  tidesift rank --profile my-profile.toml --format csv > ranking.csv`,
		Args: usageArgs(cobra.NoArgs),
		RunE: func(cmd *cobra.Command, args []string) error {
			opts.DB = a.db
			opts.Format = format.value
			if err := opts.rankFlags.validate(cmd); err != nil {
				return err
			}
			if runF != nil {
				return runF(cmd.Context(), opts)
			}
			return runRank(cmd.Context(), opts)
		},
	}
	cmd.Flags().VarP(format, "format", "f", "output format: table, json or csv")
	addRankFlags(cmd, &opts.rankFlags, true)
	cmd.Flags().Int64Var(&opts.Revision, "rev", 0, "rank the catalog as of this revision (0: latest)")
	return cmd
}

func runRank(ctx context.Context, opts *rankOptions) error {
	prof, err := loadProfile(opts.Profile)
	if err != nil {
		return err
	}
	st, err := opts.app.openStore(ctx, opts.DB, true)
	if err != nil {
		return err
	}
	defer st.Close()
	res, _, err := opts.app.rankAt(ctx, st, opts.Revision, prof, opts.rankFlags)
	if err != nil {
		return err
	}
	w := opts.app.Out
	switch opts.Format {
	case "json":
		return export.WriteJSON(w, topOf(res, opts.Top))
	case "csv":
		return export.WriteCSV(w, topOf(res, opts.Top))
	}
	return export.WriteTable(w, res, export.TableOptions{Top: opts.Top})
}
