package main

import (
	"database/sql"
	"encoding/csv"
	"encoding/json"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"
	_ "modernc.org/sqlite"

	"tidesift/schema"
)

// Options → output: each command run against a catalog in t.TempDir().

// writeFile writes content to name in dir and returns its path.
func writeFile(tb testing.TB, dir, name, content string) string {
	tb.Helper()
	p := filepath.Join(dir, name)
	if err := os.WriteFile(p, []byte(content), 0o644); err != nil {
		tb.Fatal(err)
	}
	return p
}

func readFixture(tb testing.TB, name string) string {
	tb.Helper()
	b, err := os.ReadFile(filepath.Join("testdata", name))
	if err != nil {
		tb.Fatal(err)
	}
	return string(b)
}

func closeTo(got, want, rel float64) bool {
	return math.Abs(got-want) <= rel*math.Abs(want)
}

func TestImportListShow(t *testing.T) {
	ta := newTestApp(t)
	f := writeFile(t, t.TempDir(), "moons.csv", readFixture(t, "moons.csv"))
	out := mustRun(t, ta, "import", f, "--note", "first")
	if !strings.Contains(out, "revision 1: 3 rows") {
		t.Errorf("import output %q, want it to report revision 1 with 3 rows", out)
	}

	// list --format json: every moon with every input in SI.
	var doc listDoc
	if err := json.Unmarshal([]byte(mustRun(t, ta, "list", "--format", "json")), &doc); err != nil {
		t.Fatal(err)
	}
	if doc.CatalogRevision != 1 || len(doc.Moons) != 3 {
		t.Fatalf("list json: revision %d, %d moons; want 1 and 3", doc.CatalogRevision, len(doc.Moons))
	}
	arlune := doc.Moons[0]
	if arlune.Name != "Arlune" || arlune.Planet != "Pavrin c" || arlune.Star != "Pavrin" {
		t.Fatalf("first moon %+v", arlune)
	}
	inputs := map[string]inputJSON{}
	for _, in := range arlune.Inputs {
		inputs[in.Key] = in
	}
	// 1600 km; 4.2 au with the IAU 2012 au = 149 597 870 700 m.
	if r := inputs["radius"]; !closeTo(r.Value, 1.6e6, 1e-12) || r.Unit != "m" || !closeTo(r.Uncertainty.Sigma, 5e3, 1e-12) {
		t.Errorf("radius %+v, want 1.6e6 m ± 5e3", r)
	}
	if d := inputs["star_distance"]; !closeTo(d.Value, 4.2*149_597_870_700, 1e-12) || d.Revision != 1 || d.Status != "measured" {
		t.Errorf("star_distance %+v", d)
	}
	if k := inputs["k2_q"]; k.Uncertainty.Kind.String() != "factor" || k.Source != "invented: assumed for the test" {
		t.Errorf("k2_q %+v, want a ×/÷ factor with its own source", k)
	}

	// list table: display units, '-' for missing values.
	table := mustRun(t, ta, "list")
	for _, want := range []string{"RADIUS [km]", "1600 ± 5", "Betrix", "-"} {
		if !strings.Contains(table, want) {
			t.Errorf("list table lacks %q:\n%s", want, table)
		}
	}

	// show: matched case-insensitively; JSON has inputs and derived.
	var sd map[string]json.RawMessage
	if err := json.Unmarshal([]byte(mustRun(t, ta, "show", "  ARLUNE ", "--format", "json")), &sd); err != nil {
		t.Fatal(err)
	}
	for _, k := range []string{"name", "planet", "star", "inputs", "derived"} {
		if _, ok := sd[k]; !ok {
			t.Errorf("show json lacks %q", k)
		}
	}

	// show csv: one row per input, header first.
	rows, err := csv.NewReader(strings.NewReader(mustRun(t, ta, "show", "Betrix", "--format", "csv"))).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if rows[0][0] != "key" || len(rows) < 8 {
		t.Errorf("show csv: %d rows, header %v", len(rows), rows[0])
	}
}

func TestImportRefusedWritesNothing(t *testing.T) {
	ta := newTestApp(t)
	dir := t.TempDir()
	good := writeFile(t, dir, "good.csv", readFixture(t, "moons.csv"))
	bad := writeFile(t, dir, "bad.csv", "name,planet,radius [km],eccentricity\nElvar,Pavrin c,600,1.2\nFennick,Pavrin c,-3,0.1\n")
	ta.out.Reset()
	if code := runCLI(t, ta, "import", good, bad); code != exitRefused {
		t.Fatalf("exit %d, want %d; stderr:\n%s", code, exitRefused, ta.errOut)
	}
	msg := ta.errOut.String()
	for _, want := range []string{"nothing was written", `bad.csv: row 2, column "eccentricity"`, `bad.csv: row 3, column "radius [km]"`} {
		if !strings.Contains(msg, want) {
			t.Errorf("refusal lacks %q:\n%s", want, msg)
		}
	}
	if ta.out.Len() != 0 {
		t.Errorf("refused import printed to stdout: %q", ta.out)
	}
	// The good file was not imported either: not even the catalog exists.
	if _, err := os.Stat(ta.dbPath); err == nil {
		t.Errorf("a refused import created the catalog")
	}
}

func TestImportDryRunAndNoop(t *testing.T) {
	ta := newTestApp(t)
	f := writeFile(t, t.TempDir(), "moons.csv", readFixture(t, "moons.csv"))
	if out := mustRun(t, ta, "import", "--dry-run", f); !strings.Contains(out, "dry run, nothing written") {
		t.Errorf("dry run output %q", out)
	}
	if _, err := os.Stat(ta.dbPath); err == nil {
		t.Errorf("a dry run against no catalog created one")
	}
	mustRun(t, ta, "init")
	if out := mustRun(t, ta, "import", "--dry-run", f); !strings.Contains(out, "would add 22 values") {
		t.Errorf("dry run output %q", out)
	}
	if out := mustRun(t, ta, "revisions"); !strings.Contains(out, "no revisions yet") {
		t.Errorf("a dry run wrote a revision:\n%s", out)
	}
	mustRun(t, ta, "import", f)
	if out := mustRun(t, ta, "import", f); !strings.Contains(out, "unchanged: already imported as revision 1") {
		t.Errorf("re-import output %q", out)
	}
}

func TestShowAmbiguousAndMissing(t *testing.T) {
	ta := newTestApp(t)
	f := writeFile(t, t.TempDir(), "twins.csv", "name,planet,radius [km]\nTwin,Alpha b,500\nTwin,Beta b,600\n")
	mustRun(t, ta, "import", f)
	if code := runCLI(t, ta, "show", "twin"); code != exitUsage {
		t.Errorf("ambiguous show: exit %d, want %d", code, exitUsage)
	}
	if msg := ta.errOut.String(); !strings.Contains(msg, "Twin of Alpha b, Twin of Beta b; choose one with --planet") {
		t.Errorf("ambiguity message %q", msg)
	}
	if out := mustRun(t, ta, "show", "twin", "--planet", "beta B"); !strings.Contains(out, "Twin, moon of Beta b") {
		t.Errorf("show --planet: %q", out)
	}
	ta.errOut.Reset()
	if code := runCLI(t, ta, "show", "Nobody"); code != exitError || !strings.Contains(ta.errOut.String(), `no moon named "Nobody"`) {
		t.Errorf("missing moon: exit %d, stderr %q", code, ta.errOut)
	}
}

func TestListCSVRoundTrip(t *testing.T) {
	ta := newTestApp(t)
	dir := t.TempDir()
	mustRun(t, ta, "import", writeFile(t, dir, "moons.csv", readFixture(t, "moons.csv")))
	before := mustRun(t, ta, "list", "--format", "json")
	again := writeFile(t, dir, "again.csv", mustRun(t, ta, "list", "--format", "csv"))
	if out := mustRun(t, ta, "import", again); !strings.Contains(out, "no revision made") {
		t.Errorf("re-importing list --format csv changed the catalog: %q", out)
	}
	if after := mustRun(t, ta, "list", "--format", "json"); after != before {
		t.Errorf("catalog changed by the round trip:\nbefore %s\nafter %s", before, after)
	}
}

func TestDemoBuildsInvented(t *testing.T) {
	ta := newTestApp(t)
	// No --db: the demo builds its catalog in a temporary directory.
	root := newRootCmd(ta.app)
	root.SetArgs([]string{"demo", "--samples", "500", "--out", filepath.Join(t.TempDir(), "demo.xlsx")})
	if code := report(ta.errOut, root.Execute()); code != 0 {
		t.Fatalf("demo: exit %d\n%s", code, ta.errOut)
	}
	out := ta.out.String()
	for _, want := range []string{"INVENTED", "Varkesh", "Ilmeth", "Teodra b IV", "temporary file"} {
		if !strings.Contains(out, want) {
			t.Errorf("demo output lacks %q:\n%s", want, out)
		}
	}
	if _, err := os.Stat("tidesift.db"); err == nil {
		t.Errorf("demo without --db left a catalog at the default path")
	}
}

// demoCatalog builds the demo catalog at the test app's --db path.
func demoCatalog(tb testing.TB, ta *testApp) {
	tb.Helper()
	mustRun(tb, ta, "demo", "--samples", "100", "--out", filepath.Join(tb.TempDir(), "demo.xlsx"))
}

func TestRankOutputs(t *testing.T) {
	ta := newTestApp(t)
	demoCatalog(t, ta)

	var doc struct {
		CatalogRevision int64  `json:"catalog_revision"`
		Profile         string `json:"profile"`
		Samples         int    `json:"samples"`
		Seed            uint64 `json:"seed"`
		Targets         []struct {
			Name string  `json:"name"`
			Rank float64 `json:"rank"`
			PTop struct {
				K int
				P float64
			} `json:"p_top"`
		} `json:"targets"`
	}
	out := mustRun(t, ta, "rank", "--samples", "300", "--seed", "9", "--format", "json")
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	if doc.CatalogRevision != 1 || doc.Profile != "ocean" || doc.Samples != 300 || doc.Seed != 9 || len(doc.Targets) != 12 {
		t.Fatalf("rank json header %+v", doc)
	}
	// P(rank ≤ k) over all targets sums to k (the ranks of each sample are a
	// permutation); a check on the whole pipeline, not only on the engine.
	sum := 0.0
	for _, tg := range doc.Targets {
		sum += tg.PTop.P
	}
	if k := float64(doc.Targets[0].PTop.K); math.Abs(sum-k) > 1e-9 {
		t.Errorf("sum of P(top k) = %g, want k = %g", sum, k)
	}

	// --top limits the JSON and CSV outputs too.
	if err := json.Unmarshal([]byte(mustRun(t, ta, "rank", "--samples", "300", "--top", "2", "--format", "json")), &doc); err != nil {
		t.Fatal(err)
	}
	if len(doc.Targets) != 2 {
		t.Errorf("--top 2: %d targets", len(doc.Targets))
	}
	rows, err := csv.NewReader(strings.NewReader(mustRun(t, ta, "rank", "--samples", "300", "--star", "Teodra", "--format", "csv"))).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if len(rows) != 5 {
		t.Errorf("--star Teodra: %d CSV rows, want a header and 4 targets", len(rows))
	}
}

func TestExportWorkbookAndFiles(t *testing.T) {
	ta := newTestApp(t)
	demoCatalog(t, ta)
	dir := t.TempDir()
	book := filepath.Join(dir, "review.xlsx")
	mustRun(t, ta, "export", "--out", book, "--samples", "300", "--seed", "5")
	if !strings.Contains(ta.errOut.String(), "wrote "+book) {
		t.Errorf("export did not say where it wrote: %q", ta.errOut)
	}
	f, err := excelize.OpenFile(book)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	sheets := strings.Join(f.GetSheetList(), ",")
	for _, s := range []string{"Ranking", "Derived", "Inputs", "Drivers", "Method"} {
		if !strings.Contains(sheets, s) {
			t.Errorf("workbook sheets %s lack %s", sheets, s)
		}
	}
	method, err := f.GetRows("Method")
	if err != nil {
		t.Fatal(err)
	}
	var text strings.Builder
	for _, r := range method {
		text.WriteString(strings.Join(r, " "))
		text.WriteByte('\n')
	}
	for _, want := range []string{"triage aid", "Uncertainty and ranking"} {
		if !strings.Contains(text.String(), want) {
			t.Errorf("Method sheet lacks %q", want)
		}
	}

	// JSON to a file equals JSON to standard output.
	js := filepath.Join(dir, "r.json")
	mustRun(t, ta, "export", "--out", js, "--samples", "300", "--seed", "5")
	b, err := os.ReadFile(js)
	if err != nil {
		t.Fatal(err)
	}
	if std := mustRun(t, ta, "export", "--format", "json", "--samples", "300", "--seed", "5"); std != string(b) {
		t.Errorf("export to a file and to stdout differ")
	}
	if std := mustRun(t, ta, "rank", "--format", "json", "--samples", "300", "--seed", "5"); std != string(b) {
		t.Errorf("export --format json and rank --format json differ")
	}
}

func TestShowDerivedAndAssumed(t *testing.T) {
	ta := newTestApp(t)
	demoCatalog(t, ta)
	var doc struct {
		Inputs  []inputJSON    `json:"inputs"`
		Derived map[string]any `json:"derived"`
	}
	if err := json.Unmarshal([]byte(mustRun(t, ta, "show", "Teodra b II", "--format", "json")), &doc); err != nil {
		t.Fatal(err)
	}
	// The contract's metric names, as plain numbers (or null).
	for _, k := range []string{"tidal_power_w", "radiogenic_power_w", "heat_flux_w_m2", "tidal_force_n", "surface_temperature_k",
		"escape_velocity_m_s", "water_layer_thickness_m", "ice_shell_thickness_m", "ocean_probability", "retention"} {
		if _, ok := doc.Derived[k]; !ok {
			t.Errorf("derived lacks %q", k)
		}
	}
	// Teodra b II has no albedo in the catalog: the profile's prior fills
	// it, marked assumed, never with a catalog revision.
	found := false
	for _, in := range doc.Inputs {
		if in.Key == "bond_albedo" {
			found = true
			if in.Status != "assumed" || in.Revision != 0 || !strings.Contains(in.Source, "prior") {
				t.Errorf("bond_albedo %+v, want an assumed prior value", in)
			}
		}
	}
	if !found {
		t.Errorf("show lists no bond_albedo for Teodra b II")
	}
	// The catalog itself still lacks it.
	if out := mustRun(t, ta, "list", "--planet", "Teodra b", "--format", "json"); strings.Contains(out, `"assumed"`) {
		t.Errorf("list shows assumed values; priors must never reach the catalog")
	}
}

func TestCheck(t *testing.T) {
	ta := newTestApp(t)
	mustRun(t, ta, "import", writeFile(t, t.TempDir(), "moons.csv", readFixture(t, "moons.csv")))
	if out := mustRun(t, ta, "check"); !strings.HasPrefix(out, "catalog ok:") {
		t.Errorf("check of a sound catalog: %q", out)
	}

	// Damage a value behind the store's back: an eccentricity of 1.5 that no
	// import would accept.
	db, err := sql.Open("sqlite", ta.dbPath)
	if err != nil {
		t.Fatal(err)
	}
	setStoredValue(t, db, "eccentricity", 1.5)
	db.Close()

	ta.out.Reset()
	ta.errOut.Reset()
	if code := runCLI(t, ta, "check"); code != exitProblems {
		t.Fatalf("check of a damaged catalog: exit %d, want %d", code, exitProblems)
	}
	if out := ta.out.String(); !strings.Contains(out, "eccentricity") || !strings.Contains(out, "problems") {
		t.Errorf("check report %q does not name the bad values", out)
	}
	if !strings.Contains(ta.errOut.String(), "tidesift: check found 3 problems") {
		t.Errorf("check stderr %q", ta.errOut)
	}
	var doc checkDoc
	ta.out.Reset()
	runCLI(t, ta, "check", "--format", "json")
	if err := json.Unmarshal(ta.out.Bytes(), &doc); err != nil {
		t.Fatal(err)
	}
	if doc.OK || len(doc.Problems) != 3 || doc.Problems[0].Key != "eccentricity" {
		t.Errorf("check json %+v", doc)
	}
}

// setStoredValue sets every stored value of key to v, re-encoding the
// catalog's states (schema/state.go) as the store would not.
func setStoredValue(t *testing.T, db *sql.DB, key string, v float64) {
	t.Helper()
	var code uint64
	if err := db.QueryRow("SELECT code FROM key_name WHERE key = ?", key).Scan(&code); err != nil {
		t.Fatal(err)
	}
	type state struct {
		id   int64
		data []byte
	}
	var states []state
	rows, err := db.Query("SELECT id, data FROM state")
	if err != nil {
		t.Fatal(err)
	}
	for rows.Next() {
		var s state
		if err := rows.Scan(&s.id, &s.data); err != nil {
			t.Fatal(err)
		}
		states = append(states, s)
	}
	rows.Close()
	for _, s := range states {
		var vals []schema.StateValue
		if err := schema.DecodeState(s.data, nil, func(c uint64, p schema.Param) error {
			if c == code {
				p.Value = v
			}
			vals = append(vals, schema.StateValue{Code: c, Param: p})
			return nil
		}); err != nil {
			t.Fatal(err)
		}
		if _, err := db.Exec("UPDATE state SET data = ? WHERE id = ?", schema.AppendState(nil, vals), s.id); err != nil {
			t.Fatal(err)
		}
	}
}

// TestImportListsFirstChanges: a large update lists the first changed
// values and counts the rest, pointing at diff for all of them.
func TestImportListsFirstChanges(t *testing.T) {
	ta := newTestApp(t)
	n := listedChanges + 7
	var first, second strings.Builder
	first.WriteString("name,planet,radius [km]\n")
	second.WriteString("name,planet,radius [km]\n")
	for i := range n {
		fmt.Fprintf(&first, "M%d,P,%d\n", i, 100+i)
		fmt.Fprintf(&second, "M%d,P,%d\n", i, 200+i)
	}
	dir := t.TempDir()
	mustRun(t, ta, "import", writeFile(t, dir, "first.csv", first.String()))
	out := mustRun(t, ta, "import", writeFile(t, dir, "second.csv", second.String()))
	if got := strings.Count(out, "  changed "); got != listedChanges {
		t.Errorf("%d changes listed, want %d", got, listedChanges)
	}
	if !strings.Contains(out, "… and 7 more changed values; tidesift diff 1 2 lists them all") {
		t.Errorf("no count of the rest in:\n%s", out[len(out)-200:])
	}
}

// TestDemoCSVRoundTrip: the demo uses every uncertainty form, per-value and
// row sources, and k2 with Q; its canonical CSV imports again unchanged.
func TestDemoCSVRoundTrip(t *testing.T) {
	ta := newTestApp(t)
	demoCatalog(t, ta)
	again := writeFile(t, t.TempDir(), "again.csv", mustRun(t, ta, "list", "--format", "csv"))
	if out := mustRun(t, ta, "import", again); !strings.Contains(out, "all 99 values are already in the catalog; no revision made") {
		t.Errorf("re-importing the demo's canonical CSV: %q", out)
	}
}

// TestXLSXImportMatchesCSV: a colleague's workbook, with a title block above
// the header, imports to the same catalog as the canonical CSV.
func TestXLSXImportMatchesCSV(t *testing.T) {
	csvText := readFixture(t, "moons.csv")
	rows, err := csv.NewReader(strings.NewReader(csvText)).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	f := excelize.NewFile()
	sheet := "Moons"
	f.SetSheetName("Sheet1", sheet)
	f.SetCellStr(sheet, "A1", "Invented moons for a tidesift test")
	for i, r := range rows {
		for j, c := range r {
			cell, _ := excelize.CoordinatesToCellName(j+1, i+3)
			if v, err := strconv.ParseFloat(c, 64); err == nil && i > 0 {
				f.SetCellFloat(sheet, cell, v, -1, 64)
			} else if c != "" {
				f.SetCellStr(sheet, cell, c)
			}
		}
	}
	book := filepath.Join(dir, "moons.xlsx")
	if err := f.SaveAs(book); err != nil {
		t.Fatal(err)
	}

	fromCSV := newTestApp(t)
	mustRun(t, fromCSV, "import", writeFile(t, dir, "moons.csv", csvText))
	fromXLSX := newTestApp(t)
	mustRun(t, fromXLSX, "import", book, "--sheet", sheet)
	want := mustRun(t, fromCSV, "list", "--format", "json")
	if got := mustRun(t, fromXLSX, "list", "--format", "json"); got != want {
		t.Errorf("XLSX and CSV imports differ:\nxlsx %s\ncsv  %s", got, want)
	}
}
