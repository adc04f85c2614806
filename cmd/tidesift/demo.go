package main

import (
	"bytes"
	"context"
	"fmt"
	"os"
	"path/filepath"

	"github.com/spf13/cobra"

	"tidesift/export"
	"tidesift/importers"
	"tidesift/rank"
	"tidesift/sampledata"
	"tidesift/store"
)

type demoOptions struct {
	app     *app
	DB      string // catalog to build; "" builds one in a temporary directory
	Out     string // workbook to write
	Samples int
	Seed    uint64
}

func newDemoCmd(a *app, runF func(context.Context, *demoOptions) error) *cobra.Command {
	opts := &demoOptions{app: a}
	cmd := &cobra.Command{
		Use:   "demo",
		Short: "Build a catalog from the embedded, invented demo scenario and show it",
		Long: `Build a catalog from tidesift's embedded demo scenario and print it. The
scenario is invented: the Sun-like star Velmira with the cold giant Velmira b
and eight moons of different kinds, and the cooler star Teodra with the giant
Teodra b and four exomoon candidates with wide uncertainties and gaps. No value
describes a real body.

The demo imports the scenario, lists it, ranks it under the default profile
(ocean; 10,000 samples and seed 1 unless --samples and --seed say otherwise) and writes a review workbook, tidesift-demo.xlsx
in the working directory unless --out names another file. The catalog is built
in a temporary file that is removed afterwards, unless --db names a file to
keep (an existing catalog there gets the demo as one more revision, or nothing
if it has it already).

` + cautions,
		Example: `  tidesift demo
  tidesift demo --out /path/to/review-demo.xlsx
  tidesift --db demo.db demo && tidesift --db demo.db show Ilmeth`,
		Args: usageArgs(cobra.NoArgs),
		RunE: func(cmd *cobra.Command, args []string) error {
			if f := cmd.Flag("db"); f != nil && f.Changed {
				opts.DB = a.db
			}
			if opts.Samples < 1 {
				return usageError(cmd, fmt.Errorf("invalid --samples %d: want at least 1", opts.Samples))
			}
			if runF != nil {
				return runF(cmd.Context(), opts)
			}
			return runDemo(cmd.Context(), opts)
		},
	}
	cmd.Flags().StringVarP(&opts.Out, "out", "o", "tidesift-demo.xlsx", "workbook to write")
	cmd.Flags().IntVar(&opts.Samples, "samples", rank.DefaultSamples, "Monte Carlo samples per target")
	cmd.Flags().Uint64Var(&opts.Seed, "seed", 1, "random seed")
	return cmd
}

func runDemo(ctx context.Context, opts *demoOptions) error {
	w := opts.app.Out
	db := opts.DB
	if db == "" {
		dir, err := os.MkdirTemp("", "tidesift-demo-")
		if err != nil {
			return fmt.Errorf("demo: %w", err)
		}
		defer os.RemoveAll(dir)
		db = filepath.Join(dir, "demo.db")
	}
	st, err := opts.app.openStore(ctx, db, false)
	if err != nil {
		return err
	}
	defer st.Close()
	res, err := importers.Read(sampledata.DemoFileName, bytes.NewReader(sampledata.DemoCatalog()), importers.Options{})
	if err != nil {
		return fmt.Errorf("demo catalog: %w", err)
	}
	out, err := st.Import(ctx, store.ImportRequest{
		File: res.File, SHA256: res.SHA256, Records: res.Records,
		Note: "invented demo catalog (tidesift sample data)",
	})
	if err != nil {
		return fmt.Errorf("demo: import: %w", err)
	}
	fmt.Fprintln(w, "tidesift demo: an INVENTED catalog — no value describes a real body.")
	if opts.DB == "" {
		fmt.Fprintln(w, "The catalog lives in a temporary file, removed on exit; keep one with --db PATH.")
	} else {
		fmt.Fprintf(w, "Catalog: %s\n", opts.DB)
	}
	printImport(w, res, out, false)
	fmt.Fprintln(w)
	cat, err := st.Snapshot(ctx, 0)
	if err != nil {
		return err
	}
	if err := writeListTable(w, cat, filterMoons(cat, "", "")); err != nil {
		return err
	}

	prof, err := loadProfile(defaultProfile)
	if err != nil {
		return err
	}
	f := rankFlags{Samples: opts.Samples, Seed: opts.Seed, Profile: defaultProfile}
	ranking, err := opts.app.rankCatalog(ctx, cat, prof, f)
	if err != nil {
		return err
	}
	fmt.Fprintf(w, "\nRanking under the %q profile (%s):\n\n", prof.Name, prof.Description)
	if err := export.WriteTable(w, ranking, export.TableOptions{}); err != nil {
		return err
	}
	info, err := opts.app.workbookInfo()
	if err != nil {
		return err
	}
	if err := saveWorkbook(opts.Out, ranking, info); err != nil {
		return err
	}
	fmt.Fprintf(w, "\nWrote the review workbook %s (sheets: Ranking, Derived, Inputs, Drivers, Method).\n", opts.Out)
	fmt.Fprintln(w, "Next: 'tidesift methods' for the method, 'tidesift profile list' for other profiles.")
	return nil
}
