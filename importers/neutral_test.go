package importers

import (
	"bytes"
	stdcsv "encoding/csv"
	"reflect"
	"strings"
	"testing"
)

// TestUnneutraliseTextCells reads text cells as tidesift's own CSV output
// writes them (export.SafeText puts an apostrophe before text starting with
// '=', '+', '-', '@', tab, CR or NUL) and checks that exactly that apostrophe
// is removed, in every text column, and nothing else. Names are invented.
func TestUnneutraliseTextCells(t *testing.T) {
	for _, tc := range []struct {
		name     string
		cell     string // as written in the file
		want     string // as imported
		wantSame bool   // the cell is kept byte for byte
	}{
		{"equals", "'=Kel", "=Kel", false},
		{"plus", "'+Ara", "+Ara", false},
		{"minus", "'-Ossa", "-Ossa", false},
		{"at", "'@Tiv", "@Tiv", false},
		{"NUL", "'\x00Nul", "\x00Nul", false},
		{"apostrophe then letter", "'Ara", "'Ara", true},
		{"apostrophe then digit", "'1 Kel", "'1 Kel", true},
		{"two apostrophes", "''=Kel", "''=Kel", true},
		{"apostrophe alone", "'", "'", true},
		{"apostrophe inside", "Kel'=", "Kel'=", true},
		{"plain", "Kel", "Kel", true},
	} {
		t.Run(tc.name, func(t *testing.T) {
			if tc.wantSame != (tc.cell == tc.want) {
				t.Fatalf("bad case: cell %q want %q", tc.cell, tc.want)
			}
			for _, comma := range []rune{',', '\t'} {
				var b bytes.Buffer
				w := stdcsv.NewWriter(&b)
				w.Comma = comma
				w.Write([]string{"name", "planet", "star", "alias", "source", "eccentricity", "eccentricity_source"})
				w.Write([]string{tc.cell, tc.cell + "P", tc.cell + "S", tc.cell + "A; Other", tc.cell + "R", "0.01", tc.cell + "E"})
				w.Flush()
				file := "moons.csv"
				if comma == '\t' {
					file = "moons.tsv"
				}
				res, err := Read(file, &b, Options{})
				if err != nil {
					t.Fatal(err)
				}
				r := res.Records[0]
				got := []string{r.Name, r.Planet, r.Star, strings.Join(r.Aliases, "|"), r.Source, r.Params[0].Source}
				want := []string{tc.want, tc.want + "P", tc.want + "S", tc.want + "A|Other", tc.want + "R", tc.want + "E"}
				if !reflect.DeepEqual(got, want) {
					t.Errorf("%s: got %q, want %q", file, got, want)
				}
			}
		})
	}
}

// TestMappedFileKeepsApostrophe checks that a foreign file read through a
// map keeps its text as written: only tidesift's own layout is unneutralised.
func TestMappedFileKeepsApostrophe(t *testing.T) {
	m, err := LoadMap(strings.NewReader("[columns]\n\"Sat\" = { key = \"name\" }\n\"Host\" = { key = \"planet\" }\n"))
	if err != nil {
		t.Fatal(err)
	}
	res, err := Read("foreign.csv", strings.NewReader("Sat,Host\n'=Kel,Vorlan\n"), Options{Map: m})
	if err != nil {
		t.Fatal(err)
	}
	if got := res.Records[0].Name; got != "'=Kel" {
		t.Errorf("name %q, want \"'=Kel\" as written", got)
	}
}

func TestFormulaLeadMatchesSafeCell(t *testing.T) {
	// The rejects report and the reader share one set of lead characters.
	for b := range 256 {
		s := string([]byte{byte(b)}) + "x"
		if got, want := safeCell(s) != s, formulaLead(byte(b)); got != want {
			t.Errorf("byte %#x: safeCell neutralises %v, formulaLead %v", b, got, want)
		}
		if got := unneutralise(safeCell(s)); got != s {
			t.Errorf("byte %#x: unneutralise(safeCell(%q)) = %q", b, s, got)
		}
	}
}
