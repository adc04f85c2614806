package export

import (
	"bytes"
	"slices"
	"strings"
	"testing"

	"tidesift/schema"
)

func TestWriteTable(t *testing.T) {
	tests := []struct {
		name   string
		opt    TableOptions
		golden string
	}{
		{"all", TableOptions{}, "table.golden"},
		{"top 2", TableOptions{Top: 2}, "table_top2.golden"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			var buf bytes.Buffer
			if err := WriteTable(&buf, sampleResult(), tt.opt); err != nil {
				t.Fatal(err)
			}
			out := buf.String()
			for _, want := range []string{"Velra b I*", "0.62 (0.48–0.71)", "P(top 2)", "k2_q (62%)", "seed 42", "4000 Monte Carlo samples", "profile ocean-worlds", "catalog revision 7", "not a substitute for expert review", "* marks a target with inputs assumed"} {
				if !strings.Contains(out, want) {
					t.Errorf("table lacks %q:\n%s", want, out)
				}
			}
			if strings.Contains(out, "\x1b") {
				t.Error("table holds terminal escapes")
			}
			checkGolden(t, tt.golden, buf.Bytes())
		})
	}
}

func TestWriteTableHostileNamesStayOnOneLine(t *testing.T) {
	var buf bytes.Buffer
	if err := WriteTable(&buf, hostileResult(), TableOptions{}); err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(buf.String(), "\n")
	if got := len(lines); got < 8 {
		t.Fatalf("%d lines", got)
	}
	for i, l := range lines[1:8] {
		if strings.ContainsAny(l, "\t\r") {
			t.Errorf("line %d holds a tab or CR: %q", i+2, l)
		}
	}
}

// TestAssumedMarkFollowsAssumedInputs: the table's and the workbook's mark
// come from rank.Target.AssumedInputs alone. A target whose only prior is a
// model parameter (rock_density: an assumed input with a prior, but never a
// catalog key) is not marked, and the Inputs sheet still names that prior.
func TestAssumedMarkFollowsAssumedInputs(t *testing.T) {
	rockPrior := "normal 3300 ± 250"
	tests := []struct {
		name     string
		assumed  []string
		wantMark bool
	}{
		{"missing catalog key", []string{"obliquity"}, true},
		{"model parameter only", []string{}, false},
		{"nil list", nil, false},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			r := sampleResult()
			r.Excluded = nil
			tg := &r.Targets[1] // Velra b II
			tg.AssumedInputs = tt.assumed
			tg.Inputs = append(tg.Inputs, schema.Param{Key: "rock_density", Value: 3300,
				Unc: schema.Uncertainty{Kind: schema.UncSymmetric, Sigma: 250}, Status: schema.StatusAssumed})
			tg.Priors = map[string]string{"rock_density": rockPrior}
			for _, k := range tt.assumed {
				tg.Priors[k] = "fixed 0"
			}

			var buf bytes.Buffer
			if err := WriteTable(&buf, r, TableOptions{}); err != nil {
				t.Fatal(err)
			}
			if got := strings.Contains(buf.String(), "Velra b II"+assumedMark); got != tt.wantMark {
				t.Errorf("table marks Velra b II: %v, want %v:\n%s", got, tt.wantMark, buf.String())
			}

			f := openBook(t, writeBook(t, r, testInfo(nil)))
			rows := rawRows(t, f, SheetRanking)
			col := map[string]int{}
			for j, h := range rows[0] {
				col[h] = j
			}
			row := rows[2]
			for len(row) < len(rows[0]) {
				row = append(row, "")
			}
			if row[col["Name"]] != "Velra b II" {
				t.Fatalf("Ranking row 3 is %q, want Velra b II", row[col["Name"]])
			}
			wantMark, wantList := "", strings.Join(tt.assumed, ", ")
			if tt.wantMark {
				wantMark = assumedMark
			}
			if got := row[col["Assumed inputs mark"]]; got != wantMark {
				t.Errorf("workbook mark %q, want %q", got, wantMark)
			}
			if got := row[col["Assumed inputs"]]; got != wantList {
				t.Errorf("workbook assumed inputs %q, want %q", got, wantList)
			}
			found := false
			for _, in := range rawRows(t, f, SheetInputs) {
				if slices.Contains(in, "Velra b II") && slices.Contains(in, "rock_density") {
					found = slices.Contains(in, rockPrior)
				}
			}
			if !found {
				t.Errorf("Inputs sheet lacks Velra b II's rock_density prior %q", rockPrior)
			}
		})
	}
}
