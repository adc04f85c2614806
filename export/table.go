package export

import (
	"errors"
	"fmt"
	"io"
	"text/tabwriter"

	"tidesift/rank"
)

// TableOptions adjust WriteTable.
type TableOptions struct {
	// Top shows only the first Top targets (0: all). The footer says how many
	// were left out.
	Top int
}

// Caution is the sentence every human-facing output carries.
const Caution = "Scores are a triage aid on simplified models; not a substitute for expert review."

// assumedMark flags a target that rests on a profile prior instead of a
// catalog value: one with at least one entry in rank.Target.AssumedInputs.
// Model parameters that every target takes from the profile alike do not
// count, so the mark tells targets apart.
const assumedMark = "*"

// WriteTable writes the terminal table of `tidesift rank`: median rank with
// its 5–95 % interval, name (marked * when a missing catalog value was
// assumed from a prior), planet, score median with its range, P(rank ≤ k),
// ocean probability and the input that drives most of the score's
// uncertainty, then a footer explaining the mark, the run (samples, seed,
// profile, catalog revision) and the caution.
// The text is plain (no colours, no terminal control) and aligned with
// text/tabwriter, so it is stable enough for goldens.
func WriteTable(w io.Writer, r *rank.Result, opt TableOptions) error {
	if r == nil {
		return errors.New("write table: no ranking result")
	}
	n := len(r.Targets)
	if opt.Top > 0 && opt.Top < n {
		n = opt.Top
	}
	tw := tabwriter.NewWriter(w, 0, 8, 2, ' ', 0)
	fmt.Fprintf(tw, "Rank\tName\tPlanet\tScore\tP(top %d)\tP(ocean)\tMain driver\n", r.TopK)
	marked := false
	for i := 0; i < n; i++ {
		t := &r.Targets[i]
		name := t.Name
		if len(t.AssumedInputs) > 0 {
			name += assumedMark
			marked = true
		}
		driver := "–"
		if d, ok := mainDriver(t); ok {
			driver = d.Input + " (" + formatShare(d.Share) + ")"
		}
		fmt.Fprintf(tw, "%s\t%s\t%s\t%s\t%s\t%s\t%s\n",
			formatRankRange(t), tableText(name), tableText(t.Planet),
			FormatRange(t.Score, ""), formatProb(t.PTop.P),
			formatProb(t.Metrics.OceanProbability), tableText(driver))
	}
	if err := tw.Flush(); err != nil {
		return fmt.Errorf("write table: %w", err)
	}
	var err error
	put := func(format string, a ...any) {
		if err == nil {
			_, err = fmt.Fprintf(w, format, a...)
		}
	}
	if len(r.Targets) == 0 {
		put("(no targets)\n")
	}
	put("\n")
	if n < len(r.Targets) {
		put("Showing %d of %d targets.\n", n, len(r.Targets))
	}
	if marked {
		put("%s marks a target with inputs assumed from the profile's priors in place of missing catalog values.\n", assumedMark)
	}
	if n := len(r.Excluded); n > 0 {
		const listed = 5
		put("Not ranked (missing inputs): %d moon(s)", n)
		for i, e := range r.Excluded {
			if i == listed {
				put("; …")
				break
			}
			sep := "; "
			if i == 0 {
				sep = ": "
			}
			put("%s%s", sep, tableText(excludedText(e)))
		}
		put(".\n")
	}
	put("Ranges are 5th–95th percentiles over %d Monte Carlo samples; seed %d; profile %s; catalog revision %d.\n",
		r.Samples, r.Seed, r.Profile, r.CatalogRevision)
	put("%s\n", Caution)
	if err != nil {
		return fmt.Errorf("write table: %w", err)
	}
	return nil
}

// tableText keeps a cell on one line and free of tabs, which would break the
// alignment (a catalog name is free text).
func tableText(s string) string {
	b := []rune(s)
	for i, c := range b {
		if c == '\t' || c == '\n' || c == '\r' || c < 0x20 {
			b[i] = ' '
		}
	}
	return string(b)
}
