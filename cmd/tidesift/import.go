package main

import (
	"context"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"runtime/debug"
	"strings"

	"github.com/spf13/cobra"

	"tidesift/importers"
	"tidesift/schema"
	"tidesift/store"
)

type importOptions struct {
	app         *app
	DB          string
	Files       []string
	Note        string
	Format      string
	DryRun      bool
	SkipInvalid bool
	Rejects     string // with SkipInvalid: write the rejected rows here as CSV
	MaxErrors   int
	Map         string // column map file (TOML)
	SuggestMap  bool   // print a starter column map for each file; import nothing
	Sheet       string
	Table       string
}

func newImportCmd(a *app, runF func(context.Context, *importOptions) error) *cobra.Command {
	opts := &importOptions{app: a}
	format := newFormatFlag("", "csv", "tsv", "json", "xlsx", "votable")
	cmd := &cobra.Command{
		Use:   "import FILE...",
		Short: "Import tables of moons into the catalog, one revision per file",
		Long: `Import one or more files into the catalog. Each file becomes one revision
(time, file name, SHA-256, --note); a file imported before is a no-op, and a
file whose values are all in the catalog already makes no revision.

Files are in the canonical table layout: one row per moon, headers 'key [unit]',
uncertainty companions key_err, key_err_plus/key_err_minus, key_min/key_max,
key_factor, per-value sources in key_source and a row source in source. See
README.md for the keys and units.

A file in another layout (an archive table, a colleague's sheet) is read
through a column map: --suggest-map prints a starter map guessed from the
file's column names, units and VOTable UCDs; edit it and import with --map.
CSV, TSV, JSON, XLSX (--sheet) and VOTable (--table) are detected from the
extension and the content; --format forces one.

Every file is read and validated before anything is written. If any file has a
problem, every problem found is printed with its file, row and column, nothing
is written, and the exit status is 3. With --skip-invalid the valid rows are
imported and the rejected ones reported (to --rejects FILE as CSV, or on
standard error). A partial file (some columns, some rows) updates just those
values; each value it replaces is kept in the history.`,
		Example: `  tidesift import moons.csv --note "values from the 2026 review"
  tidesift import a.csv b.csv
  tidesift import update.csv --dry-run
  tidesift import archive.vot --suggest-map > map.toml
  tidesift import archive.vot --map map.toml --skip-invalid --rejects rejects.csv`,
		Args: usageArgs(cobra.MinimumNArgs(1)),
		RunE: func(cmd *cobra.Command, args []string) error {
			opts.DB = a.db
			opts.Files = args
			opts.Format = format.value
			if opts.Rejects != "" && !opts.SkipInvalid {
				return usageError(cmd, fmt.Errorf("--rejects needs --skip-invalid (without it, a file with a bad row is refused whole)"))
			}
			if opts.Rejects != "" && len(args) > 1 {
				return usageError(cmd, fmt.Errorf("--rejects takes one FILE to import, not %d; import the files one at a time", len(args)))
			}
			if opts.SuggestMap && (opts.Map != "" || opts.DryRun || opts.SkipInvalid) {
				return usageError(cmd, fmt.Errorf("--suggest-map only reads the files' columns; it takes none of --map, --dry-run, --skip-invalid"))
			}
			if opts.MaxErrors < 0 {
				return usageError(cmd, fmt.Errorf("invalid --max-errors %d: want a count ≥ 1, or 0 for the default", opts.MaxErrors))
			}
			if runF != nil {
				return runF(cmd.Context(), opts)
			}
			return runImport(cmd.Context(), opts)
		},
	}
	cmd.Flags().StringVar(&opts.Note, "note", "", "a note kept with each revision")
	cmd.Flags().Var(format, "format", "file format: csv, tsv, json, xlsx or votable (default: detect)")
	cmd.Flags().BoolVar(&opts.DryRun, "dry-run", false, "say what would be added, changed and unchanged; write nothing")
	cmd.Flags().BoolVar(&opts.SkipInvalid, "skip-invalid", false, "import the valid rows and report the rejected ones")
	cmd.Flags().StringVar(&opts.Rejects, "rejects", "", "with --skip-invalid: write the rejected rows and their reasons to this CSV file")
	cmd.Flags().IntVar(&opts.MaxErrors, "max-errors", 0, "stop listing problems after this many per file (0: 50)")
	cmd.Flags().StringVar(&opts.Map, "map", "", "column map (TOML) for a file in a foreign layout")
	cmd.Flags().BoolVar(&opts.SuggestMap, "suggest-map", false, "print a starter column map for each FILE (guessed from names, units, UCDs); import nothing")
	cmd.Flags().StringVar(&opts.Sheet, "sheet", "", "workbook sheet to read (default: the first)")
	cmd.Flags().StringVar(&opts.Table, "table", "", "VOTable TABLE to read, by name or 1-based index (default: the first)")
	return cmd
}

func runImport(ctx context.Context, opts *importOptions) error {
	ropt := importers.Options{Format: opts.Format, MaxErrors: opts.MaxErrors, SkipInvalid: opts.SkipInvalid,
		Sheet: opts.Sheet, Table: opts.Table}
	if opts.SuggestMap {
		return suggestMaps(opts, ropt)
	}
	if opts.Map != "" {
		m, err := loadMap(opts.Map)
		if err != nil {
			return err
		}
		ropt.Map = m
	}
	limitMemory()
	if len(opts.Files) > 1 {
		// One bad file refuses the whole command: check every file before
		// the first is written (a reading pass that keeps no records).
		if err := checkAll(opts.Files, ropt); err != nil {
			return err
		}
	}
	db := opts.DB
	if _, err := os.Stat(db); opts.DryRun && errors.Is(err, fs.ErrNotExist) {
		// A dry run against no catalog compares with an empty one, and
		// leaves no file behind.
		db = ":memory:"
	}
	st, err := opts.app.openStore(ctx, db, false)
	if err != nil {
		return err
	}
	defer st.Close()
	for _, path := range opts.Files {
		if err := importFile(ctx, opts, ropt, st, path); err != nil {
			return err
		}
	}
	return nil
}

// importFile streams one file into the catalog: records go to the store as
// they are read, in one transaction, so memory stays flat in the file's size
// and a problem anywhere in the file writes nothing.
func importFile(ctx context.Context, opts *importOptions, ropt importers.Options, st *store.Store, path string) error {
	sum, err := hashFile(path)
	if err != nil {
		return fmt.Errorf("import %s: %w", path, err)
	}
	var res *importers.Result
	rows := 0
	out, err := st.ImportStream(ctx, store.ImportRequest{File: path, SHA256: sum, Note: opts.Note, DryRun: opts.DryRun, OmitAdded: true, MaxChanges: listedChanges},
		func(yield func(*schema.Record) error) error {
			res, rows = nil, 0
			f, err := os.Open(path)
			if err != nil {
				return err
			}
			defer f.Close()
			r, err := importers.ReadStream(path, f, ropt, func(rec *schema.Record) error {
				rows++
				return yield(rec)
			})
			if err != nil {
				return err
			}
			if r.SHA256 != sum {
				return fmt.Errorf("the file changed while it was being imported; import it again")
			}
			res = r
			return nil
		})
	if err == nil && out.Duplicate != nil && opts.SkipInvalid {
		// The store did not read the file; the rejects are still reported.
		f, ferr := os.Open(path)
		if ferr != nil {
			return fmt.Errorf("import %s: %w", path, ferr)
		}
		res, err = importers.ReadStream(path, f, ropt, func(*schema.Record) error { return nil })
		f.Close()
	}
	if err != nil {
		var se *store.SourceError
		if errors.As(err, &se) {
			if isValidation(se.Err) {
				return refusedError(fmt.Errorf("import refused, nothing was written:\n%s", se.Err.Error()))
			}
			return fmt.Errorf("import %s: %w", path, se.Err)
		}
		if isValidation(err) {
			return refusedError(fmt.Errorf("import refused, nothing was written:\n%s", err.Error()))
		}
		return fmt.Errorf("import %s: %w", path, err)
	}
	if res == nil {
		res = &importers.Result{File: path}
	}
	if err := reportRejects(opts, res); err != nil {
		return err
	}
	for _, w := range res.Warnings {
		fmt.Fprintf(opts.app.ErrOut, "tidesift: %s: warning: %s\n", path, w)
	}
	printImportRows(opts.app.Out, res, rows, out, opts.DryRun)
	return nil
}

// importMemory is the Go heap's soft limit during an import (unless
// GOMEMLIMIT says otherwise), and importGC its collection target (unless
// GOGC says otherwise). An import's live heap is small and flat (a few tens
// of MiB: batches in flight, bounded caches) while its rows make much
// garbage, so the collector may let the heap grow to several times the live
// part, which cost about a tenth of a large import's time at the default of
// 100 (bench/import.sh), but never past the limit: peak memory stays flat in
// the file's size. SQLite's page cache (32 MiB) comes on top.
const (
	importMemory = 160 << 20
	importGC     = 400
)

func limitMemory() {
	if os.Getenv("GOMEMLIMIT") == "" {
		debug.SetMemoryLimit(importMemory)
	}
	if os.Getenv("GOGC") == "" {
		debug.SetGCPercent(importGC)
	}
}

// hashFile returns the hex SHA-256 of a file's bytes.
func hashFile(path string) (string, error) {
	f, err := os.Open(path)
	if err != nil {
		return "", err
	}
	defer f.Close()
	h := sha256.New()
	if _, err := io.Copy(h, f); err != nil {
		return "", err
	}
	return hex.EncodeToString(h.Sum(nil)), nil
}

// suggestMaps prints a starter column map for each file.
func suggestMaps(opts *importOptions, ropt importers.Options) error {
	for i, path := range opts.Files {
		f, err := os.Open(path)
		if err != nil {
			return fmt.Errorf("suggest a map: %w", err)
		}
		m, err := importers.SuggestMap(path, f, ropt)
		f.Close()
		if err != nil {
			return err
		}
		if len(opts.Files) > 1 {
			if i > 0 {
				fmt.Fprintln(opts.app.Out)
			}
			fmt.Fprintf(opts.app.Out, "# ---- map for %s\n", path)
		}
		if _, err := fmt.Fprint(opts.app.Out, m); err != nil {
			return err
		}
	}
	return nil
}

// loadMap reads a column map file; its problems are a refusal like a bad
// file's.
func loadMap(path string) (*importers.Map, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, fmt.Errorf("column map: %w", err)
	}
	defer f.Close()
	m, err := importers.LoadMap(f)
	if err != nil {
		return nil, refusedError(fmt.Errorf("column map %s: %w", path, err))
	}
	return m, nil
}

// reportRejects says which rows --skip-invalid left out: into the --rejects
// file when given, else on standard error.
func reportRejects(opts *importOptions, res *importers.Result) error {
	if len(res.Rejects) == 0 {
		if opts.Rejects != "" {
			// An empty report still says that nothing was rejected.
			return writeRejectsFile(opts.Rejects, res)
		}
		return nil
	}
	fmt.Fprintf(opts.app.ErrOut, "%s: %s rejected\n", res.File, plural(len(res.Rejects), "row"))
	if opts.Rejects != "" {
		if err := writeRejectsFile(opts.Rejects, res); err != nil {
			return err
		}
		fmt.Fprintf(opts.app.ErrOut, "rejected rows and their reasons are in %s\n", opts.Rejects)
		return nil
	}
	for _, r := range res.Rejects {
		fmt.Fprintf(opts.app.ErrOut, "  row %d: %s\n", r.Row, r.Reason)
	}
	return nil
}

func writeRejectsFile(path string, res *importers.Result) error {
	f, err := os.Create(path)
	if err != nil {
		return fmt.Errorf("rejects report: %w", err)
	}
	if err := importers.WriteRejects(f, res.File, res.Rejects); err != nil {
		f.Close()
		return fmt.Errorf("rejects report %s: %w", path, err)
	}
	return f.Close()
}

// checkAll reads and validates every file before anything is written, so one
// bad file refuses the whole command. A file that cannot be opened is an
// ordinary error; a file with invalid content is a refusal (exit status 3)
// listing every problem found.
func checkAll(files []string, ropt importers.Options) error {
	var problems []string
	for _, path := range files {
		f, err := os.Open(path)
		if err != nil {
			return fmt.Errorf("import %s: %w", path, err)
		}
		_, err = importers.ReadStream(path, f, ropt, func(*schema.Record) error { return nil })
		f.Close()
		if err != nil {
			if !isValidation(err) {
				return fmt.Errorf("import %s: %w", path, err)
			}
			problems = append(problems, err.Error())
		}
	}
	if len(problems) > 0 {
		return refusedError(fmt.Errorf("import refused, nothing was written:\n%s", strings.Join(problems, "\n")))
	}
	return nil
}

// isValidation reports whether err is about a file's content (a refusal)
// rather than about reading it.
func isValidation(err error) bool {
	var list *importers.ErrorList
	var pe *importers.ParseError
	// The store's own checks over the whole file (a moon twice, a planet's
	// rows disagreeing, a name matching several moons) refuse it too.
	return errors.As(err, &list) || errors.As(err, &pe) ||
		errors.Is(err, store.ErrConflict) || errors.Is(err, store.ErrDuplicate) || errors.Is(err, store.ErrAmbiguous)
}

func printImport(w io.Writer, res *importers.Result, out *store.ImportResult, dryRun bool) {
	printImportRows(w, res, len(res.Records), out, dryRun)
}

// printImportRows is printImport for a streamed file: rows is the number of
// records imported.
func printImportRows(w io.Writer, res *importers.Result, rows int, out *store.ImportResult, dryRun bool) {
	switch {
	case out.Duplicate != nil:
		fmt.Fprintf(w, "%s: unchanged: already imported as revision %d\n", res.File, out.Duplicate.ID)
		return
	case dryRun:
		fmt.Fprintf(w, "%s: dry run, nothing written: would add %s, change %d, leave %d unchanged; %d new bodies\n",
			res.File, plural(out.Added, "value"), out.Changed, out.Unchanged, out.NewBodies)
	case out.Revision == nil:
		fmt.Fprintf(w, "%s: unchanged: all %d values are already in the catalog; no revision made\n", res.File, out.Unchanged)
		return
	default:
		fmt.Fprintf(w, "%s: revision %d: %s; %s added, %d changed, %d unchanged; %d new bodies\n",
			res.File, out.Revision.ID, plural(rows, "row"), plural(out.Added, "value"), out.Changed, out.Unchanged, out.NewBodies)
	}
	listed := 0
	for _, c := range out.Changes {
		if c.Old == nil || c.New == nil {
			continue // additions are counted, not listed
		}
		fmt.Fprintf(w, "  changed %s: %s → %s\n", bodyLabel(c), keyedText(c.Key, *c.Old), keyedText(c.Key, *c.New))
		listed++
	}
	if more := out.Changed - listed; more > 0 && listed > 0 {
		how := "tidesift diff lists them all"
		if out.Revision != nil && !dryRun {
			how = fmt.Sprintf("tidesift diff %d %d lists them all", out.Revision.ID-1, out.Revision.ID)
		}
		fmt.Fprintf(w, "  … and %s; %s\n", plural(more, "more changed value"), how)
	}
}

// listedChanges is how many changed values an import lists; the rest are
// counted (a large update would otherwise print, and hold, every one).
const listedChanges = 200

// bodyLabel names the body and key of a change, e.g. "Varkesh (Velmira b) k2_q".
func bodyLabel(c store.ValueChange) string {
	s := c.Body
	if c.Parent != "" {
		s += " (" + c.Parent + ")"
	}
	return s + " " + c.Key
}
