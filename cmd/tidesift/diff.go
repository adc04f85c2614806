package main

import (
	"context"
	"fmt"
	"strconv"

	"github.com/spf13/cobra"

	"tidesift/export"
	"tidesift/rank"
	"tidesift/schema"
	"tidesift/store"
)

type diffOptions struct {
	app *app
	DB  string
	rankFlags
	From   int64
	To     int64
	Format string
	Rank   bool // also rank both revisions and show how targets moved
}

func newDiffCmd(a *app, runF func(context.Context, *diffOptions) error) *cobra.Command {
	opts := &diffOptions{app: a}
	format := newFormatFlag("table", "table", "json")
	cmd := &cobra.Command{
		Use:   "diff REV_A REV_B",
		Short: "List the values added, removed and changed between two revisions",
		Long: `List every value added, removed or changed between revisions REV_A and REV_B
of the catalog ('tidesift revisions' lists them), with the body, the key and the
old and new values with their uncertainties. 0 stands for the latest revision.

With --rank, both revisions are also ranked under the same profile, seed and
samples, and each target's move in median rank and score is listed.`,
		Example: `  tidesift diff 1 2
  tidesift diff 1 0 --format json
  tidesift diff 1 2 --rank --profile tidal --samples 2000`,
		Args: usageArgs(cobra.ExactArgs(2)),
		RunE: func(cmd *cobra.Command, args []string) error {
			opts.DB = a.db
			opts.Format = format.value
			for i, p := range []*int64{&opts.From, &opts.To} {
				v, err := strconv.ParseInt(args[i], 10, 64)
				if err != nil || v < 0 {
					return usageError(cmd, fmt.Errorf("invalid revision %q: want a revision number (0: the latest)", args[i]))
				}
				*p = v
			}
			if err := opts.rankFlags.validate(cmd); err != nil {
				return err
			}
			if runF != nil {
				return runF(cmd.Context(), opts)
			}
			return runDiff(cmd.Context(), opts)
		},
	}
	cmd.Flags().VarP(format, "format", "f", "output format: table or json")
	cmd.Flags().BoolVar(&opts.Rank, "rank", false, "also show how each target's rank and score moved")
	addRankFlags(cmd, &opts.rankFlags, false)
	return cmd
}

// diffDoc is the JSON form of diff.
type diffDoc struct {
	From      int64        `json:"from"`
	To        int64        `json:"to"`
	Changes   []changeJSON `json:"changes"`
	RankMoves []moveJSON   `json:"rank_moves,omitempty"`
	Profile   string       `json:"profile,omitempty"`
	Samples   int          `json:"samples,omitempty"`
	Seed      uint64       `json:"seed,omitempty"`
}

// moveJSON is one target's move between the two revisions; a rank of 0
// means the target was not ranked at that revision.
type moveJSON struct {
	Name        string         `json:"name"`
	Planet      string         `json:"planet"`
	RankBefore  float64        `json:"rank_before"`
	RankAfter   float64        `json:"rank_after"`
	ScoreBefore rank.Quantiles `json:"score_before"`
	ScoreAfter  rank.Quantiles `json:"score_after"`
}

// changeJSON is one value change in `diff --format json`, in SI units.
type changeJSON struct {
	Change string     `json:"change"` // "added", "removed" or "changed"
	Kind   string     `json:"kind"`   // "moon", "planet" or "star"
	Body   string     `json:"body"`
	Parent string     `json:"parent,omitempty"`
	Key    string     `json:"key"`
	Old    *inputJSON `json:"old,omitempty"`
	New    *inputJSON `json:"new,omitempty"`
}

func changeKind(c store.ValueChange) string {
	switch {
	case c.Old == nil:
		return "added"
	case c.New == nil:
		return "removed"
	}
	return "changed"
}

func paramJSON(key string, p *schema.Param) *inputJSON {
	if p == nil {
		return nil
	}
	info, _ := schema.LookupKey(key)
	return &inputJSON{Key: key, Value: p.Value, Uncertainty: p.Unc, Unit: info.Unit, Source: p.Source, Revision: p.Revision, Status: p.Status}
}

func runDiff(ctx context.Context, opts *diffOptions) error {
	st, err := opts.app.openStore(ctx, opts.DB, true)
	if err != nil {
		return err
	}
	defer st.Close()
	changes, err := st.Diff(ctx, opts.From, opts.To)
	if err != nil {
		return err
	}
	var moves []export.RankMove
	var after *rank.Result
	if opts.Rank {
		prof, err := loadProfile(opts.Profile)
		if err != nil {
			return err
		}
		before, _, err := opts.app.rankAt(ctx, st, opts.From, prof, opts.rankFlags)
		if err != nil {
			return fmt.Errorf("ranking at revision %d: %w", opts.From, err)
		}
		var cat *schema.Catalog
		after, cat, err = opts.app.rankAt(ctx, st, opts.To, prof, opts.rankFlags)
		if err != nil {
			return fmt.Errorf("ranking at revision %d: %w", opts.To, err)
		}
		moves = buildChanges(cat, nil, before, after).RankMoves
	}
	w := opts.app.Out
	if opts.Format == "json" {
		doc := diffDoc{From: opts.From, To: opts.To, Changes: []changeJSON{}}
		for _, c := range changes {
			doc.Changes = append(doc.Changes, changeJSON{Change: changeKind(c), Kind: string(c.Kind), Body: c.Body, Parent: c.Parent,
				Key: c.Key, Old: paramJSON(c.Key, c.Old), New: paramJSON(c.Key, c.New)})
		}
		if after != nil {
			doc.Profile, doc.Samples, doc.Seed = after.Profile, after.Samples, after.Seed
			doc.RankMoves = []moveJSON{}
			for _, m := range moves {
				doc.RankMoves = append(doc.RankMoves, moveJSON(m))
			}
		}
		return writeJSON(w, doc)
	}
	if len(changes) == 0 {
		fmt.Fprintf(w, "no values differ between revisions %d and %d\n", opts.From, opts.To)
	} else if err := writeChangesTable(w, changes); err != nil {
		return err
	}
	if after == nil {
		return nil
	}
	fmt.Fprintf(w, "\nRank moves from revision %d to %d (profile %s, %d samples, seed %d; median ranks, 0 = not ranked):\n",
		opts.From, opts.To, after.Profile, after.Samples, after.Seed)
	tw := newTable(w)
	fmt.Fprintln(tw, "NAME\tPLANET\tRANK\tSCORE")
	for _, m := range moves {
		fmt.Fprintf(tw, "%s\t%s\t%s → %s\t%s → %s\n", m.Name, m.Planet, num(m.RankBefore, 4), num(m.RankAfter, 4),
			export.FormatRange(m.ScoreBefore, ""), export.FormatRange(m.ScoreAfter, ""))
	}
	if err := tw.Flush(); err != nil {
		return err
	}
	_, err = fmt.Fprintln(w, export.Caution)
	return err
}

func writeChangesTable(w interface{ Write([]byte) (int, error) }, changes []store.ValueChange) error {
	tw := newTable(w)
	fmt.Fprintln(tw, "CHANGE\tBODY\tKEY\tOLD\tNEW\tUNIT")
	for _, c := range changes {
		old, nw := "-", "-"
		if c.Old != nil {
			old = keyedText(c.Key, *c.Old)
		}
		if c.New != nil {
			nw = keyedText(c.Key, *c.New)
		}
		unit, _ := displayUnit(c.Key)
		body := c.Body
		if c.Parent != "" {
			body += " (" + c.Parent + ")"
		}
		fmt.Fprintf(tw, "%s\t%s\t%s\t%s\t%s\t%s\n", changeKind(c), body, c.Key, old, nw, orDash(unit))
	}
	return tw.Flush()
}
