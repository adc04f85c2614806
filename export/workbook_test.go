package export

import (
	"archive/zip"
	"bytes"
	"encoding/json"
	"fmt"
	"io"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/xuri/excelize/v2"

	"tidesift/rank"
	"tidesift/schema"
)

var testCreated = time.Date(2026, 12, 1, 9, 30, 0, 0, time.UTC)

const testMethod = "Tidal heating\n-------------\nTidal power: E = (3/2) (k2/Q) (n^5 R^5 / G) (7 e^2 + sin^2 obliquity)\n= a line that looks like a formula\n- a bulleted simplification\n"

func testInfo(changes *Changes) WorkbookInfo {
	return WorkbookInfo{Method: testMethod, Version: "0.0.0-test", Created: testCreated, Changes: changes, Since: 5}
}

func testChanges() *Changes {
	return &Changes{
		RankMoves: []RankMove{
			{Name: "Velra b I", Planet: "Velra b", RankBefore: 2, RankAfter: 1, ScoreBefore: q(0.40, 0.50, 0.60), ScoreAfter: q(0.48, 0.62, 0.71)},
			{Name: "Velra b II", Planet: "Velra b", RankBefore: 1, RankAfter: 2, ScoreBefore: q(0.5, 0.6, 0.7), ScoreAfter: q(0.40, 0.55, 0.66)},
			{Name: "Osk c IV", Planet: "Osk c", RankAfter: 3, ScoreAfter: q(0.05, 0.10, 0.18)},
		},
		InputChanges: []InputChange{
			{Moon: "Velra b I", Planet: "Velra b", Star: "Velra", Key: "eccentricity",
				Old:      &schema.Param{Key: "eccentricity", Value: 0.02, Unc: schema.Uncertainty{Kind: schema.UncSymmetric, Sigma: 0.01}, Source: "invented older fit"},
				New:      &schema.Param{Key: "eccentricity", Value: 0.011, Unc: schema.Uncertainty{Kind: schema.UncAsymmetric, Plus: 0.002, Minus: 0.001}, Source: "invented orbit fit"},
				Revision: 7},
			{Moon: "Osk c IV", Planet: "Osk c", Key: "mass", New: &schema.Param{Key: "mass", Value: 3e20, Source: "invented"}, Revision: 6},
			{Star: "Velra", Key: "star_luminosity", Old: &schema.Param{Key: "star_luminosity", Value: 3.3e26}, Revision: 6},
		},
	}
}

func writeBook(tb testing.TB, r *rank.Result, info WorkbookInfo) []byte {
	tb.Helper()
	var buf bytes.Buffer
	if err := WriteWorkbook(&buf, r, info); err != nil {
		tb.Fatalf("WriteWorkbook: %v", err)
	}
	return buf.Bytes()
}

func openBook(tb testing.TB, b []byte) *excelize.File {
	tb.Helper()
	f, err := excelize.OpenReader(bytes.NewReader(b))
	if err != nil {
		tb.Fatalf("read workbook back: %v", err)
	}
	tb.Cleanup(func() { f.Close() })
	return f
}

func rawRows(tb testing.TB, f *excelize.File, sheet string) [][]string {
	tb.Helper()
	rows, err := f.GetRows(sheet, excelize.Options{RawCellValue: true})
	if err != nil {
		tb.Fatalf("rows of %s: %v", sheet, err)
	}
	return rows
}

// dumpBook renders every sheet as "CELL=value" lines, leaving out the cells
// that change between runs (the creation date).
func dumpBook(tb testing.TB, f *excelize.File) string {
	tb.Helper()
	var b strings.Builder
	for _, sheet := range f.GetSheetList() {
		fmt.Fprintf(&b, "== %s\n", sheet)
		for i, row := range rawRows(tb, f, sheet) {
			volatile := len(row) > 0 && row[0] == "Workbook created (UTC)"
			for j, v := range row {
				if v == "" {
					continue
				}
				if volatile && j == 1 {
					v = "<created>"
				}
				fmt.Fprintf(&b, "%s=%q\n", cellName(j+1, i+1), v)
			}
		}
	}
	return b.String()
}

func TestWorkbookGolden(t *testing.T) {
	for _, tt := range []struct {
		name    string
		changes *Changes
		golden  string
	}{
		{"without changes", nil, "workbook.golden"},
		{"with changes", testChanges(), "workbook_changes.golden"},
	} {
		t.Run(tt.name, func(t *testing.T) {
			f := openBook(t, writeBook(t, sampleResult(), testInfo(tt.changes)))
			want := []string{SheetRanking, SheetDerived, SheetInputs, SheetDrivers, SheetMethod}
			if tt.changes != nil {
				want = []string{SheetRanking, SheetDerived, SheetInputs, SheetDrivers, SheetChanges, SheetMethod}
			}
			if got := f.GetSheetList(); strings.Join(got, ",") != strings.Join(want, ",") {
				t.Errorf("sheets = %v, want %v", got, want)
			}
			checkGolden(t, tt.golden, []byte(dumpBook(t, f)))
		})
	}
}

func TestWorkbookHeaders(t *testing.T) {
	f := openBook(t, writeBook(t, sampleResult(), testInfo(testChanges())))
	want := map[string]string{
		SheetRanking: "Rank (median)|Rank interval (5–95 %)|Name|Planet|Star|Score: median (5–95 % range)|Score p05|Score p50|Score p95|P(rank ≤ 2)|Ocean probability|" +
			"Heat flux: median (5–95 % range)|Heat flux p05 [W/m²]|Heat flux p50 [W/m²]|Heat flux p95 [W/m²]|Ice shell: median (5–95 % range)|Ice shell p05 [m]|Ice shell p50 [m]|Ice shell p95 [m]|" +
			"Volatiles retained (P ≥ 0.5)|Main driver (what to measure next)|Main driver share of score variance|Assumed inputs mark|Assumed inputs|Notes",
		SheetDerived: "Rank (median)|Name|Planet|Tidal power p05 [W]|Tidal power p50 [W]|Tidal power p95 [W]|Radiogenic power p05 [W]|Radiogenic power p50 [W]|Radiogenic power p95 [W]|" +
			"Surface heat flux p05 [W/m²]|Surface heat flux p50 [W/m²]|Surface heat flux p95 [W/m²]|Differential tidal force p05 [N]|Differential tidal force p50 [N]|Differential tidal force p95 [N]|" +
			"Surface temperature p05 [K]|Surface temperature p50 [K]|Surface temperature p95 [K]|Escape velocity p05 [m/s]|Escape velocity p50 [m/s]|Escape velocity p95 [m/s]|" +
			"H2O layer thickness p05 [m]|H2O layer thickness p50 [m]|H2O layer thickness p95 [m]|Ice shell thickness p05 [m]|Ice shell thickness p50 [m]|Ice shell thickness p95 [m]|" +
			"Ocean probability|Ocean probability MC s.e.|Score p50 MC s.e.|P(H2O retained)|P(CH4 retained)|P(N2 retained)|P(CO retained)|Model validity flags (share of samples)",
		SheetInputs:  "Name|Planet|Key|Description|Value|Unit|Uncertainty|Uncertainty kind|Low (−1σ or bound)|High (+1σ or bound)|Status|Prior (assumed inputs)|Source|Revision",
		SheetDrivers: "Rank (median)|Name|Planet|Main driver (what to measure next)|Share: mass|Share: eccentricity|Share: k2_q|Share: moment_of_inertia|Sum of first-order shares",
	}
	for sheet, w := range want {
		rows := rawRows(t, f, sheet)
		if got := strings.Join(rows[0], "|"); got != w {
			t.Errorf("%s header\n got %s\nwant %s", sheet, got, w)
		}
	}
	ch := rawRows(t, f, SheetChanges)
	if got := strings.Join(ch[1], "|"); got != "Name|Planet|Rank before|Rank after|Rank change (+ = up)|Score p50 before|Score p50 after|Score before: median (5–95 %)|Score after: median (5–95 %)" {
		t.Errorf("Changes moves header = %s", got)
	}
	if got := strings.Join(ch[7], "|"); got != "Moon|Planet|Star|Key|Change|Old value|Old uncertainty|New value|New uncertainty|Unit|Revision|Source" {
		t.Errorf("Changes inputs header = %s", got)
	}
}

func parseCell(tb testing.TB, sheet, cell, s string) float64 {
	tb.Helper()
	if s == "" {
		return math.NaN()
	}
	v, err := strconv.ParseFloat(s, 64)
	if err != nil {
		tb.Fatalf("%s!%s = %q: not a number", sheet, cell, s)
	}
	return v
}

// TestWorkbookRankingMatchesResult reads the Ranking sheet back and compares
// every numeric cell with the Result and with the JSON document parsed back.
func TestWorkbookRankingMatchesResult(t *testing.T) {
	r := sampleResult()
	var js bytes.Buffer
	if err := WriteJSON(&js, r); err != nil {
		t.Fatal(err)
	}
	var fromJSON rank.Result
	if err := json.Unmarshal(js.Bytes(), &fromJSON); err != nil {
		t.Fatal(err)
	}
	f := openBook(t, writeBook(t, r, testInfo(nil)))
	rows := rawRows(t, f, SheetRanking)
	if len(rows) != len(r.Targets)+1 {
		t.Fatalf("%d Ranking rows, want %d", len(rows), len(r.Targets)+1)
	}
	col := map[string]int{}
	for j, h := range rows[0] {
		col[h] = j
	}
	for i, tg := range r.Targets {
		row := rows[i+1]
		for len(row) < len(rows[0]) {
			row = append(row, "")
		}
		get := func(h string) float64 {
			j, ok := col[h]
			if !ok {
				t.Fatalf("no column %q", h)
			}
			return parseCell(t, SheetRanking, cellName(j+1, i+2), row[j])
		}
		jt := fromJSON.Targets[i]
		for _, c := range []struct {
			h            string
			want, wantJS float64
		}{
			{"Rank (median)", tg.Rank, jt.Rank},
			{"Score p05", tg.Score.P05, jt.Score.P05},
			{"Score p50", tg.Score.P50, jt.Score.P50},
			{"Score p95", tg.Score.P95, jt.Score.P95},
			{"P(rank ≤ 2)", tg.PTop.P, jt.PTop.P},
			{"Ocean probability", tg.Metrics.OceanProbability, jt.Metrics.OceanProbability},
			{"Heat flux p50 [W/m²]", tg.Metrics.HeatFlux.P50, jt.Metrics.HeatFlux.P50},
			{"Ice shell p05 [m]", tg.Metrics.IceShellThickness.P05, jt.Metrics.IceShellThickness.P05},
		} {
			got := get(c.h)
			if !closeTo(got, c.want, 1e-14) && !(math.IsNaN(got) && !isFinite(c.want)) {
				t.Errorf("target %d %s = %v, want %v", i+1, c.h, got, c.want)
			}
			if isFinite(c.want) && !closeTo(got, c.wantJS, 1e-14) {
				t.Errorf("target %d %s = %v, JSON says %v", i+1, c.h, got, c.wantJS)
			}
		}
		p05, p50, p95 := get("Score p05"), get("Score p50"), get("Score p95")
		if !(p05 <= p50 && p50 <= p95) {
			t.Errorf("target %d score quantiles out of order: %v %v %v", i+1, p05, p50, p95)
		}
		for _, pre := range []string{"Heat flux", "Ice shell"} {
			unit := map[string]string{"Heat flux": " [W/m²]", "Ice shell": " [m]"}[pre]
			a, b, c := get(pre+" p05"+unit), get(pre+" p50"+unit), get(pre+" p95"+unit)
			if (isFinite(a) && isFinite(b) && a > b) || (isFinite(b) && isFinite(c) && b > c) {
				t.Errorf("target %d %s quantiles out of order: %v %v %v", i+1, pre, a, b, c)
			}
		}
		if row[col["Name"]] != tg.Name || row[col["Planet"]] != tg.Planet || row[col["Star"]] != tg.Star {
			t.Errorf("target %d names = %q/%q/%q", i+1, row[col["Name"]], row[col["Planet"]], row[col["Star"]])
		}
		if got, want := row[col["Score: median (5–95 % range)"]], FormatRange(tg.Score, ""); got != want {
			t.Errorf("target %d score text = %q, want %q", i+1, got, want)
		}
	}
	if got := rows[1][col["Volatiles retained (P ≥ 0.5)"]]; got != "H2O, CH4, N2" {
		t.Errorf("volatiles retained = %q, want H2O, CH4, N2", got)
	}
	if got := rows[1][col["Assumed inputs mark"]]; got != "*" {
		t.Errorf("assumed mark = %q", got)
	}
}

// TestWorkbookDerivedQuantilesOrdered checks p05 ≤ p50 ≤ p95 for every
// metric of every row of a large synthetic workbook.
func TestWorkbookDerivedQuantilesOrdered(t *testing.T) {
	r := syntheticResult(120)
	f := openBook(t, writeBook(t, r, testInfo(nil)))
	rows := rawRows(t, f, SheetDerived)
	if len(rows) != 121 {
		t.Fatalf("%d Derived rows, want 121", len(rows))
	}
	for i, row := range rows[1:] {
		for m := range metrics {
			j := 3 + 3*m
			a, b, c := parseCell(t, SheetDerived, "", row[j]), parseCell(t, SheetDerived, "", row[j+1]), parseCell(t, SheetDerived, "", row[j+2])
			if !(a <= b && b <= c) {
				t.Errorf("row %d %s: %v %v %v out of order", i+2, rows[0][j], a, b, c)
			}
			want := metrics[m].get(&r.Targets[i].Metrics)
			if !closeTo(b, want.P50, 1e-14) {
				t.Errorf("row %d %s = %v, want %v", i+2, rows[0][j+1], b, want.P50)
			}
		}
	}
	if n := len(rawRows(t, f, SheetInputs)); n != 120*15+1 {
		t.Errorf("%d Inputs rows, want %d", n, 120*15+1)
	}
}

func TestWorkbookMethodSheet(t *testing.T) {
	r := sampleResult()
	r.Seed = 1<<63 + 12345 // beyond a spreadsheet number's precision
	f := openBook(t, writeBook(t, r, testInfo(nil)))
	rows := rawRows(t, f, SheetMethod)
	kv := map[string]string{}
	var text []string
	for _, row := range rows {
		if len(row) >= 2 {
			kv[row[0]] = row[1]
		}
		text = append(text, row...)
	}
	all := strings.Join(text, "\n")
	for k, want := range map[string]string{
		"Seed":                           strconv.FormatUint(r.Seed, 10),
		"Monte Carlo samples":            "4000",
		"Catalog revision":               "7",
		"Catalog content hash (SHA-256)": "9c1e0b7d2a",
		"tidesift version":               "0.0.0-test",
		"Workbook created (UTC)":         "2026-12-01T09:30:00Z",
		"GOARCH of the ranking":          "amd64",
		"Scoring profile":                "ocean-worlds",
	} {
		if kv[k] != want {
			t.Errorf("Method %q = %q, want %q", k, kv[k], want)
		}
	}
	if strings.Contains(all, "-------------") {
		t.Error("Method sheet keeps the heading's underline")
	}
	heading := false
	for i, row := range rows {
		if len(row) > 1 && row[1] == "Tidal heating" {
			heading = true
			style, _ := f.GetCellStyle(SheetMethod, cellName(2, i+1))
			if st, err := f.GetStyle(style); err != nil || st.Font == nil || !st.Font.Bold {
				t.Errorf("method heading is not bold (style %d, %v)", style, err)
			}
		}
	}
	if !heading {
		t.Error("method heading not found in column B")
	}
	for _, want := range []string{Caution, "never replace, expert review", "Tidal heating", "Osk c IX (Osk c): missing mass, radius", "profile prior for k2_q", "conduction only", "no self-compression",
		"Tidal power: E = (3/2)", "\n= a line that looks like a formula", "\n- a bulleted simplification",
		`name = "ocean-worlds"`, `quantity = "ocean_probability"`} {
		if !strings.Contains(all, want) {
			t.Errorf("Method sheet lacks %q", want)
		}
	}
}

func TestWorkbookNeutralisesFormulas(t *testing.T) {
	r := hostileResult()
	b := writeBook(t, r, testInfo(nil))
	f := openBook(t, b)
	rows := rawRows(t, f, SheetRanking)
	for i, tg := range r.Targets {
		row := rows[i+1]
		for j, want := range map[int]string{2: tg.Name, 3: tg.Planet, 4: tg.Star} {
			got := row[j]
			if got != "" && formulaLead(got[0]) {
				t.Errorf("row %d column %d = %q begins with a formula character", i+2, j+1, got)
			}
			if UnsafeText(got) != want {
				t.Errorf("row %d column %d = %q, want %q behind the apostrophe", i+2, j+1, got, want)
			}
			ref := cellName(j+1, i+2)
			if formula, err := f.GetCellFormula(SheetRanking, ref); err != nil || formula != "" {
				t.Errorf("%s holds formula %q (%v)", ref, formula, err)
			}
			if typ, err := f.GetCellType(SheetRanking, ref); err != nil || typ != excelize.CellTypeInlineString {
				t.Errorf("%s has type %v (%v), want an inline string", ref, typ, err)
			}
		}
	}
	if rows[1][2] != "'=1+1" || rows[2][2] != "'@SUM(A1)" {
		t.Errorf("names = %q, %q", rows[1][2], rows[2][2])
	}
	// Control characters cannot stand in XML: the cell holds U+FFFD instead
	// and the workbook stays readable.
	r2 := sampleResult()
	r2.Targets[0].Name = "\x00Vel\x01ra"
	rows2 := rawRows(t, openBook(t, writeBook(t, r2, testInfo(nil))), SheetRanking)
	if got := rows2[1][2]; got != "'\uFFFDVel\uFFFDra" {
		t.Errorf("name with control characters written as %q", got)
	}
	// No sheet of the package holds a formula element at all.
	zr, err := zip.NewReader(bytes.NewReader(b), int64(len(b)))
	if err != nil {
		t.Fatal(err)
	}
	for _, zf := range zr.File {
		if !strings.HasPrefix(zf.Name, "xl/worksheets/") {
			continue
		}
		rc, _ := zf.Open()
		data, _ := io.ReadAll(rc)
		rc.Close()
		if bytes.Contains(data, []byte("<f>")) || bytes.Contains(data, []byte("<f ")) {
			t.Errorf("%s holds a formula", zf.Name)
		}
	}
}

// TestWorkbookPresentation checks the parts a reader sees but a cell dump
// does not: frozen panes, autofilters, data bars, the chart and the document
// properties.
func TestWorkbookPresentation(t *testing.T) {
	r := syntheticResult(80)
	b := writeBook(t, r, testInfo(testChanges()))
	f := openBook(t, b)
	for _, sheet := range []string{SheetRanking, SheetDerived, SheetInputs, SheetDrivers, SheetChanges} {
		p, err := f.GetPanes(sheet)
		if err != nil || !p.Freeze || p.YSplit < 1 {
			t.Errorf("%s panes = %+v (%v), want a frozen header", sheet, p, err)
		}
	}
	cf, err := f.GetConditionalFormats(SheetRanking)
	if err != nil {
		t.Fatal(err)
	}
	if opts, ok := cf["H2:H81"]; !ok || len(opts) != 1 || opts[0].Type != "data_bar" {
		t.Errorf("conditional formats = %+v, want data bars on H2:H81", cf)
	}
	props, err := f.GetDocProps()
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(props.Keywords, "seed 42") || !strings.Contains(props.Keywords, "revision 7") || props.Created != "2026-12-01T09:30:00Z" {
		t.Errorf("document properties = %+v", props)
	}
	if w, err := f.GetColWidth(SheetInputs, "M"); err != nil || w < float64(len("synthetic generator, invented")) {
		t.Errorf("Inputs source column width = %v (%v), want it to fit the sources", w, err)
	}
	parts := zipParts(t, b)
	chart := ""
	for name, data := range parts {
		if strings.HasPrefix(name, "xl/charts/chart") {
			chart = strings.ReplaceAll(data, "&#39;", "'")
		}
	}
	for _, want := range []string{"<stockChart>", "'Ranking'!$I$2:$I$51", "'Ranking'!$G$2:$G$51", "'Ranking'!$H$2:$H$51", "'Ranking'!$C$2:$C$51", "top 50 of 80 targets", "<hiLowLines>"} {
		if !strings.Contains(chart, want) {
			t.Errorf("chart lacks %q", want)
		}
	}
	for _, sheet := range []string{"sheet1.xml", "sheet2.xml", "sheet3.xml", "sheet4.xml", "sheet5.xml"} {
		if !strings.Contains(parts["xl/worksheets/"+sheet], "<autoFilter ") {
			t.Errorf("%s has no autofilter", sheet)
		}
	}
	if !strings.Contains(parts["xl/worksheets/sheet1.xml"], "<dimension ref=\"A1:Y81\"") {
		t.Error("Ranking sheet has no dimension A1:Y81")
	}
}

func zipParts(tb testing.TB, b []byte) map[string]string {
	tb.Helper()
	zr, err := zip.NewReader(bytes.NewReader(b), int64(len(b)))
	if err != nil {
		tb.Fatal(err)
	}
	out := map[string]string{}
	for _, zf := range zr.File {
		rc, err := zf.Open()
		if err != nil {
			tb.Fatal(err)
		}
		data, _ := io.ReadAll(rc)
		rc.Close()
		out[zf.Name] = string(data)
	}
	return out
}

func TestWorkbookSmallResults(t *testing.T) {
	for n := 0; n <= 1; n++ {
		r := sampleResult()
		r.Targets = r.Targets[:n]
		b := writeBook(t, r, testInfo(&Changes{}))
		f := openBook(t, b)
		if rows := rawRows(t, f, SheetRanking); len(rows) != n+1 {
			t.Errorf("%d targets: Ranking has %d rows, want %d", n, len(rows), n+1)
		}
		charts := 0
		for name := range zipParts(t, b) {
			if strings.HasPrefix(name, "xl/charts/chart") {
				charts++
			}
		}
		if charts != n {
			t.Errorf("%d targets: %d charts, want %d", n, charts, n)
		}
	}
}

func TestSaveWorkbook(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "panel.xlsx")
	if err := SaveWorkbook(path, sampleResult(), testInfo(nil)); err != nil {
		t.Fatal(err)
	}
	f, err := excelize.OpenFile(path)
	if err != nil {
		t.Fatal(err)
	}
	f.Close()
	entries, _ := os.ReadDir(dir)
	if len(entries) != 1 {
		t.Errorf("directory holds %d entries, want only the workbook", len(entries))
	}
	// The workbook gets the mode any new file gets here (0666 less the umask).
	ref := filepath.Join(t.TempDir(), "ref")
	if err := os.WriteFile(ref, nil, 0o666); err != nil {
		t.Fatal(err)
	}
	st, err1 := os.Stat(path)
	want, err2 := os.Stat(ref)
	if err1 != nil || err2 != nil || st.Mode().Perm() != want.Mode().Perm() {
		t.Errorf("workbook mode = %v, want %v (%v, %v)", st.Mode(), want.Mode(), err1, err2)
	}
	// A failed write leaves an existing file as it was.
	if err := os.WriteFile(path, []byte("old"), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := SaveWorkbook(path, nil, testInfo(nil)); err == nil {
		t.Error("nil result saved")
	}
	if b, _ := os.ReadFile(path); string(b) != "old" {
		t.Errorf("failed save changed the existing file to %d bytes", len(b))
	}
	if entries, _ := os.ReadDir(dir); len(entries) != 1 {
		t.Errorf("failed save left %d entries", len(entries))
	}
	if err := SaveWorkbook(filepath.Join(dir, "missing", "x.xlsx"), sampleResult(), testInfo(nil)); err == nil {
		t.Error("saving into a missing directory succeeded")
	}
	if err := WriteWorkbook(io.Discard, nil, testInfo(nil)); err == nil {
		t.Error("nil result accepted")
	}
}

// TestWorkbookOpensInLibreOffice converts the workbook headlessly when
// LibreOffice is installed; CI without it skips.
func TestWorkbookOpensInLibreOffice(t *testing.T) {
	bin := ""
	for _, name := range []string{"soffice", "libreoffice"} {
		if p, err := exec.LookPath(name); err == nil {
			bin = p
			break
		}
	}
	if bin == "" {
		t.Skip("LibreOffice (soffice or libreoffice) not on PATH: headless conversion check skipped")
	}
	if testing.Short() {
		t.Skip("LibreOffice conversion takes seconds: skipped under -short")
	}
	dir := t.TempDir()
	// convert runs one soffice for several books (its start-up is the cost).
	convert := func(to, filter string, books ...string) [][]byte {
		t.Helper()
		out := filepath.Join(dir, to)
		args := append([]string{"--headless", "--norestore", "-env:UserInstallation=file://" + filepath.ToSlash(filepath.Join(dir, "profile")),
			"--convert-to", filter, "--outdir", out}, books...)
		cmd := exec.Command(bin, args...)
		cmd.Env = append(os.Environ(), "HOME="+dir)
		msg, err := cmd.CombinedOutput()
		if err != nil {
			t.Fatalf("soffice --convert-to %s: %v\n%s", to, err, msg)
		}
		var res [][]byte
		for _, book := range books {
			name := strings.TrimSuffix(filepath.Base(book), ".xlsx") + "." + to
			data, err := os.ReadFile(filepath.Join(out, name))
			if err != nil {
				t.Fatalf("no %s output: %v\n%s", to, err, msg)
			}
			res = append(res, data)
		}
		return res
	}
	// The CSV filter options ask for comma, double quote and UTF-8 (76).
	const csvFilter = `csv:Text - txt - csv (StarCalc):44,34,76`

	panel := filepath.Join(dir, "panel.xlsx")
	if err := SaveWorkbook(panel, sampleResult(), testInfo(testChanges())); err != nil {
		t.Fatal(err)
	}
	// Names that look like formulas (and control characters) must stay text.
	hostile := filepath.Join(dir, "hostile.xlsx")
	r := hostileResult()
	r.Targets[2].Star = "Vel\x00ra\x01 b"
	if err := SaveWorkbook(hostile, r, testInfo(nil)); err != nil {
		t.Fatal(err)
	}
	csvs := convert("csv", csvFilter, panel, hostile)
	s := string(csvs[0])
	for _, want := range []string{"Rank (median)", "Velra b I", "Osk c IV", "0.62 (0.48–0.71)"} {
		if !strings.Contains(s, want) {
			t.Errorf("LibreOffice's CSV of the Ranking sheet lacks %q:\n%s", want, s)
		}
	}
	if pdf := convert("pdf", "pdf", panel)[0]; !bytes.HasPrefix(pdf, []byte("%PDF")) {
		t.Errorf("LibreOffice's PDF does not start with %%PDF")
	}
	s = string(csvs[1])
	for _, want := range []string{"'=1+1", "'@SUM(A1)", "'-x", "'+x"} {
		if !strings.Contains(s, want) {
			t.Errorf("LibreOffice's CSV of the hostile workbook lacks %q:\n%s", want, s)
		}
	}
}

func TestWorkbookRowLimit(t *testing.T) {
	defer func(n int) { maxSheetRows = n }(maxSheetRows)
	maxSheetRows = 20
	r := syntheticResult(5) // 75 inputs
	f := openBook(t, writeBook(t, r, testInfo(nil)))
	rows := rawRows(t, f, SheetInputs)
	if len(rows) != 20 {
		t.Fatalf("Inputs has %d rows, want 20", len(rows))
	}
	if last := rows[19][0]; !strings.HasPrefix(last, "… 57 more rows not shown") {
		t.Errorf("last row = %q, want the cut-off note", last)
	}
	if n := len(rawRows(t, f, SheetRanking)); n != 6 {
		t.Errorf("Ranking has %d rows, want 6", n)
	}
}
