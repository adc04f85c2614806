package importers

import (
	"errors"
	"flag"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"tidesift/importers/table"
	"tidesift/schema"
)

var update = flag.Bool("update", false, "rewrite golden files")

func mustLoadMap(tb testing.TB, path string) *Map {
	tb.Helper()
	f, err := os.Open(path)
	if err != nil {
		tb.Fatal(err)
	}
	defer f.Close()
	m, err := LoadMap(f)
	if err != nil {
		tb.Fatalf("LoadMap(%s): %v", path, err)
	}
	return m
}

func TestForeignWithMap(t *testing.T) {
	m := mustLoadMap(t, filepath.Join("testdata", "foreign.map.toml"))
	// Without the map the foreign file is refused, with the hint.
	_, err := ReadFile(filepath.Join("testdata", "foreign.csv"), Options{})
	if !errors.Is(err, ErrUnknownColumn) || !strings.Contains(err.Error(), "--map") {
		t.Fatalf("without a map: %v", err)
	}
	res, err := ReadFile(filepath.Join("testdata", "foreign.csv"), Options{Map: m})
	if err != nil {
		t.Fatal(err)
	}
	if len(res.Records) != 3 {
		t.Fatalf("%d records", len(res.Records))
	}
	r := res.Records[0]
	if r.Name != "Kerrow-1" || r.Planet != "Tessaly-7 b" || r.Star != "Tessaly-7" || r.Source != "Invented transit survey (2026)" || r.Row != 4 {
		t.Errorf("record %+v", r)
	}
	// IAU 2015 B3: Earth mass = GM_E / G (CODATA 2018); R_E = 6.3781e6 m.
	mass := param(t, r, "mass")
	near(t, "mass (Mgeo)", mass.Value, 0.012*3.986004e14/6.67430e-11, 1e-14)
	near(t, "mass σ in the unit of M_sat", mass.Unc.Sigma, 0.004*3.986004e14/6.67430e-11, 1e-14)
	near(t, "radius (Rgeo)", param(t, r, "radius").Value, 0.28*6.3781e6, 1e-15)
	near(t, "a (Mm)", param(t, r, "semi_major_axis").Value, 2.1e6, 1e-15)
	near(t, "T", param(t, r, "surface_temperature").Value, 145, 0)
	// Constants from the map, on every row.
	for _, rec := range res.Records {
		pm := param(t, rec, "planet_mass")
		near(t, "planet_mass (jupiterMass)", pm.Value, 3.1*1.2668653e17/6.67430e-11, 1e-14)
		if pm.Unc.Kind != schema.UncSymmetric || pm.Source != "Invented radial-velocity fit (2026)" {
			t.Errorf("constant planet_mass %+v", pm)
		}
		near(t, "star_distance (AU)", param(t, rec, "star_distance").Value, 0.9*149597870700, 1e-15)
	}
	if hasParam(res.Records[2], "mass") || hasParam(res.Records[2], "eccentricity") {
		t.Errorf("missing cells became values: %+v", res.Records[2].Params)
	}
}

func TestLoadMapErrors(t *testing.T) {
	cases := []struct {
		name, toml string
		says       []string
	}{
		{"misspelt field", "unknown_colums = \"ignore\"\n", []string{"line 1", "unknown_colums"}},
		{"misspelt column field", "[columns]\n\"M\" = { key = \"mass\", unti = \"kg\" }\n", []string{"line 2", "unti"}},
		{"bad TOML", "[columns\n", []string{"line 1"}},
		{"wrong type", "table = 3\n", []string{"line 1"}},
		{"unknown key", "[columns]\n\"M\" = { key = \"weight\" }\n", []string{`"M"`, `"weight"`, "not a canonical key"}},
		{"unknown role", "[columns]\n\"M\" = { key = \"mass\", role = \"error\" }\n", []string{`role "error"`, "err_plus"}},
		{"unknown unit", "[columns]\n\"M\" = { key = \"mass\", unit = \"Mjupp\" }\n", []string{"unknown unit", "Mjup"}},
		{"wrong unit", "[columns]\n\"M\" = { key = \"mass\", unit = \"km\" }\n", []string{"unit km is a length; mass wants a mass unit"}},
		{"constant without value", "[constant_values.planet_mass]\nunit = \"kg\"\n", []string{"planet_mass", "value is missing"}},
		{"constant without unit", "[constant_values.planet_mass]\nvalue = 2.0\n", []string{"missing unit"}},
		{"constant out of domain", "[constant_values.planet_mass]\nvalue = -2.0\nunit = \"kg\"\n", []string{"expected (0, +Inf)"}},
		{"bad unknown_columns", "unknown_columns = \"skip\"\n", []string{`"skip"`, `"ignore"`}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			_, err := LoadMap(strings.NewReader(c.toml))
			if !errors.Is(err, ErrBadMap) {
				t.Fatalf("err %v; want ErrBadMap", err)
			}
			for _, s := range c.says {
				if !strings.Contains(err.Error(), s) {
					t.Errorf("message lacks %q:\n%v", s, err)
				}
			}
		})
	}
}

func TestMapMisfits(t *testing.T) {
	load := func(s string) *Map {
		m, err := LoadMap(strings.NewReader(s))
		if err != nil {
			t.Fatal(err)
		}
		return m
	}
	// A mapped column the file lacks.
	m := load("[columns]\n\"Sat\" = { key = \"name\" }\n\"Msat\" = { key = \"mass\", unit = \"kg\" }\n[constants]\nplanet = \"P\"\n")
	_, err := Read("f.csv", strings.NewReader("Sat\nA\n"), Options{Map: m})
	if !errors.Is(err, ErrBadMap) || !strings.Contains(err.Error(), `"Msat"`) {
		t.Errorf("missing mapped column: %v", err)
	}
	// A mapped column without a unit whose key needs one.
	m = load("[columns]\n\"Sat\" = { key = \"name\" }\n\"Msat\" = { key = \"mass\" }\n[constants]\nplanet = \"P\"\n")
	_, err = Read("f.csv", strings.NewReader("Sat,Msat\nA,1\n"), Options{Map: m})
	if !errors.Is(err, ErrMissingUnit) || !strings.Contains(err.Error(), `column "Msat"`) || !strings.Contains(err.Error(), "map entry") {
		t.Errorf("unit-less mapped column: %v", err)
	}
	// The map's unit overrides the header's, and unknown columns can be ignored.
	m = load("unknown_columns = \"ignore\"\n[columns]\n\"mass [kg]\" = { key = \"mass\", unit = \"earthMass\" }\n")
	res, err := Read("f.csv", strings.NewReader("name,planet,mass [kg],junk\nA,P,1,x\n"), Options{Map: m})
	if err != nil {
		t.Fatal(err)
	}
	near(t, "mass", param(t, res.Records[0], "mass").Value, 3.986004e14/6.67430e-11, 1e-14)
	// The map's table selector reaches the options.
	m = load("table = \"moons\"\nformat = \"tsv\"\n")
	res, err = Read("f.csv", strings.NewReader("name\tplanet\nA\tP\n"), Options{Map: m})
	if err != nil || res.Format != "tsv" {
		t.Errorf("format from the map: %v %+v", err, res)
	}
}

func TestSuggestMap(t *testing.T) {
	f, err := os.Open(filepath.Join("testdata", "foreign.csv"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	got, err := SuggestMap("foreign.csv", f, Options{})
	if err != nil {
		t.Fatal(err)
	}
	golden := filepath.Join("testdata", "foreign.suggest.golden")
	if *update {
		if err := os.WriteFile(golden, []byte(got), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	want, err := os.ReadFile(golden)
	if err != nil {
		t.Fatalf("%v (run go test -update to create it)", err)
	}
	if got != string(want) {
		t.Errorf("suggestion differs from %s (go test -update rewrites it):\n%s", golden, got)
	}
	for _, line := range []string{
		`"Sat"     = { key = "name" }`,
		`"Host"    = { key = "planet" }`,
		`"M_sat"   = { key = "mass" }`,
		`"e_M_sat" = { key = "mass", role = "err" }`,
		`"a (Mm)"  = { key = "semi_major_axis", unit = "Mm" }`,
		`"ecc"     = { key = "eccentricity" }`,
		`"Notes"   = { key = "ignore" }  # could not guess`,
	} {
		if !strings.Contains(got, line) {
			t.Errorf("suggestion lacks %q", line)
		}
	}
	// The suggestion loads as written; reading with it stops at the first
	// column whose unit must be filled in.
	m, err := LoadMap(strings.NewReader(got))
	if err != nil {
		t.Fatalf("the suggested map does not load: %v", err)
	}
	_, err = ReadFile(filepath.Join("testdata", "foreign.csv"), Options{Map: m})
	if !errors.Is(err, ErrMissingUnit) || !strings.Contains(err.Error(), `column "M_sat"`) {
		t.Errorf("reading with the unfilled suggestion: %v", err)
	}
}

// TestGuessColumn covers the fuzzy names and the VOTable UCDs.
func TestGuessColumn(t *testing.T) {
	cases := []struct {
		col             table.Column
		text            bool
		key, role, unit string
	}{
		{table.Column{Name: "Mass"}, false, "mass", "", ""},
		{table.Column{Name: "M_sat"}, false, "mass", "", ""},
		{table.Column{Name: "e_mass"}, false, "mass", "err", ""},
		{table.Column{Name: "mass_error"}, false, "mass", "err", ""},
		{table.Column{Name: "semimajor"}, false, "semi_major_axis", "", ""},
		{table.Column{Name: "Semi-major axis"}, false, "semi_major_axis", "", ""},
		{table.Column{Name: "ecc"}, false, "eccentricity", "", ""},
		{table.Column{Name: "radius_km"}, false, "radius", "", "km"},
		{table.Column{Name: "Period (d)"}, false, "period", "", "d"},
		{table.Column{Name: "pl_mass"}, false, "planet_mass", "", ""},
		{table.Column{Name: "planet_radius [Rjup]"}, false, "planet_radius", "", "Rjup"},
		{table.Column{Name: "st_lum"}, false, "star_luminosity", "", ""},
		{table.Column{Name: "albedo_min"}, false, "bond_albedo", "min", ""},
		{table.Column{Name: "mass_err_plus"}, false, "mass", "err_plus", ""},
		{table.Column{Name: "Ref"}, true, "source", "", ""},
		{table.Column{Name: "xyz"}, false, "ignore", "", ""},
		{table.Column{Name: "Notes"}, true, "ignore", "", ""},
		{table.Column{Name: "comments"}, true, "ignore", "", ""},
		{table.Column{Name: "quality"}, false, "ignore", "", ""},
		{table.Column{Name: "Semimajor axis (km)"}, false, "semi_major_axis", "", "km"},
		{table.Column{Name: "eccentricty"}, false, "eccentricity", "", ""},
		// VOTable UCDs (IVOA UCD1+ controlled vocabulary words).
		{table.Column{Name: "col1", UCD: "phys.mass", Unit: "kg"}, false, "mass", "", "kg"},
		{table.Column{Name: "col2", UCD: "stat.error;phys.mass", Unit: "kg"}, false, "mass", "err", "kg"},
		{table.Column{Name: "col3", UCD: "phys.size.radius", Unit: "km"}, false, "radius", "", "km"},
		{table.Column{Name: "col4", UCD: "phys.size.smajAxis", Unit: "AU"}, false, "semi_major_axis", "", "AU"},
		{table.Column{Name: "col5", UCD: "src.orbital.eccentricity"}, false, "eccentricity", "", ""},
		{table.Column{Name: "col6", UCD: "time.period.revolution", Unit: "d"}, false, "period", "", "d"},
		{table.Column{Name: "col7", UCD: "phys.density", Unit: "g/cm3"}, false, "density", "", "g/cm3"},
		{table.Column{Name: "col8", UCD: "phys.albedo"}, false, "bond_albedo", "", ""},
		{table.Column{Name: "col9", UCD: "phys.temperature", Unit: "K"}, false, "surface_temperature", "", "K"},
		{table.Column{Name: "col10", UCD: "stat.min;phys.albedo"}, false, "bond_albedo", "min", ""},
		{table.Column{Name: "col11", UCD: "stat.max;phys.albedo"}, false, "bond_albedo", "max", ""},
		{table.Column{Name: "pl_masse", UCD: "phys.mass", Unit: "earthMass"}, false, "planet_mass", "", "earthMass"},
		{table.Column{Name: "oid", UCD: "meta.id;meta.main"}, true, "name", "", ""},
	}
	for _, c := range cases {
		g := guessColumn(c.col, c.text)
		if g.key != c.key || g.role != c.role || g.unit != c.unit {
			t.Errorf("guess(%+v) = key %q role %q unit %q; want %q %q %q", c.col, g.key, g.role, g.unit, c.key, c.role, c.unit)
		}
	}
}

// TestSuggestMapVOTable follows a foreign VOTable (IVOA VOTable 1.4
// structure, TABLEDATA) from suggestion to import: its UCDs and units are
// enough for a map that imports as suggested.
func TestSuggestMapVOTable(t *testing.T) {
	path := filepath.Join("testdata", "foreign.vot")
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	got, err := SuggestMap("foreign.vot", f, Options{})
	if err != nil {
		t.Fatal(err)
	}
	golden := filepath.Join("testdata", "foreign.vot.suggest.golden")
	if *update {
		if err := os.WriteFile(golden, []byte(got), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	want, err := os.ReadFile(golden)
	if err != nil {
		t.Fatalf("%v (run go test -update to create it)", err)
	}
	if got != string(want) {
		t.Errorf("suggestion differs from %s (go test -update rewrites it):\n%s", golden, got)
	}
	for _, line := range []string{
		`"col_m_sig" = { key = "mass", role = "err", unit = "Mgeo" }`,
		`"alb_lo"    = { key = "bond_albedo", role = "min" }`,
		`"flag"      = { key = "ignore" }  # could not guess`,
	} {
		if !strings.Contains(got, line) {
			t.Errorf("suggestion lacks %q", line)
		}
	}
	m, err := LoadMap(strings.NewReader(got))
	if err != nil {
		t.Fatalf("the suggested map does not load: %v", err)
	}
	res, err := ReadFile(path, Options{Map: m})
	if err != nil {
		t.Fatalf("import with the suggested map: %v", err)
	}
	if len(res.Records) != 2 || res.Format != "votable" {
		t.Fatalf("%d records, format %q", len(res.Records), res.Format)
	}
	r := res.Records[0]
	// IAU 2015 B3 / CODATA 2018: Earth mass = GM_E / G.
	near(t, "mass", param(t, r, "mass").Value, 0.012*3.986004e14/6.67430e-11, 1e-14)
	near(t, "mass σ", param(t, r, "mass").Unc.Sigma, 0.004*3.986004e14/6.67430e-11, 1e-14)
	near(t, "density", param(t, r, "density").Value, 2100, 1e-15)
	if u := param(t, r, "bond_albedo").Unc; u.Kind != schema.UncRange || u.Min != 0.2 || u.Max != 0.4 {
		t.Errorf("albedo range %+v", u)
	}
	if hasParam(res.Records[1], "bond_albedo") || hasParam(res.Records[1], "density") {
		t.Errorf("empty TD became a value: %+v", res.Records[1].Params)
	}
}
