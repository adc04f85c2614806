package main

import (
	"context"
	"fmt"
	"os"
	"path/filepath"
	"strings"

	"github.com/spf13/cobra"

	"tidesift/export"
	"tidesift/rank"
	"tidesift/schema"
	"tidesift/store"
)

type exportOptions struct {
	app *app
	DB  string
	rankFlags
	Out    string
	Format string // xlsx, csv or json
	Since  int64  // 0: no Changes sheet
}

func newExportCmd(a *app, runF func(context.Context, *exportOptions) error) *cobra.Command {
	opts := &exportOptions{app: a}
	format := newFormatFlag("", "xlsx", "csv", "json")
	cmd := &cobra.Command{
		Use:   "export",
		Short: "Write the ranking as a review workbook (xlsx), CSV or JSON",
		Long: `Rank the catalog as 'tidesift rank' does and write the result for a review
panel: --out FILE.xlsx writes a workbook with the sheets Ranking (ranges as text
and as sortable p05/p50/p95 numbers, with a chart of each target's score range),
Derived, Inputs (every value with its uncertainty, source, revision, and
whether it was measured or assumed), Drivers ("what to measure next"), Changes
(with --since REV: changed inputs and how each target's rank and score moved
since that revision, under the same profile, seed and samples) and Method
(formulas, constants, simplifications and sources, the profile, seed, samples
and catalog revision).

--format csv or json writes the ranking to --out, or to standard output
without --out; the format is taken from --out's extension when not given.

` + cautions,
		Example: `  tidesift export --out review.xlsx
  tidesift export --out review.xlsx --profile tidal --since 3
  tidesift export --format json --samples 2000 --seed 7 > ranking.json`,
		Args: usageArgs(cobra.NoArgs),
		RunE: func(cmd *cobra.Command, args []string) error {
			opts.DB = a.db
			opts.Format = format.value
			if err := opts.rankFlags.validate(cmd); err != nil {
				return err
			}
			if opts.Since < 0 {
				return usageError(cmd, fmt.Errorf("invalid --since %d: want a revision number ≥ 1", opts.Since))
			}
			if opts.Format == "" {
				switch ext := strings.ToLower(filepath.Ext(opts.Out)); {
				case opts.Out == "":
					return usageError(cmd, fmt.Errorf("nothing to write to: give --out FILE.xlsx, or --format csv or json for standard output"))
				case ext == ".xlsx" || ext == ".csv" || ext == ".json":
					opts.Format = ext[1:]
				default:
					return usageError(cmd, fmt.Errorf("cannot tell the format of --out %q from its extension; give --format xlsx, csv or json", opts.Out))
				}
			}
			if opts.Format == "xlsx" && opts.Out == "" {
				return usageError(cmd, fmt.Errorf("a workbook needs --out FILE.xlsx (it is not written to standard output)"))
			}
			if opts.Since != 0 && opts.Format != "xlsx" {
				return usageError(cmd, fmt.Errorf("--since needs a workbook (--format xlsx): CSV and JSON hold one ranking"))
			}
			if runF != nil {
				return runF(cmd.Context(), opts)
			}
			return runExport(cmd.Context(), opts)
		},
	}
	fl := cmd.Flags()
	fl.StringVarP(&opts.Out, "out", "o", "", "file to write (.xlsx, .csv or .json)")
	fl.VarP(format, "format", "f", "xlsx, csv or json (default: from --out's extension)")
	fl.Int64Var(&opts.Since, "since", 0, "add a Changes sheet: what changed since this revision")
	fl.Int64Var(&opts.Revision, "rev", 0, "rank the catalog as of this revision (0: latest)")
	addRankFlags(cmd, &opts.rankFlags, true)
	return cmd
}

func runExport(ctx context.Context, opts *exportOptions) error {
	prof, err := loadProfile(opts.Profile)
	if err != nil {
		return err
	}
	st, err := opts.app.openStore(ctx, opts.DB, true)
	if err != nil {
		return err
	}
	defer st.Close()
	res, cat, err := opts.app.rankAt(ctx, st, opts.Revision, prof, opts.rankFlags)
	if err != nil {
		return err
	}
	switch opts.Format {
	case "csv", "json":
		write := export.WriteJSON
		if opts.Format == "csv" {
			write = export.WriteCSV
		}
		r := topOf(res, opts.Top)
		if opts.Out == "" {
			return write(opts.app.Out, r)
		}
		if err := writeFileAtomic(opts.Out, func(f *os.File) error { return write(f, r) }); err != nil {
			return err
		}
		_, err := fmt.Fprintf(opts.app.ErrOut, "wrote %s (%s, %s)\n", opts.Out, opts.Format, plural(len(r.Targets), "target"))
		return err
	}
	info, err := opts.app.workbookInfo()
	if err != nil {
		return err
	}
	if opts.Since != 0 {
		before, _, err := opts.app.rankAt(ctx, st, opts.Since, prof, opts.rankFlags)
		if err != nil {
			return fmt.Errorf("ranking at revision %d: %w", opts.Since, err)
		}
		diffs, err := st.Diff(ctx, opts.Since, cat.Revision.ID)
		if err != nil {
			return err
		}
		info.Changes = buildChanges(cat, diffs, before, res)
		info.Since = opts.Since
	}
	if err := saveWorkbook(opts.Out, topOf(res, opts.Top), info); err != nil {
		return err
	}
	_, err = fmt.Fprintf(opts.app.ErrOut, "wrote %s (%s; profile %s, %d samples, seed %d, catalog revision %d)\n",
		opts.Out, plural(len(topOf(res, opts.Top).Targets), "target"), res.Profile, res.Samples, res.Seed, res.CatalogRevision)
	return err
}

// saveWorkbook writes a workbook with export.SaveWorkbook and makes it
// readable like any file the user writes (its temporary file is private).
func saveWorkbook(path string, r *rank.Result, info export.WorkbookInfo) error {
	if err := export.SaveWorkbook(path, r, info); err != nil {
		return err
	}
	return os.Chmod(path, 0o644)
}

// workbookInfo is the context of a workbook: the method text, version and a
// creation time from the app's clock (TIDESIFT_NOW in tests).
func (a *app) workbookInfo() (export.WorkbookInfo, error) {
	now, err := a.now()
	if err != nil {
		return export.WorkbookInfo{}, err
	}
	return export.WorkbookInfo{Method: methodsText(), Version: version(), Created: now()}, nil
}

// buildChanges turns a diff between two revisions and the rankings at both
// into the workbook's Changes sheet.
func buildChanges(cat *schema.Catalog, diffs []store.ValueChange, before, after *rank.Result) *export.Changes {
	ch := &export.Changes{InputChanges: []export.InputChange{}, RankMoves: []export.RankMove{}}
	for _, d := range diffs {
		ic := export.InputChange{Key: d.Key, Old: d.Old, New: d.New}
		switch d.Kind {
		case schema.KindMoon:
			ic.Moon, ic.Planet = d.Body, d.Parent
			if p := cat.Planet(d.Parent); p != nil {
				ic.Star = p.Parent
			}
		case schema.KindPlanet:
			ic.Planet, ic.Star = d.Body, d.Parent
		case schema.KindStar:
			ic.Star = d.Body
		}
		if d.New != nil {
			ic.Revision = d.New.Revision
		} else {
			ic.Revision = cat.Revision.ID
		}
		ch.InputChanges = append(ch.InputChanges, ic)
	}
	type key struct{ name, planet string }
	k := func(t *rank.Target) key { return key{schema.NameKey(t.Name), schema.NameKey(t.Planet)} }
	was := map[key]*rank.Target{}
	for i := range before.Targets {
		was[k(&before.Targets[i])] = &before.Targets[i]
	}
	seen := map[key]bool{}
	for i := range after.Targets {
		t := &after.Targets[i]
		m := export.RankMove{Name: t.Name, Planet: t.Planet, RankAfter: t.Rank, ScoreAfter: t.Score}
		if b, ok := was[k(t)]; ok {
			m.RankBefore, m.ScoreBefore = b.Rank, b.Score
		}
		seen[k(t)] = true
		ch.RankMoves = append(ch.RankMoves, m)
	}
	for i := range before.Targets {
		b := &before.Targets[i]
		if !seen[k(b)] {
			ch.RankMoves = append(ch.RankMoves, export.RankMove{Name: b.Name, Planet: b.Planet, RankBefore: b.Rank, ScoreBefore: b.Score})
		}
	}
	return ch
}

// writeFileAtomic writes path through a temporary file in the same directory
// and a rename, so a failure leaves no half-written file.
func writeFileAtomic(path string, write func(*os.File) error) (err error) {
	tmp, err := os.CreateTemp(filepath.Dir(path), ".tidesift-*.tmp")
	if err != nil {
		return fmt.Errorf("write %s: %w", path, err)
	}
	defer func() {
		if err != nil {
			tmp.Close()
			os.Remove(tmp.Name())
		}
	}()
	if err = write(tmp); err != nil {
		return fmt.Errorf("write %s: %w", path, err)
	}
	if err = tmp.Close(); err != nil {
		return fmt.Errorf("write %s: %w", path, err)
	}
	if err = os.Chmod(tmp.Name(), 0o644); err != nil {
		return fmt.Errorf("write %s: %w", path, err)
	}
	if err = os.Rename(tmp.Name(), path); err != nil {
		return fmt.Errorf("write %s: %w", path, err)
	}
	return nil
}
