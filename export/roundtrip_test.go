package export

import (
	"bytes"
	"encoding/csv"
	"strings"
	"testing"

	"tidesift/importers"
)

// importName writes name as the name cell of a one-row canonical CSV, as
// `tidesift list --format csv` does (through SafeText when safe is true),
// and returns the name the importers read back.
func importName(tb testing.TB, name string, safe bool) string {
	tb.Helper()
	cell := name
	if safe {
		cell = SafeText(name)
	}
	var b bytes.Buffer
	w := csv.NewWriter(&b)
	w.Write([]string{"name", "planet"})
	w.Write([]string{cell, "Vorlan"})
	w.Flush()
	res, err := importers.Read("list.csv", &b, importers.Options{})
	if err != nil {
		tb.Fatalf("import %q: %v", cell, err)
	}
	if len(res.Records) != 1 {
		tb.Fatalf("import %q: %d records, want 1", cell, len(res.Records))
	}
	return res.Records[0].Name
}

// TestCSVNamesRoundTrip checks that a name written by the CSV side and read by
// the importers comes back byte for byte, formula-like or not (names are
// invented).
func TestCSVNamesRoundTrip(t *testing.T) {
	for _, name := range []string{"=Kel", "+Ara", "-Ossa", "@Tiv", "=SUM(A1:A2)", "#Kel", "'Ara", "Kel", "Ara'+"} {
		if got := importName(t, name, true); got != name {
			t.Errorf("%q came back as %q", name, got)
		}
	}
}

// TestNeutralisationRule checks that export and importers use one rule, the
// two copies of the lead set (formulaLead here, formulaLead in importers)
// included: every name the export side neutralises comes back unchanged, and
// an apostrophe before any character it does not neutralise is kept by the
// import side as the name's own.
func TestNeutralisationRule(t *testing.T) {
	for b := range 0x80 { // SafeText replaces invalid UTF-8, so single bytes stop at ASCII
		switch b {
		case '"', '\n', ' ', '\t', '\r', '\v', '\f':
			continue // a name is trimmed of white space on import; quotes and newlines are CSV's own
		}
		name := string(rune(b)) + "Kel"
		if b == '#' { // written plain, the row would be a comment: only the neutralised form can come back
			if got := importName(t, name, true); got != name {
				t.Errorf("%q neutralised comes back as %q", name, got)
			}
			continue
		}
		if got, want := importName(t, name, true), importName(t, name, false); got != want {
			t.Errorf("byte %#x: %q neutralised comes back as %q, written plain as %q", b, name, got, want)
		}
		if !formulaLead(byte(b)) {
			if got := importName(t, "'"+name, false); got != "'"+name {
				t.Errorf("byte %#x: %q is not neutralised on export, but the import side read it as %q", b, "'"+name, got)
			}
		}
	}
	if s := SafeText("\tKel"); !strings.HasPrefix(s, "'") {
		t.Errorf("SafeText(tab Kel) = %q; the rule changed: update importers' formulaLead too", s)
	}
}
