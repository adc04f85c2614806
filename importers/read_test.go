package importers

import (
	"bytes"
	"crypto/sha256"
	stdcsv "encoding/csv"
	"encoding/hex"
	"errors"
	"io"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"tidesift/importers/csv"
	"tidesift/schema"
)

func near(tb testing.TB, what string, got, want, rel float64) {
	tb.Helper()
	if d := math.Abs(got-want) / math.Max(math.Abs(want), 1e-300); d > rel || math.IsNaN(got) {
		tb.Errorf("%s = %.17g, want %.17g (relative difference %.3g)", what, got, want, d)
	}
}

func mustRead(tb testing.TB, name, in string, opt Options) *Result {
	tb.Helper()
	res, err := Read(name, strings.NewReader(in), opt)
	if err != nil {
		tb.Fatalf("Read(%s): %v", name, err)
	}
	return res
}

// mustFail reads in, which must fail, and returns the problems.
func mustFail(tb testing.TB, in string, opt Options) *ErrorList {
	tb.Helper()
	res, err := Read("moons.csv", strings.NewReader(in), opt)
	if err == nil {
		tb.Fatalf("Read succeeded with %d records; want an error", len(res.Records))
	}
	if res != nil {
		tb.Errorf("a failed Read returned a result (%d records); all-or-nothing wants none", len(res.Records))
	}
	var l *ErrorList
	if !errors.As(err, &l) {
		tb.Fatalf("error %T %v; want *ErrorList", err, err)
	}
	return l
}

func param(tb testing.TB, r schema.Record, key string) schema.Param {
	tb.Helper()
	for _, p := range r.Params {
		if p.Key == key {
			return p
		}
	}
	tb.Fatalf("record %q has no %s", r.Name, key)
	return schema.Param{}
}

func hasParam(r schema.Record, key string) bool {
	for _, p := range r.Params {
		if p.Key == key {
			return true
		}
	}
	return false
}

func TestCanonicalFixture(t *testing.T) {
	b, err := os.ReadFile(filepath.Join("testdata", "canonical.csv"))
	if err != nil {
		t.Fatal(err)
	}
	res := mustRead(t, "canonical.csv", string(b), Options{})
	sum := sha256.Sum256(b)
	if res.SHA256 != hex.EncodeToString(sum[:]) {
		t.Errorf("SHA256 %s, want %x", res.SHA256, sum)
	}
	if res.Format != "csv" || len(res.Records) != 4 || res.Rows != 4 {
		t.Fatalf("format %q, %d records, %d rows; want csv, 4, 4", res.Format, len(res.Records), res.Rows)
	}
	n := res.Records[0]
	if n.Name != "Nerith" || n.Planet != "Vorlan" || n.Star != "Ossery" || n.Row != 4 || n.File != "canonical.csv" {
		t.Errorf("first record %+v", n)
	}
	if strings.Join(n.Aliases, "|") != "Vorlan I|Ner" {
		t.Errorf("aliases %q", n.Aliases)
	}
	if n.Source != "Invented survey A (2026)" || param(t, n, "mass").Source != "Invented mass paper (2026)" {
		t.Errorf("sources %q / %q", n.Source, param(t, n, "mass").Source)
	}
	for i := 1; i < len(n.Params); i++ {
		if n.Params[i-1].Key >= n.Params[i].Key {
			t.Errorf("params not sorted by key: %s before %s", n.Params[i-1].Key, n.Params[i].Key)
		}
	}
	// Conversions, with the constants' sources in units/constants.go.
	m := param(t, n, "mass")
	near(t, "mass", m.Value, 8.1e22, 1e-15)
	if m.Unc.Kind != schema.UncSymmetric {
		t.Errorf("mass uncertainty %v", m.Unc)
	}
	near(t, "mass σ", m.Unc.Sigma, 0.2e22, 1e-15)
	r := param(t, n, "radius")
	near(t, "radius (km → m)", r.Value, 1.79e6, 1e-15)
	near(t, "radius +σ", r.Unc.Plus, 12e3, 1e-15)
	near(t, "radius −σ", r.Unc.Minus, 9e3, 1e-15)
	near(t, "obliquity (deg → rad)", param(t, n, "obliquity").Value, 0.02*math.Pi/180, 1e-15)
	near(t, "period (d → s)", param(t, n, "period").Value, 1.71*86400, 1e-15)
	near(t, "density (g/cm3 → kg/m3)", param(t, n, "density").Value, 3400, 1e-15)
	k := param(t, n, "k2_q")
	if k.Unc.Kind != schema.UncFactor || k.Unc.Factor != 3 {
		t.Errorf("k2_q uncertainty %+v", k.Unc)
	}
	// IAU 2015 B3: M_J = GM_J / G; R_J = 7.1492e7 m. IAU 2012 B2: au.
	near(t, "planet_mass", param(t, n, "planet_mass").Value, 1.02*1.2668653e17/6.67430e-11, 1e-14)
	near(t, "planet_radius", param(t, n, "planet_radius").Value, 1.05*7.1492e7, 1e-15)
	near(t, "star_distance", param(t, n, "star_distance").Value, 5.3*149597870700, 1e-15)
	near(t, "star_luminosity", param(t, n, "star_luminosity").Value, 1.01*3.828e26, 1e-15)
	c := res.Records[1]
	if u := param(t, c, "bond_albedo").Unc; u.Kind != schema.UncRange || u.Min != 0.55 || u.Max != 0.72 {
		t.Errorf("range %+v", u)
	}
	// Missing values ("--", NaN, empty) are absent, never zero.
	x := res.Records[3]
	if x.Name != "Tessup Minor" {
		t.Errorf("name %q: runs of spaces should collapse", x.Name)
	}
	for _, key := range []string{"mass", "eccentricity", "period", "k2_q", "bond_albedo"} {
		if hasParam(x, key) {
			t.Errorf("%s should be missing, got %+v", key, param(t, x, key))
		}
	}
}

func TestLineEndingsAndBOM(t *testing.T) {
	lf := "name,planet,mass [kg]\nA,P,1e20\nB,P,2e20\n"
	want := mustRead(t, "lf.csv", lf, Options{})
	for name, in := range map[string]string{
		"crlf":  strings.ReplaceAll(lf, "\n", "\r\n"),
		"mixed": "name,planet,mass [kg]\r\nA,P,1e20\nB,P,2e20\r",
		"bom":   "\xef\xbb\xbf" + strings.ReplaceAll(lf, "\n", "\r\n"),
	} {
		got := mustRead(t, name+".csv", in, Options{})
		if len(got.Records) != 2 {
			t.Fatalf("%s: %d records", name, len(got.Records))
		}
		for i := range want.Records {
			a, b := want.Records[i], got.Records[i]
			if a.Name != b.Name || a.Row != b.Row || a.Params[0] != b.Params[0] {
				t.Errorf("%s: record %d = %+v, want %+v", name, i, b, a)
			}
		}
	}
}

func TestTSVAndDetection(t *testing.T) {
	in := "name\tplanet\tradius [km]\nA\tP\t100\n"
	for _, name := range []string{"moons.tsv", "moons.txt"} {
		res := mustRead(t, name, in, Options{})
		if res.Format != "tsv" || len(res.Records) != 1 {
			t.Errorf("%s: format %q, %d records", name, res.Format, len(res.Records))
		}
	}
	cases := []struct{ name, head, want string }{
		{"x.csv", "a,b", "csv"},
		{"x.tsv", "a\tb", "tsv"},
		{"x.TSV", "a\tb", "tsv"},
		{"x.json", "[", "json"},
		{"x", " [{\"name\":1}]", "json"},
		{"x.jsonl", "{", "json"},
		{"x.dat", "PK\x03\x04", "xlsx"},
		{"x.csv", "PK\x03\x04", "xlsx"},
		{"x.xml", "<?xml", "votable"},
		{"x", "\xef\xbb\xbf<VOTABLE", "votable"},
		{"x.vot", "", "votable"},
		{"x", "# c\na\tb", "tsv"},
		{"x", "a,b\tc", "csv"},
	}
	for _, c := range cases {
		if got := detectFormat(c.name, []byte(c.head)); got != c.want {
			t.Errorf("detectFormat(%q, %q) = %q, want %q", c.name, c.head, got, c.want)
		}
	}
	l := mustFail(t, in, Options{Format: "yaml"})
	if !errors.Is(l, ErrUnknownFormat) {
		t.Errorf("forced unknown format: %v", l)
	}
}

const head = "name,planet,star,mass [kg],mass_err,radius [km],eccentricity,bond_albedo,bond_albedo_min,bond_albedo_max,planet_mass [jupiterMass]\n"

// TestValidationErrors has one case per problem Read reports. Each names the
// sentinel, the row and column the message must name, and a phrase of the
// expectation it must state.
func TestValidationErrors(t *testing.T) {
	good := "Nerith,Vorlan,Ossery,8.1e22,1e21,1790,0.005,0.5,0.4,0.6,1.02\n"
	cases := []struct {
		name   string
		in     string
		is     error
		row    int
		column string
		says   string
	}{
		{"unknown column", "name,planet,mass_sat\nA,P,1\n", ErrUnknownColumn, 1, "mass_sat", "--map"},
		{"unknown column with close spelling", "name,planet,radus [km]\nA,P,1\n", ErrUnknownColumn, 1, "radus [km]", "close: radius"},
		{"unknown unit", "name,planet,mass [kgs]\nA,P,1\n", ErrUnknownUnit, 1, "mass [kgs]", "close spellings: kg"},
		{"wrong unit", "name,planet,mass [km]\nA,P,1\n", ErrWrongUnit, 1, "mass [km]", "unit km is a length; mass wants a mass unit such as kg, earthMass"},
		{"angle for a pure number", "name,planet,eccentricity [deg]\nA,P,1\n", ErrWrongUnit, 1, "eccentricity [deg]", "dimensionless"},
		{"missing unit", "name,planet,mass\nA,P,1\n", ErrMissingUnit, 1, "mass", `"mass [kg]"`},
		{"missing unit of obliquity", "name,planet,obliquity\nA,P,1\n", ErrMissingUnit, 1, "obliquity", "angle"},
		{"not a number", head + "Nerith,Vorlan,Ossery,abc,,,,,,,\n", ErrNotNumber, 2, "mass [kg]", `value "abc"`},
		{"hex is not a number", head + "Nerith,Vorlan,Ossery,0x1p3,,,,,,,\n", ErrNotNumber, 2, "mass [kg]", "decimal number"},
		{"signed hex is not a number", head + "Nerith,Vorlan,Ossery,+0X_1p3,,,,,,,\n", ErrNotNumber, 2, "mass [kg]", "decimal number"},
		{"digit separators are not a number", head + "Nerith,Vorlan,Ossery,8_100,,,,,,,\n", ErrNotNumber, 2, "mass [kg]", "decimal number"},
		{"a comma decimal is not a number", head + "Nerith,Vorlan,Ossery,\"8,1e22\",,,,,,,\n", ErrNotNumber, 2, "mass [kg]", "decimal number"},
		{"Inf", head + "Nerith,Vorlan,Ossery,Inf,,,,,,,\n", schema.ErrNotFinite, 2, "mass [kg]", "infinity"},
		{"-Inf", head + "Nerith,Vorlan,Ossery,,,,-inf,,,,\n", schema.ErrNotFinite, 2, "eccentricity", "not a finite number"},
		{"beyond float64", head + "Nerith,Vorlan,Ossery,1e400,,,,,,,\n", schema.ErrNotFinite, 2, "mass [kg]", "range"},
		{"mass zero", head + "Nerith,Vorlan,Ossery,0,,,,,,,\n", schema.ErrOutOfDomain, 2, "mass [kg]", "(0, +Inf)"},
		{"mass negative", head + "Nerith,Vorlan,Ossery,-5,,,,,,,\n", schema.ErrOutOfDomain, 2, "mass [kg]", "expected (0, +Inf)"},
		{"radius zero", head + "Nerith,Vorlan,Ossery,,,0,,,,,\n", schema.ErrOutOfDomain, 2, "radius [km]", "radius = 0"},
		{"eccentricity one", head + "Nerith,Vorlan,Ossery,,,,1,,,,\n", schema.ErrOutOfDomain, 2, "eccentricity", "[0, 1)"},
		{"albedo above one", head + "Nerith,Vorlan,Ossery,,,,,1.2,,,\n", schema.ErrOutOfDomain, 2, "bond_albedo", "[0, 1]"},
		{"negative uncertainty", head + "Nerith,Vorlan,Ossery,8e22,-1e21,,,,,,\n", schema.ErrNegativeUncertainty, 2, "mass_err", "σ ≥ 0"},
		{"min above max", head + "Nerith,Vorlan,Ossery,,,,,0.5,0.7,0.6,\n", schema.ErrMinAboveMax, 2, "bond_albedo_min", "min ≤ max"},
		{"value outside its range", head + "Nerith,Vorlan,Ossery,,,,,0.9,0.4,0.6,\n", ErrValueOutsideRange, 2, "bond_albedo", "within [0.4, 0.6]"},
		{"min without max", head + "Nerith,Vorlan,Ossery,,,,,0.5,0.4,,\n", ErrUncertaintyForm, 2, "bond_albedo_min", "without bond_albedo_max"},
		{"uncertainty without value", head + "Nerith,Vorlan,Ossery,,1e21,,,,,,\n", ErrUncertaintyForm, 2, "mass_err", "value is missing"},
		{"two uncertainty forms", "name,planet,mass [kg],mass_err,mass_factor\nA,P,1e20,1e19,2\n", ErrUncertaintyForm, 2, "mass [kg]", "2 uncertainty forms"},
		{"factor below one", "name,planet,k2_q,k2_q_factor\nA,P,0.01,0.5\n", schema.ErrOutOfDomain, 2, "k2_q_factor", "≥ 1"},
		{"companion without value column", "name,planet,mass_err [kg]\nA,P,1\n", ErrUncertaintyForm, 1, "mass_err [kg]", "no value column"},
		{"err_plus without err_minus column", "name,planet,mass [kg],mass_err_plus\nA,P,1e20,1e19\n", ErrUncertaintyForm, 2, "mass_err_plus", "no mass_err_minus column"},
		{"duplicate column", "name,planet,mass [kg],Mass [earthMass]\nA,P,1,1\n", ErrDuplicateColumn, 1, "Mass [earthMass]", `already read from column "mass [kg]"`},
		{"missing name", head + ",Vorlan,Ossery,8e22,,,,,,,\n", ErrMissingName, 2, "name", "name is empty"},
		{"missing planet", head + "Nerith,,Ossery,8e22,,,,,,,\n", ErrMissingName, 2, "planet", "planet's name is empty"},
		{"no name column", "planet,mass [kg]\nP,1\n", ErrMissingName, 1, "", "no name column"},
		{"no planet column", "name,mass [kg]\nA,1\n", ErrMissingName, 1, "", "no planet column"},
		{"duplicate moon", head + good + " nerith ,VORLAN,Ossery,8.1e22,1e21,1790,0.005,0.5,0.4,0.6,1.02\n", ErrDuplicateMoon, 3, "name", "also on row 2"},
		{"planet conflict", head + good + "Caldra,Vorlan,Ossery,,,,,,,,1.3\n", ErrPlanetConflict, 3, "planet_mass [jupiterMass]", "planet_mass 1.3 jupiterMass here but 1.02 jupiterMass on row 2"},
		{"star conflict", head + good + "Caldra,Vorlan,Tessaly,,,,,,,,\n", ErrPlanetConflict, 3, "star", `star "Ossery" on row 2`},
		{"star value without star", "name,planet,star_luminosity [solLum]\nA,P,1\n", ErrMissingName, 2, "star_luminosity [solLum]", "names no star"},
		{"star value conflict", "name,planet,star,star_luminosity [solLum]\nA,P,S,1\nB,Q,S,2\n", ErrPlanetConflict, 3, "star_luminosity [solLum]", `star "S" has star_luminosity 2 solLum here but 1 solLum on row 2`},
		{"wrong field count", head + "Nerith,Vorlan\n", csv.ErrFieldCount, 2, "", "2 fields, the header has 11"},
		{"invalid UTF-8", head + "Ner\xffith,Vorlan,Ossery,,,,,,,,\n", csv.ErrInvalidUTF8, 2, "name", "UTF-8"},
		{"bad header brackets", "name,planet,mass [kg\nA,P,1\n", ErrUnknownColumn, 1, "mass [kg", "brackets"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			l := mustFail(t, c.in, Options{})
			if !errors.Is(l, c.is) {
				t.Fatalf("errors.Is(%v) = false\nerror: %v", c.is, l)
			}
			var pe *ParseError
			if !errors.As(l, &pe) {
				t.Fatalf("no *ParseError in %v", l)
			}
			if pe.File != "moons.csv" || pe.Row != c.row || pe.Column != c.column {
				t.Errorf("position file %q row %d column %q; want moons.csv row %d column %q", pe.File, pe.Row, pe.Column, c.row, c.column)
			}
			msg := l.Error()
			want := []string{"moons.csv", c.says}
			if c.row > 0 {
				want = append(want, "row "+strconv.Itoa(c.row))
			}
			if c.column != "" {
				want = append(want, `column "`+c.column+`"`)
			}
			for _, w := range want {
				if !strings.Contains(msg, w) {
					t.Errorf("message lacks %q:\n%s", w, msg)
				}
			}
		})
	}
}

func TestHugeFieldRefused(t *testing.T) {
	src := io.MultiReader(strings.NewReader("name,planet,source\nA,P,"), &zeros{n: 10 << 20}, strings.NewReader("\n"))
	_, err := Read("big.csv", src, Options{})
	if !errors.Is(err, csv.ErrRecordTooLong) || !errors.Is(err, ErrTableSyntax) {
		t.Fatalf("err %v; want the record-size refusal", err)
	}
	if !strings.Contains(err.Error(), "big.csv") || !strings.Contains(err.Error(), "line 2") {
		t.Errorf("message %q", err)
	}
}

type zeros struct{ n int }

func (z *zeros) Read(p []byte) (int, error) {
	if z.n == 0 {
		return 0, io.EOF
	}
	k := min(len(p), z.n)
	for i := range k {
		p[i] = '0'
	}
	z.n -= k
	return k, nil
}

func TestErrorListCollectsAll(t *testing.T) {
	in := head +
		"A,Vorlan,Ossery,x,,,,,,,\n" +
		"B,Vorlan,Ossery,,,,2,,,,\n" +
		"C,Vorlan,Ossery,,,,,,,,\n" +
		"D,Vorlan,Ossery,,,-1,,,,,\n"
	l := mustFail(t, in, Options{})
	if l.Len() != 3 || len(l.Errs) != 3 {
		t.Fatalf("%d problems, want 3:\n%v", l.Len(), l)
	}
	for _, w := range []string{"3 problems", "row 2", "row 3", "row 5", "nothing was imported"} {
		if !strings.Contains(l.Error(), w) {
			t.Errorf("message lacks %q:\n%v", w, l)
		}
	}
	if !errors.Is(l, ErrNotNumber) || !errors.Is(l, schema.ErrOutOfDomain) {
		t.Errorf("errors.Is does not see every problem")
	}
	l = mustFail(t, in, Options{MaxErrors: 2})
	if len(l.Errs) != 2 || l.Omitted != 1 || !strings.Contains(l.Error(), "... and 1 more") {
		t.Errorf("limit: %d listed, %d omitted:\n%v", len(l.Errs), l.Omitted, l)
	}
}

func TestMissingSpellings(t *testing.T) {
	for _, s := range []string{"", " ", "--", "NaN", "nan", "null", "NULL", "N/A", "n/a"} {
		res := mustRead(t, "m.csv", "name,planet,mass [kg]\nA,P,"+s+"\n", Options{})
		if len(res.Records) != 1 || len(res.Records[0].Params) != 0 {
			t.Errorf("%q: params %+v, want none", s, res.Records[0].Params)
		}
	}
}

func TestNames(t *testing.T) {
	// "Kaé" written decomposed (e + U+0301) is stored composed (NFC).
	res := mustRead(t, "n.csv", "name,planet,star,alias\n\" Ka\u0065\u0301  Minor \",Vor\u00a0 lan,  Oss ery ,a;; b ;\n", Options{})
	r := res.Records[0]
	if r.Name != "Ka\u00e9 Minor" || r.Planet != "Vor lan" || r.Star != "Oss ery" {
		t.Errorf("names %q %q %q", r.Name, r.Planet, r.Star)
	}
	if strings.Join(r.Aliases, "|") != "a|b" {
		t.Errorf("aliases %q", r.Aliases)
	}
	// The duplicate check matches NFC, case and spacing.
	l := mustFail(t, "name,planet\nKa\u00e9,P\nKA\u0065\u0301,p\n", Options{})
	if !errors.Is(l, ErrDuplicateMoon) {
		t.Errorf("NFC duplicate not found: %v", l)
	}
}

func TestSkipInvalid(t *testing.T) {
	in := head +
		"Nerith,Vorlan,Ossery,8.1e22,1e21,1790,0.005,0.5,0.4,0.6,1.02\n" +
		"Bad1,Vorlan,Ossery,abc,,,,,,,\n" +
		"Caldra,Vorlan,Ossery,4.6e22,,1520,,,,,1.02\n" +
		"Bad2,Vorlan,Ossery,,,,1.5,,,,1.3\n" +
		"=cmd,Vorlan,Ossery,,,,,,,,\n" +
		"short,row\n"
	res, err := Read("moons.csv", strings.NewReader(in), Options{SkipInvalid: true})
	if err != nil {
		t.Fatal(err)
	}
	var names []string
	for _, r := range res.Records {
		names = append(names, r.Name)
	}
	if strings.Join(names, ",") != "Nerith,Caldra,=cmd" {
		t.Errorf("kept %q", names)
	}
	if len(res.Rejects) != 3 {
		t.Fatalf("rejects %+v", res.Rejects)
	}
	r := res.Rejects[1]
	if r.Row != 5 || r.Raw[0] != "Bad2" || !strings.Contains(r.Reason, "eccentricity") || !strings.Contains(r.Reason, "planet_mass") {
		t.Errorf("reject %+v: want row 5 with both of its problems", r)
	}
	var buf bytes.Buffer
	if err := WriteRejects(&buf, "moons.csv", res.Rejects); err != nil {
		t.Fatal(err)
	}
	recs, err := stdcsv.NewReader(&buf).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if len(recs) != 4 || recs[0][0] != "file" || recs[0][2] != "reason" || recs[1][1] != "3" || recs[1][3] != "Bad1" ||
		!strings.Contains(recs[1][2], `column "mass [kg]": value "abc": not a number`) || recs[3][1] != "7" {
		t.Errorf("rejects report:\n%q", recs)
	}
	for _, rec := range recs {
		for _, c := range rec {
			if strings.HasPrefix(c, "=") {
				t.Errorf("formula-like cell %q not neutralised", c)
			}
		}
	}
	// Header problems still fail the whole file.
	if _, err := Read("x.csv", strings.NewReader("name,planet,bogus\nA,P,1\n"), Options{SkipInvalid: true}); !errors.Is(err, ErrUnknownColumn) {
		t.Errorf("header problem under SkipInvalid: %v", err)
	}
}

func TestReadStream(t *testing.T) {
	var n int
	res, err := ReadStream("s.csv", strings.NewReader("name,planet\nA,P\nB,P\n"), Options{}, func(r *schema.Record) error {
		n++
		return nil
	})
	if err != nil || n != 2 || len(res.Records) != 0 || res.Rows != 2 {
		t.Errorf("n=%d err=%v res=%+v", n, err, res)
	}
	stop := errors.New("stop")
	if _, err := ReadStream("s.csv", strings.NewReader("name,planet\nA,P\nB,P\n"), Options{}, func(*schema.Record) error { return stop }); err != stop {
		t.Errorf("emit error: %v", err)
	}
}

func TestK2AndQ(t *testing.T) {
	res := mustRead(t, "k.csv", "name,planet,k2,q,k2_q\nA,P,0.3,100,0.003\n", Options{})
	r := res.Records[0]
	near(t, "k2", param(t, r, "k2").Value, 0.3, 0)
	near(t, "q", param(t, r, "q").Value, 100, 0)
	near(t, "k2_q", param(t, r, "k2_q").Value, 0.003, 0)
}

func TestUnitOnCompanion(t *testing.T) {
	res := mustRead(t, "u.csv", "name,planet,radius [km],radius_err [m]\nA,P,100,250\n", Options{})
	p := param(t, res.Records[0], "radius")
	near(t, "radius", p.Value, 1e5, 0)
	near(t, "radius σ in its own unit", p.Unc.Sigma, 250, 0)
}

func TestTooManyColumns(t *testing.T) {
	in := "name,planet" + strings.Repeat(",", 100000) + "\n"
	_, err := Read("wide.csv", strings.NewReader(in), Options{})
	if !errors.Is(err, ErrTableSyntax) || !strings.Contains(err.Error(), "100002 columns") {
		t.Errorf("wide header: %v", err)
	}
}

// TestCheckWindowForgets: past the window of maxTrackedBodies, the reader no
// longer sees a moon given twice far apart (the store refuses it instead);
// within the window it reports the earlier row.
func TestCheckWindowForgets(t *testing.T) {
	file := "name,planet,radius [km]\nA,P1,100\nB,P2,100\nC,P3,100\nA,P1,100\n"
	read := func() error {
		_, err := Read("far.csv", strings.NewReader(file), Options{})
		return err
	}
	if err := read(); !errors.Is(err, ErrDuplicateMoon) || !strings.Contains(err.Error(), "row 2") {
		t.Fatalf("within the window: %v, want the duplicate of row 2", err)
	}
	old := maxTrackedBodies
	maxTrackedBodies = 2
	defer func() { maxTrackedBodies = old }()
	if err := read(); err != nil {
		t.Fatalf("past the window: %v, want the duplicate left to the store", err)
	}
}
