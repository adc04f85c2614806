package export

import (
	"archive/zip"
	"compress/flate"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"runtime"
	"sort"
	"strconv"
	"strings"
	"time"

	"github.com/xuri/excelize/v2"

	"tidesift/rank"
	"tidesift/schema"
)

// Sheet names of the review workbook, in workbook order. SheetChanges is
// present only when WorkbookInfo.Changes is set.
const (
	SheetRanking = "Ranking"
	SheetDerived = "Derived"
	SheetInputs  = "Inputs"
	SheetDrivers = "Drivers"
	SheetChanges = "Changes"
	SheetMethod  = "Method"
)

// ChartTargets is the number of best-ranked targets the Ranking sheet's score
// chart shows; more make the category axis unreadable.
const ChartTargets = 50

// WorkbookInfo is the context a workbook carries beyond the ranking itself.
type WorkbookInfo struct {
	Method  string    // the method text (formulas, constants, sources), one line per row of the Method sheet
	Version string    // tidesift version
	Created time.Time // creation time shown in the Method sheet and the document properties (zero: now)
	Changes *Changes  // nil: no Changes sheet
	Since   int64     // the revision Changes compares against
}

// Changes is what moved since an earlier catalog revision: the Changes sheet.
type Changes struct {
	InputChanges []InputChange
	RankMoves    []RankMove
}

// InputChange is one catalog value added, changed or removed since the
// earlier revision. The body is named by Moon, Planet and Star: a moon's
// value has all three (Star may be empty), a planet's value has Moon empty,
// a star's value has Moon and Planet empty.
type InputChange struct {
	Moon, Planet, Star string
	Key                string        // canonical key (schema.Keys)
	Old                *schema.Param // nil: added
	New                *schema.Param // nil: removed
	Revision           int64         // the revision that made the change
}

// RankMove is how one target's rank and score moved between the earlier
// revision and this ranking. A rank of 0 means "not ranked then" (a target
// that is new, or gone).
type RankMove struct {
	Name, Planet            string
	RankBefore, RankAfter   float64 // median ranks
	ScoreBefore, ScoreAfter rank.Quantiles
}

// SaveWorkbook writes the workbook to path. It writes a temporary file in the
// same directory and renames it, so a failure leaves no half-written workbook
// (and an existing file at path untouched).
func SaveWorkbook(path string, r *rank.Result, info WorkbookInfo) (err error) {
	tmp, err := createSibling(path)
	if err != nil {
		return fmt.Errorf("save workbook: %w", err)
	}
	defer func() {
		if err != nil {
			tmp.Close()
			os.Remove(tmp.Name())
		}
	}()
	if err = WriteWorkbook(tmp, r, info); err != nil {
		return err
	}
	if err = tmp.Close(); err != nil {
		return fmt.Errorf("save workbook %s: %w", path, err)
	}
	if err = os.Rename(tmp.Name(), path); err != nil {
		return fmt.Errorf("save workbook %s: %w", path, err)
	}
	return nil
}

// createSibling creates a new temporary file beside path with mode 0666 less
// the umask (os.CreateTemp would make it 0600, and the rename would keep that).
func createSibling(path string) (*os.File, error) {
	dir, base := filepath.Split(path)
	var last error
	for range 10 {
		name := filepath.Join(dir, fmt.Sprintf(".%s.%d.tmp", base, rand.Uint32()))
		f, err := os.OpenFile(name, os.O_RDWR|os.O_CREATE|os.O_EXCL, 0o666)
		if err == nil {
			return f, nil
		}
		if !errors.Is(err, fs.ErrExist) {
			return nil, err
		}
		last = err
	}
	return nil, last
}

// WriteWorkbook writes the review workbook (Office Open XML, .xlsx) of r:
//
//   - Ranking: rank and rank interval, name, planet, star, the score as text
//     and as numeric p05/p50/p95 (with data bars on the median), P(rank ≤ k),
//     ocean probability, heat flux and ice shell as text and numbers, the
//     volatiles retained with P ≥ 0.5, the main driver of the score's
//     uncertainty and the assumed-input mark; beside it a chart of the best
//     ChartTargets targets' score medians with their 5–95 % ranges.
//   - Derived: every derived quantity's p05/p50/p95 with units in the headers.
//   - Inputs: every input of every target with its uncertainty, unit,
//     measured or assumed status (and the prior), source and revision.
//   - Drivers: each input's first-order share of each target's score variance.
//   - Changes (only when info.Changes is set): rank and score moves and the
//     changed inputs since info.Since.
//   - Method: the cautions, the simplifications, info.Method, the run's seed,
//     samples, catalog revision and content hash, version, date and GOARCH,
//     and the profile in full.
//
// Data sheets have a frozen header row, an autofilter and column widths
// measured from their content; NaN and ±Inf are written as empty cells; text
// is written as string cells through SafeText, never as formulas.
func WriteWorkbook(w io.Writer, r *rank.Result, info WorkbookInfo) error {
	if r == nil {
		return errors.New("write workbook: no ranking result")
	}
	if info.Created.IsZero() {
		info.Created = time.Now()
	}
	b, err := newBook(w)
	if err != nil {
		return fmt.Errorf("write workbook: %w", err)
	}
	defer b.f.Close()
	names := []string{SheetRanking, SheetDerived, SheetInputs, SheetDrivers}
	if info.Changes != nil {
		names = append(names, SheetChanges)
	}
	names = append(names, SheetMethod)
	if err := b.f.SetSheetName("Sheet1", names[0]); err != nil {
		return fmt.Errorf("write workbook: %w", err)
	}
	for _, n := range names[1:] {
		if _, err := b.f.NewSheet(n); err != nil {
			return fmt.Errorf("write workbook: sheet %s: %w", n, err)
		}
	}
	steps := []struct {
		sheet string
		fn    func() error
	}{
		{SheetRanking, func() error { return b.ranking(r) }},
		{SheetDerived, func() error { return b.derived(r) }},
		{SheetInputs, func() error { return b.inputs(r) }},
		{SheetDrivers, func() error { return b.drivers(r) }},
	}
	if info.Changes != nil {
		steps = append(steps, struct {
			sheet string
			fn    func() error
		}{SheetChanges, func() error { return b.changes(info.Changes, info.Since) }})
	}
	steps = append(steps, struct {
		sheet string
		fn    func() error
	}{SheetMethod, func() error { return b.method(r, info) }})
	for _, s := range steps {
		if err := s.fn(); err != nil {
			return fmt.Errorf("write workbook: sheet %s: %w", s.sheet, err)
		}
	}
	if err := b.props(r, info); err != nil {
		return fmt.Errorf("write workbook: document properties: %w", err)
	}
	// No SetActiveSheet: it would parse every streamed sheet back; Ranking is first and active.
	// The zip writer streams to w itself (see newBook); whatever excelize
	// buffers besides must be empty.
	if err := b.f.Write(mustStayEmpty{}); err != nil {
		return fmt.Errorf("write workbook: %w", err)
	}
	return nil
}

// mustStayEmpty receives excelize's in-memory copy of the workbook, which is
// empty because the zip goes straight to the destination; a library change
// that put bytes there would corrupt the output, so it fails loudly instead.
type mustStayEmpty struct{}

func (mustStayEmpty) Write(p []byte) (int, error) {
	if len(p) == 0 {
		return 0, nil
	}
	return 0, errors.New("excelize buffered workbook bytes outside the zip writer (library behaviour changed)")
}

// book holds the file being written and its styles.
type book struct {
	f      *excelize.File
	header int            // bold header cells
	title  int            // section titles on the Changes and Method sheets
	mono   int            // the profile TOML
	wrap   int            // wrapped text on the Method sheet
	bold   int            // headings of the method text
	left   int            // left-aligned values on the Method sheet
	numFmt map[string]int // number format → style
}

func newBook(dst io.Writer) (*book, error) {
	f := excelize.NewFile()
	// The zip goes straight to dst instead of into the buffer excelize hands
	// over (File.Write would hold the whole workbook in memory, then copy it).
	// Deflate runs at its fastest level: a 10,000-target workbook holds
	// ~150 MB of sheet XML, and the default level costs seconds for a few
	// percent of size.
	f.SetZipWriter(func(io.Writer) excelize.ZipWriter {
		zw := zip.NewWriter(dst)
		zw.RegisterCompressor(zip.Deflate, func(out io.Writer) (io.WriteCloser, error) {
			return flate.NewWriter(out, flate.BestSpeed)
		})
		return zw
	})
	b := &book{f: f, numFmt: map[string]int{}}
	var err error
	if b.header, err = f.NewStyle(&excelize.Style{
		Font:      &excelize.Font{Bold: true},
		Fill:      excelize.Fill{Type: "pattern", Pattern: 1, Color: []string{"#DDE4EE"}},
		Border:    []excelize.Border{{Type: "bottom", Color: "#7F8FA6", Style: 1}},
		Alignment: &excelize.Alignment{Vertical: "top", WrapText: true},
	}); err != nil {
		return nil, err
	}
	if b.title, err = f.NewStyle(&excelize.Style{Font: &excelize.Font{Bold: true, Size: 12}}); err != nil {
		return nil, err
	}
	if b.mono, err = f.NewStyle(&excelize.Style{Font: &excelize.Font{Family: "Courier New"}}); err != nil {
		return nil, err
	}
	if b.bold, err = f.NewStyle(&excelize.Style{Font: &excelize.Font{Bold: true}}); err != nil {
		return nil, err
	}
	if b.wrap, err = f.NewStyle(&excelize.Style{Alignment: &excelize.Alignment{WrapText: true, Vertical: "top"}}); err != nil {
		return nil, err
	}
	if b.left, err = f.NewStyle(&excelize.Style{Alignment: &excelize.Alignment{Horizontal: "left"}}); err != nil {
		return nil, err
	}
	if b.numFmt[fmtCentred], err = f.NewStyle(&excelize.Style{Alignment: &excelize.Alignment{Horizontal: "center"}}); err != nil {
		return nil, err
	}
	for _, nf := range []string{fmtPower, fmtKelvin, fmtWhole, fmtProb, fmtShare, "0"} {
		nf := nf
		id, err := f.NewStyle(&excelize.Style{CustomNumFmt: &nf})
		if err != nil {
			return nil, err
		}
		b.numFmt[nf] = id
	}
	return b, nil
}

// fmtCentred is not a number format but a centred text column (the rank
// interval, which would otherwise run into the rank beside it).
const fmtCentred = "centred text"

// column is one column of a data sheet.
type column struct {
	header string
	numFmt string // "" for text and General numbers
}

// table is a streamed data sheet: a header row, then rows produced on demand
// (twice: once to measure the column widths, once to write).
type table struct {
	sheet      string
	title      string // optional title row above the header row
	cols       []column
	rows       int                          // data rows
	row        func(i int, dst []any) []any // values of data row i, in column order
	freezeCols int                          // leading columns kept in view
	filterRows int                          // data rows under the autofilter (0: all)
	filterCols int                          // columns under the autofilter (0: all)
	fitWidth   bool                         // print all columns on one page width
	// extras runs after the rows and before Flush (the only point where
	// conditional formats, autofilters and charts survive on a streamed sheet).
	extras func(sw *excelize.StreamWriter, lastRow int) error
}

// maxSheetRows is the most rows a worksheet holds (Office Open XML limit);
// a variable so tests can exercise the cut-off.
var maxSheetRows = excelize.TotalRows

func (b *book) stream(t table) error {
	headRow := 1
	if t.title != "" {
		headRow = 2
	}
	// A sheet that would pass the row limit keeps what fits and says so in
	// its last row; CSV and JSON have no such limit.
	cut := 0
	if room := maxSheetRows - headRow - 1; t.rows > room {
		cut = t.rows - room
		t.rows = room
		if t.filterRows > t.rows {
			t.filterRows = t.rows
		}
	}
	// Headers wrap: a column is as wide as its content, its header's longest
	// word, or a short header, whichever is widest.
	widths := make([]float64, len(t.cols))
	for j, c := range t.cols {
		widths[j] = headerWidth(c.header)
	}
	buf := make([]any, 0, len(t.cols))
	for i := 0; i < t.rows; i++ {
		buf = t.row(i, buf[:0])
		for j, v := range buf {
			if j < len(widths) {
				widths[j] = max(widths[j], float64(cellWidth(v, t.cols[j].numFmt)))
			}
		}
	}
	lastRow := headRow + t.rows
	if cut > 0 {
		lastRow++
	}
	last, err := excelize.CoordinatesToCellName(len(t.cols), lastRow)
	if err != nil {
		return err
	}
	// Order matters on a streamed sheet (see library-notes): dimension, then
	// the writer, then panes and widths, then rows, then extras, then Flush.
	if err := b.f.SetSheetDimension(t.sheet, "A1:"+last); err != nil {
		return err
	}
	if t.fitWidth {
		// Sheet properties are written when the stream writer starts.
		fit := true
		if err := b.f.SetSheetProps(t.sheet, &excelize.SheetPropsOptions{FitToPage: &fit}); err != nil {
			return err
		}
	}
	sw, err := b.f.NewStreamWriter(t.sheet)
	if err != nil {
		return err
	}
	if err := freeze(sw, headRow, t.freezeCols); err != nil {
		return err
	}
	for j, c := range t.cols {
		if err := sw.SetColWidth(j+1, j+1, fitWidth(widths[j])); err != nil {
			return err
		}
		if id, ok := b.numFmt[c.numFmt]; ok {
			if err := sw.SetColStyle(j+1, j+1, id); err != nil {
				return err
			}
		}
	}
	if t.title != "" {
		if err := sw.SetRow("A1", []any{excelize.Cell{StyleID: b.title, Value: SafeText(t.title)}}); err != nil {
			return err
		}
	}
	head := make([]any, len(t.cols))
	lines := 1
	for j, c := range t.cols {
		if c.header != "" {
			head[j] = excelize.Cell{StyleID: b.header, Value: SafeText(c.header)}
			lines = max(lines, headerLines(c.header, fitWidth(widths[j])))
		}
	}
	if err := sw.SetRow(cellName(1, headRow), head, excelize.RowOpts{Height: 15 * float64(lines)}); err != nil {
		return err
	}
	for i := 0; i < t.rows; i++ {
		buf = t.row(i, buf[:0])
		if err := sw.SetRow(cellName(1, headRow+1+i), buf); err != nil {
			return fmt.Errorf("row %d: %w", headRow+1+i, err)
		}
	}
	if cut > 0 {
		note := fmt.Sprintf("… %d more rows not shown: a sheet holds at most %d rows. The CSV and JSON exports hold them all.", cut, maxSheetRows)
		if err := sw.SetRow(cellName(1, lastRow), []any{excelize.Cell{StyleID: b.title, Value: note}}); err != nil {
			return err
		}
	}
	fRows, fCols := t.rows, len(t.cols)
	if t.filterRows > 0 {
		fRows = t.filterRows
	}
	if t.filterCols > 0 {
		fCols = t.filterCols
	}
	if fRows > 0 && (t.rows > 0) {
		if err := b.f.AutoFilter(t.sheet, cellName(1, headRow)+":"+cellName(fCols, headRow+fRows), nil); err != nil {
			return err
		}
	}
	// Printing: landscape, with the header rows (and the key columns kept in
	// view) repeated on every page.
	layout := &excelize.PageLayoutOptions{Orientation: ptr("landscape")}
	if t.fitWidth {
		layout.FitToWidth, layout.FitToHeight = ptr(1), ptr(0)
	}
	if err := b.f.SetPageLayout(t.sheet, layout); err != nil {
		return err
	}
	titles := fmt.Sprintf("%s!$1:$%d", sheetRef(t.sheet), headRow)
	if t.freezeCols > 0 {
		lastKey, _ := excelize.ColumnNumberToName(t.freezeCols)
		titles = fmt.Sprintf("%s!$A:$%s,%s", sheetRef(t.sheet), lastKey, titles)
	}
	if err := b.f.SetDefinedName(&excelize.DefinedName{Name: "_xlnm.Print_Titles", RefersTo: titles, Scope: t.sheet}); err != nil {
		return err
	}
	if t.extras != nil {
		if err := t.extras(sw, lastRow); err != nil {
			return err
		}
	}
	return sw.Flush()
}

func cellName(col, row int) string {
	s, err := excelize.CoordinatesToCellName(col, row)
	if err != nil {
		panic(err) // programmer error: coordinates are computed here
	}
	return s
}

func ptr[T any](v T) *T { return &v }

// headerWidth is the width a header asks of its column when it may wrap: its
// longest word, or all of it when short.
func headerWidth(h string) float64 {
	const short = 12
	longest := 0
	for _, w := range strings.Fields(h) {
		longest = max(longest, textWidth(w))
	}
	return 1.1 * float64(max(longest, min(textWidth(h), short))) // bold
}

// headerLines estimates how many lines a wrapped header takes in a column of
// the given width, for the header row's height.
func headerLines(h string, width float64) int {
	lines, cur := 1, 0.0
	for _, w := range strings.Fields(h) {
		ww := 1.1 * float64(textWidth(w))
		switch {
		case cur == 0:
			cur = ww
		case cur+1+ww <= width-1:
			cur += 1 + ww
		default:
			lines++
			cur = ww
		}
	}
	return min(lines, 5)
}

// freeze keeps the first rows and cols in view.
func freeze(sw *excelize.StreamWriter, rows, cols int) error {
	top, _ := excelize.CoordinatesToCellName(cols+1, rows+1)
	active := "bottomLeft"
	if cols > 0 {
		active = "bottomRight"
	}
	return sw.SetPanes(&excelize.Panes{
		Freeze: true, XSplit: cols, YSplit: rows, TopLeftCell: top, ActivePane: active,
		Selection: []excelize.Selection{{SQRef: top, ActiveCell: top, Pane: active}},
	})
}

// fitWidth turns a measured width in characters into a column width, with a
// little padding and bounds that keep long free text (sources) from making a
// column wider than a screen.
func fitWidth(chars float64) float64 { return math.Min(math.Max(chars+2, 6), 60) }

// textWidth counts characters; wide (East Asian) characters count twice,
// roughly as a spreadsheet shows them.
func textWidth(s string) int {
	n := 0
	for _, r := range s {
		if r >= 0x1100 && (r <= 0x115F || (r >= 0x2E80 && r <= 0xA4CF) || (r >= 0xAC00 && r <= 0xD7A3) || (r >= 0xF900 && r <= 0xFAFF) || (r >= 0xFF00 && r <= 0xFF60)) {
			n += 2
			continue
		}
		n++
	}
	return n
}

// cellWidth estimates how many characters a value takes under its number
// format.
func cellWidth(v any, numFmt string) int {
	switch x := v.(type) {
	case nil:
		return 0
	case excelize.Cell:
		return cellWidth(x.Value, numFmt)
	case string:
		return textWidth(x)
	case int:
		return len(strconv.Itoa(x))
	case int64:
		return len(strconv.FormatInt(x, 10))
	case float64:
		neg := 0
		if x < 0 {
			neg = 1
		}
		switch numFmt {
		case fmtPower:
			return 9 + neg
		case fmtProb:
			return len(strconv.FormatFloat(x, 'f', 3, 64))
		case fmtKelvin:
			return len(strconv.FormatFloat(x, 'f', 1, 64))
		case fmtShare:
			return len(strconv.FormatFloat(x*100, 'f', 1, 64)) + 1
		case fmtWhole:
			d := len(strconv.FormatFloat(math.Abs(x), 'f', 0, 64))
			return d + (d-1)/3 + neg
		case "0":
			return len(strconv.FormatFloat(x, 'f', 0, 64))
		}
		return min(len(strconv.FormatFloat(x, 'g', -1, 64)), 11)
	}
	return len(fmt.Sprint(v))
}

// fv is a numeric cell: NaN and ±Inf become an empty cell.
func fv(x float64) any {
	if !isFinite(x) {
		return nil
	}
	return x
}

// tv is a text cell: neutralised, empty text becomes an empty cell.
func tv(s string) any {
	if s == "" {
		return nil
	}
	return SafeText(s)
}

// sheetRef quotes a sheet name for a formula or chart reference.
func sheetRef(sheet string) string { return "'" + strings.ReplaceAll(sheet, "'", "''") + "'" }

// Ranking sheet column positions used by the data bars and the chart.
const (
	rankingNameCol     = 3 // C
	rankingScoreP05Col = 7 // G
	rankingScoreP50Col = 8 // H
	rankingScoreP95Col = 9 // I
)

// rankingCols is the number of columns of the Ranking sheet; the chart
// stands beside them.
const rankingCols = 25

func rankingColumns(r *rank.Result) []column {
	return []column{
		{"Rank (median)", fmtRank},
		{"Rank interval (5–95 %)", fmtCentred},
		{"Name", ""},
		{"Planet", ""},
		{"Star", ""},
		{"Score: median (5–95 % range)", ""},
		{"Score p05", fmtProb},
		{"Score p50", fmtProb},
		{"Score p95", fmtProb},
		{fmt.Sprintf("P(rank ≤ %d)", r.TopK), fmtProb},
		{"Ocean probability", fmtProb},
		{"Heat flux: median (5–95 % range)", ""},
		{"Heat flux p05 [W/m²]", fmtPower},
		{"Heat flux p50 [W/m²]", fmtPower},
		{"Heat flux p95 [W/m²]", fmtPower},
		{"Ice shell: median (5–95 % range)", ""},
		{"Ice shell p05 [m]", fmtWhole},
		{"Ice shell p50 [m]", fmtWhole},
		{"Ice shell p95 [m]", fmtWhole},
		{"Volatiles retained (P ≥ 0.5)", ""},
		{"Main driver (what to measure next)", ""},
		{"Main driver share of score variance", fmtShare},
		{"Assumed inputs mark", ""},
		{"Assumed inputs", ""},
		{"Notes", ""},
	}
}

func (b *book) ranking(r *rank.Result) error {
	cols := rankingColumns(r)
	if len(cols) != rankingCols {
		panic("export: rankingCols out of date")
	}
	maxScore := 1.0
	for i := range r.Targets {
		if s := r.Targets[i].Score.P50; isFinite(s) && s > maxScore {
			maxScore = s
		}
	}
	return b.stream(table{
		sheet:      SheetRanking,
		cols:       cols,
		rows:       len(r.Targets),
		freezeCols: rankingNameCol,
		row: func(i int, row []any) []any {
			t := &r.Targets[i]
			mark, driver, share := "", "", math.NaN()
			if len(t.AssumedInputs) > 0 {
				mark = assumedMark
			}
			if d, ok := mainDriver(t); ok {
				driver, share = d.Input, d.Share
			}
			hf, ice := t.Metrics.HeatFlux, t.Metrics.IceShellThickness
			return append(row,
				fv(t.Rank), tv(formatRankInterval(t)), tv(t.Name), tv(t.Planet), tv(t.Star),
				tv(FormatRange(t.Score, "")), fv(t.Score.P05), fv(t.Score.P50), fv(t.Score.P95),
				fv(t.PTop.P), fv(t.Metrics.OceanProbability),
				tv(FormatRange(hf, "W/m2")), fv(hf.P05), fv(hf.P50), fv(hf.P95),
				tv(FormatRange(ice, "m")), fv(ice.P05), fv(ice.P50), fv(ice.P95),
				tv(retainedList(t)), tv(driver), fv(share), tv(mark), tv(strings.Join(t.AssumedInputs, ", ")),
				tv(strings.Join(t.Notes, "; ")))
		},
		extras: func(sw *excelize.StreamWriter, lastRow int) error {
			if len(r.Targets) == 0 {
				return nil
			}
			p50, _ := excelize.ColumnNumberToName(rankingScoreP50Col)
			if err := b.f.SetConditionalFormat(SheetRanking, fmt.Sprintf("%s2:%s%d", p50, p50, lastRow), []excelize.ConditionalFormatOptions{{
				Type: "data_bar", Criteria: "=",
				MinType: "num", MinValue: "0",
				MaxType: "num", MaxValue: strconv.FormatFloat(maxScore, 'g', -1, 64),
				BarColor: "#5B8DC9", BarSolid: true,
			}}); err != nil {
				return fmt.Errorf("data bars: %w", err)
			}
			return b.scoreChart(r, len(cols))
		},
	})
}

// scoreChart draws the best targets' score medians with their 5–95 % ranges as
// a high-low-close chart (the library has no error bars): series high = p95,
// low = p05, close = median, in that order.
func (b *book) scoreChart(r *rank.Result, ncols int) error {
	n := min(len(r.Targets), ChartTargets)
	col := func(c int) string { s, _ := excelize.ColumnNumberToName(c); return s }
	ref := func(c int) string {
		return fmt.Sprintf("%s!$%s$2:$%s$%d", sheetRef(SheetRanking), col(c), col(c), n+1)
	}
	name := func(c int) string { return fmt.Sprintf("%s!$%s$1", sheetRef(SheetRanking), col(c)) }
	what := fmt.Sprintf("top %d of %d targets by median rank", n, len(r.Targets))
	if n == len(r.Targets) {
		what = fmt.Sprintf("all %d targets", n)
	}
	none := excelize.ChartMarker{Symbol: "none"}
	cats := ref(rankingNameCol)
	at, _ := excelize.CoordinatesToCellName(ncols+2, 2)
	return b.f.AddChart(SheetRanking, at, &excelize.Chart{
		Type: excelize.StockHighLowClose,
		Series: []excelize.ChartSeries{
			{Name: name(rankingScoreP95Col), Categories: cats, Values: ref(rankingScoreP95Col), Marker: none},
			{Name: name(rankingScoreP05Col), Categories: cats, Values: ref(rankingScoreP05Col), Marker: none},
			{Name: name(rankingScoreP50Col), Categories: cats, Values: ref(rankingScoreP50Col), Marker: excelize.ChartMarker{Symbol: "dash", Size: 9}},
		},
		Title: excelize.ChartTitle{Paragraph: []excelize.RichTextRun{{
			Text: "Score median with its 5–95 % range (vertical line), " + what,
		}}},
		Legend:    excelize.ChartLegend{Position: "bottom"},
		Dimension: excelize.ChartDimension{Width: 960, Height: 480},
		Format:    excelize.GraphicOptions{AltText: "Score median and 5–95 % range per target, " + what},
		XAxis:     excelize.ChartAxis{Font: excelize.Font{Size: 8}},
		YAxis:     excelize.ChartAxis{MajorGridLines: true, Title: excelize.ChartTitle{Paragraph: []excelize.RichTextRun{{Text: "Score"}}}},
	})
}

func (b *book) derived(r *rank.Result) error {
	cols := []column{{"Rank (median)", fmtRank}, {"Name", ""}, {"Planet", ""}}
	for _, m := range metrics {
		for _, p := range []string{"p05", "p50", "p95"} {
			cols = append(cols, column{fmt.Sprintf("%s %s [%s]", m.label, p, m.header), m.numFmt})
		}
	}
	cols = append(cols,
		column{"Ocean probability", fmtProb},
		column{"Ocean probability MC s.e.", fmtProb},
		column{"Score p50 MC s.e.", fmtProb})
	vols := volatiles(r)
	for _, v := range vols {
		cols = append(cols, column{"P(" + v + " retained)", fmtProb})
	}
	cols = append(cols, column{"Model validity flags (share of samples)", ""})
	return b.stream(table{
		sheet: SheetDerived, cols: cols, rows: len(r.Targets), freezeCols: 2,
		row: func(i int, row []any) []any {
			t := &r.Targets[i]
			row = append(row, fv(t.Rank), tv(t.Name), tv(t.Planet))
			for _, m := range metrics {
				q := m.get(&t.Metrics)
				row = append(row, fv(q.P05), fv(q.P50), fv(q.P95))
			}
			row = append(row, fv(t.Metrics.OceanProbability), fv(t.Metrics.OceanProbabilitySE), fv(t.ScoreMedianSE))
			for _, v := range vols {
				if p, ok := t.Metrics.Retention[v]; ok {
					row = append(row, fv(p))
				} else {
					row = append(row, nil)
				}
			}
			return append(row, tv(flagText(t.Flags)))
		},
	})
}

func (b *book) inputs(r *rank.Result) error {
	cols := []column{
		{"Name", ""}, {"Planet", ""}, {"Key", ""}, {"Description", ""},
		{"Value", ""}, {"Unit", ""}, {"Uncertainty", ""}, {"Uncertainty kind", ""},
		{"Low (−1σ or bound)", ""}, {"High (+1σ or bound)", ""},
		{"Status", ""}, {"Prior (assumed inputs)", ""}, {"Source", ""}, {"Revision", "0"},
	}
	type ref struct{ t, p int32 }
	var refs []ref
	for i := range r.Targets {
		for j := range r.Targets[i].Inputs {
			refs = append(refs, ref{int32(i), int32(j)})
		}
	}
	return b.stream(table{
		sheet: SheetInputs, cols: cols, rows: len(refs), freezeCols: 3, fitWidth: true,
		row: func(i int, row []any) []any {
			t := &r.Targets[refs[i].t]
			p := &t.Inputs[refs[i].p]
			info, _ := schema.LookupKey(p.Key)
			lo, hi := uncBounds(p)
			var rev any
			if p.Revision != 0 {
				rev = p.Revision
			}
			prior := ""
			if p.Status == schema.StatusAssumed {
				prior = t.Priors[p.Key]
			}
			return append(row, tv(t.Name), tv(t.Planet), tv(p.Key), tv(info.Description),
				fv(p.Value), tv(info.Unit), tv(uncText(p.Unc)), tv(p.Unc.Kind.String()),
				fv(lo), fv(hi), tv(string(p.Status)), tv(prior), tv(p.Source), rev)
		},
	})
}

// flagText lists the model's validity flags with the share of samples that
// raised each, e.g. "high_eccentricity 12%; no_ice 100%".
func flagText(flags map[string]float64) string {
	keys := make([]string, 0, len(flags))
	for k := range flags {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	parts := make([]string, 0, len(keys))
	for _, k := range keys {
		parts = append(parts, k+" "+formatShare(flags[k]))
	}
	return strings.Join(parts, "; ")
}

// uncText renders an uncertainty compactly in the value's unit.
func uncText(u schema.Uncertainty) string {
	g := func(x float64) string { return strconv.FormatFloat(x, 'g', 4, 64) }
	switch u.Kind {
	case schema.UncSymmetric:
		return "± " + g(u.Sigma)
	case schema.UncAsymmetric:
		return "+" + g(u.Plus) + " / −" + g(u.Minus)
	case schema.UncRange:
		return "[" + g(u.Min) + ", " + g(u.Max) + "]"
	case schema.UncFactor:
		return "×/÷ " + g(u.Factor)
	}
	return "none given"
}

// uncBounds gives an uncertainty as numbers a reviewer can sort: the 1σ
// interval for σ forms, the bounds of a range, value ÷ and × the factor.
func uncBounds(p *schema.Param) (lo, hi float64) {
	u, v := p.Unc, p.Value
	switch u.Kind {
	case schema.UncSymmetric:
		return v - u.Sigma, v + u.Sigma
	case schema.UncAsymmetric:
		return v - u.Minus, v + u.Plus
	case schema.UncRange:
		return u.Min, u.Max
	case schema.UncFactor:
		return v / u.Factor, v * u.Factor
	}
	return math.NaN(), math.NaN()
}

func (b *book) drivers(r *rank.Result) error {
	seen := map[string]bool{}
	for i := range r.Targets {
		for _, d := range r.Targets[i].Drivers {
			seen[d.Input] = true
		}
	}
	keys := orderKeys(seen)
	cols := []column{{"Rank (median)", fmtRank}, {"Name", ""}, {"Planet", ""}, {"Main driver (what to measure next)", ""}}
	for _, k := range keys {
		cols = append(cols, column{"Share: " + k, fmtShare})
	}
	cols = append(cols, column{"Sum of first-order shares", fmtShare})
	index := make(map[string]int, len(keys))
	for j, k := range keys {
		index[k] = j
	}
	shares := make([]float64, len(keys))
	return b.stream(table{
		sheet: SheetDrivers, cols: cols, rows: len(r.Targets), freezeCols: 2,
		row: func(i int, row []any) []any {
			t := &r.Targets[i]
			for j := range shares {
				shares[j] = math.NaN()
			}
			sum := 0.0
			for _, d := range t.Drivers {
				shares[index[d.Input]] = d.Share
				if isFinite(d.Share) {
					sum += d.Share
				}
			}
			driver := ""
			if d, ok := mainDriver(t); ok {
				driver = d.Input
			}
			row = append(row, fv(t.Rank), tv(t.Name), tv(t.Planet), tv(driver))
			for _, s := range shares {
				row = append(row, fv(s))
			}
			if len(t.Drivers) == 0 {
				return append(row, nil)
			}
			return append(row, sum)
		},
	})
}

// orderKeys orders input keys as schema.Keys does, unknown ones (profile-only
// quantities such as a rock density prior) after them alphabetically.
func orderKeys(seen map[string]bool) []string {
	m := make(map[string]schema.Param, len(seen))
	for k := range seen {
		m[k] = schema.Param{}
	}
	return schema.SortedKeys(m)
}

func (b *book) changes(c *Changes, since int64) error {
	// Two blocks share the sheet: rank moves (under the autofilter), then the
	// input changes with their own title and header rows.
	cols := []column{
		{"Name", ""}, {"Planet", ""}, {"Rank before", ""}, {"Rank after", ""},
		{"Rank change (+ = up)", ""}, {"Score p50 before", ""}, {"Score p50 after", ""},
		{"Score before: median (5–95 %)", ""}, {"Score after: median (5–95 %)", ""},
		{"", ""}, {"", ""}, {"", ""},
	}
	inHead := []string{"Moon", "Planet", "Star", "Key", "Change", "Old value", "Old uncertainty", "New value", "New uncertainty", "Unit", "Revision", "Source"}
	nMoves, nIn := len(c.RankMoves), len(c.InputChanges)
	num := func(x float64, nf string) any {
		if !isFinite(x) {
			return nil
		}
		return excelize.Cell{StyleID: b.numFmt[nf], Value: x}
	}
	rankCell := func(x float64) any {
		if x == 0 {
			return nil
		}
		return num(x, fmtRank)
	}
	return b.stream(table{
		sheet:      SheetChanges,
		fitWidth:   true,
		title:      fmt.Sprintf("How each target's rank and score moved since catalog revision %d", since),
		cols:       cols,
		rows:       nMoves + 3 + nIn, // moves, blank, title, header, inputs
		filterRows: nMoves,
		filterCols: 9,
		row: func(i int, row []any) []any {
			switch {
			case i < nMoves:
				m := &c.RankMoves[i]
				var move any
				switch {
				case m.RankBefore == 0 && m.RankAfter != 0:
					move = "new"
				case m.RankAfter == 0 && m.RankBefore != 0:
					move = "gone"
				case m.RankBefore != 0:
					move = num(m.RankBefore-m.RankAfter, fmtRank)
				}
				var sb, sa, tb, ta any
				if m.RankBefore != 0 {
					sb, tb = num(m.ScoreBefore.P50, fmtProb), tv(FormatRange(m.ScoreBefore, ""))
				}
				if m.RankAfter != 0 {
					sa, ta = num(m.ScoreAfter.P50, fmtProb), tv(FormatRange(m.ScoreAfter, ""))
				}
				return append(row, tv(m.Name), tv(m.Planet), rankCell(m.RankBefore), rankCell(m.RankAfter), move, sb, sa, tb, ta)
			case i == nMoves:
				return row
			case i == nMoves+1:
				return append(row, excelize.Cell{StyleID: b.title, Value: fmt.Sprintf("Input values added, changed or removed since catalog revision %d", since)})
			case i == nMoves+2:
				for _, h := range inHead {
					row = append(row, excelize.Cell{StyleID: b.header, Value: h})
				}
				return row
			}
			ch := &c.InputChanges[i-nMoves-3]
			kind := "changed"
			switch {
			case ch.Old == nil:
				kind = "added"
			case ch.New == nil:
				kind = "removed"
			}
			val := func(p *schema.Param) (any, any) {
				if p == nil {
					return nil, nil
				}
				return fv(p.Value), tv(uncText(p.Unc))
			}
			ov, ou := val(ch.Old)
			nv, nu := val(ch.New)
			src := ""
			if ch.New != nil {
				src = ch.New.Source
			} else if ch.Old != nil {
				src = ch.Old.Source
			}
			var rev any
			if ch.Revision != 0 {
				rev = ch.Revision
			}
			info, _ := schema.LookupKey(ch.Key)
			return append(row, tv(ch.Moon), tv(ch.Planet), tv(ch.Star), tv(ch.Key), kind, ov, ou, nv, nu, tv(info.Unit), rev, tv(src))
		},
	})
}

// Simplifications states what the models leave out; the Method sheet lists
// it beside the method text so a reader never has to infer it.
var Simplifications = []string{
	"Interiors are uncompressed: no self-compression of ice or rock layers.",
	"Heat leaves the ice shell by conduction only (k = 651/T); convection is not modelled.",
	"Radiogenic heating is present-day chondritic heating of the rock fraction; no past or transient heating.",
	"Tidal heating assumes a synchronously rotating moon with a constant k2/Q (eccentricity and obliquity tides).",
	"Surface temperature without a measurement comes from a global energy balance with the planet's stellar distance.",
	"Volatile retention follows the rule of thumb that escape velocity must exceed about six times the mean thermal speed.",
	"Scores are profile-defined transfers of the derived quantities to [0, 1]; the ranking is only as good as the profile's choices.",
}

// readingGuide tells a reader who never ran tidesift where to look.
func readingGuide(r *rank.Result) []string {
	chartAt, _ := excelize.ColumnNumberToName(rankingCols + 2)
	return []string{
		"Ranking: one row per target, best first; every range is given as text (median with its 5–95 % range) and as numeric p05/p50/p95 columns for sorting and filtering.",
		fmt.Sprintf("Ranking, from column %s: a chart of the score median (tick) and its 5–95 %% range (vertical line) for the best %d targets by median rank.", chartAt, min(ChartTargets, len(r.Targets))),
		fmt.Sprintf("P(rank ≤ %d) is the fraction of Monte Carlo samples in which the target ranks among the best %d.", r.TopK, r.TopK),
		"Main driver: the input whose uncertainty accounts for the largest first-order share of the score's variance, i.e. the measurement that would sharpen the ranking most.",
		"Derived: every derived quantity in SI units; Inputs: every input with its uncertainty, status (measured, or assumed from a prior), source and catalog revision; Drivers: each input's share of the score variance.",
		"Numbers are in SI units as the column headers state; an empty numeric cell means the quantity could not be computed.",
	}
}

// cautionLines are the cautions at the top of the Method sheet.
var cautionLines = []string{
	Caution,
	"The scores are a triage aid built on simplified models; they support, and never replace, expert review.",
	"Every range is the 5th to 95th percentile over the Monte Carlo samples, not a confidence interval of a physical model.",
	"Inputs marked assumed were filled in from the scoring profile's priors at ranking time; they were never measured.",
}

// Method sheet layout: section titles and labels in column A, text and
// values in column B, which wraps.
const (
	methodLabelWidth = 34
	methodTextWidth  = 100
)

// ownText is text of tidesift's own making, written to a cell as it is.
type ownText string

func (b *book) method(r *rank.Result, info WorkbookInfo) error {
	const sheet = SheetMethod
	f := b.f
	row := 0
	var err error
	// put writes one row: a label (column A, in style labelStyle) and a value
	// (column B, in style valueStyle; long text wraps and the row grows).
	put := func(label string, labelStyle int, value any, valueStyle int) {
		row++
		if err != nil {
			return
		}
		a, bc := cellName(1, row), cellName(2, row)
		if label != "" {
			if err = f.SetCellStr(sheet, a, SafeText(label)); err == nil && labelStyle != 0 {
				err = f.SetCellStyle(sheet, a, a, labelStyle)
			}
		}
		if err != nil {
			return
		}
		switch x := value.(type) {
		case ownText:
			// tidesift's own text (the method, written by rank/method):
			// a string cell is never evaluated, and none of it comes from
			// a file, so it needs no apostrophe (which would show before
			// every "- " list item).
			if x == "" {
				return
			}
			if err = f.SetCellStr(sheet, bc, strings.ToValidUTF8(string(x), "\uFFFD")); err != nil {
				return
			}
		case string:
			if x == "" {
				return
			}
			if err = f.SetCellStr(sheet, bc, SafeText(x)); err != nil {
				return
			}
			if lines := wrappedLines(x, methodTextWidth); lines > 1 && valueStyle == b.wrap {
				err = f.SetRowHeight(sheet, row, 15*float64(lines))
			}
		case int:
			err = f.SetCellInt(sheet, bc, int64(x))
		case int64:
			err = f.SetCellInt(sheet, bc, x)
		case nil:
			return
		}
		if err == nil && valueStyle != 0 {
			err = f.SetCellStyle(sheet, bc, bc, valueStyle)
		}
	}
	section := func(title string, lines []string, style int) {
		for i, l := range lines {
			if i == 0 {
				put(title, b.header, l, style)
				continue
			}
			put("", 0, l, style)
		}
		if len(lines) == 0 {
			put(title, b.header, nil, 0)
		}
		put("", 0, nil, 0)
	}
	put("tidesift review workbook: method, provenance and cautions", b.title, nil, 0)
	put("", 0, nil, 0)
	section("Cautions", cautionLines, b.wrap)
	put("Run", b.header, nil, 0)
	kv := func(label string, v any) { put(label, 0, v, b.left) }
	kv("Scoring profile", r.Profile)
	kv("Seed", strconv.FormatUint(r.Seed, 10)) // text: a uint64 does not fit a spreadsheet number
	kv("Monte Carlo samples", r.Samples)
	kv("Top k of P(rank ≤ k)", r.TopK)
	kv("Targets ranked", len(r.Targets))
	kv("Catalog revision", r.CatalogRevision)
	if !r.Revision.Time.IsZero() {
		kv("Catalog revision time (UTC)", r.Revision.Time.UTC().Format(time.RFC3339))
	}
	if r.Revision.File != "" {
		kv("Catalog revision file", r.Revision.File)
	}
	if r.Revision.Note != "" {
		kv("Catalog revision note", r.Revision.Note)
	}
	kv("Catalog content hash (SHA-256)", r.CatalogHash)
	kv("Ranking document format version", r.FormatVersion)
	if info.Changes != nil {
		kv("Changes sheet compares with revision", info.Since)
	}
	kv("tidesift version", info.Version)
	kv("Workbook created (UTC)", info.Created.UTC().Format(time.RFC3339))
	goarch := r.GOARCH
	if goarch == "" {
		goarch = runtime.GOARCH
	}
	kv("GOARCH of the ranking", goarch)
	put("", 0, nil, 0)
	section("Reading the workbook", readingGuide(r), b.wrap)
	if len(r.Excluded) > 0 {
		section("Not ranked (missing inputs)", excludedLines(r.Excluded), b.wrap)
	}
	if len(r.Warnings) > 0 {
		section("Warnings of the ranking", r.Warnings, b.wrap)
	}
	section("Simplifications", Simplifications, b.wrap)
	// The method text is plain text laid out for a fixed-width font, with
	// headings underlined by a row of '-' or '=': keep the font, make the
	// headings bold and drop their underlines.
	put("Method", b.header, nil, 0)
	lines := splitLines(info.Method)
	for i := 0; i < len(lines); i++ {
		if i+1 < len(lines) && isUnderline(lines[i+1], lines[i]) {
			put("", 0, ownText(lines[i]), b.bold)
			i++
			continue
		}
		put("", 0, ownText(lines[i]), b.mono)
	}
	put("", 0, nil, 0)
	section("Scoring profile (TOML, in full)", splitLines(r.ProfileTOML), b.mono)
	if err != nil {
		return err
	}
	if err := f.SetColWidth(sheet, "A", "A", methodLabelWidth); err != nil {
		return err
	}
	if err := f.SetColWidth(sheet, "B", "B", methodTextWidth); err != nil {
		return err
	}
	fit := true
	if err := f.SetSheetProps(sheet, &excelize.SheetPropsOptions{FitToPage: &fit}); err != nil {
		return err
	}
	return f.SetPageLayout(sheet, &excelize.PageLayoutOptions{Orientation: ptr("landscape"), FitToWidth: ptr(1), FitToHeight: ptr(0)})
}

// isUnderline reports whether line underlines heading: a run of '-' or '='
// at least half the heading's length.
func isUnderline(line, heading string) bool {
	t := strings.TrimSpace(line)
	if len(t) < 3 || strings.TrimSpace(heading) == "" || 2*len(t) < len(strings.TrimSpace(heading)) {
		return false
	}
	return strings.Trim(t, "-") == "" || strings.Trim(t, "=") == ""
}

// excludedLines describes the moons the ranking left out.
func excludedLines(ex []rank.Excluded) []string {
	out := make([]string, len(ex))
	for i, e := range ex {
		out[i] = excludedText(e)
	}
	return out
}

func excludedText(e rank.Excluded) string {
	s := e.Name
	if e.Planet != "" {
		s += " (" + e.Planet + ")"
	}
	if len(e.Missing) > 0 {
		s += ": missing " + strings.Join(e.Missing, ", ")
	}
	return s
}

// wrappedLines estimates the lines text takes when wrapped in a column of
// width characters. A column width counts digit widths; running text in a
// proportional font fits about a tenth more characters.
func wrappedLines(s string, width int) int {
	capacity := width * 11 / 10
	lines, cur := 1, 0
	for _, w := range strings.Fields(s) {
		n := textWidth(w)
		switch {
		case cur == 0:
			cur = n
		case cur+1+n <= capacity-2:
			cur += 1 + n
		default:
			lines++
			cur = n
		}
	}
	return lines
}

// splitLines splits text into lines, dropping one trailing empty line.
func splitLines(s string) []string {
	s = strings.ReplaceAll(s, "\r\n", "\n")
	s = strings.TrimSuffix(s, "\n")
	if s == "" {
		return nil
	}
	return strings.Split(s, "\n")
}

func (b *book) props(r *rank.Result, info WorkbookInfo) error {
	created := info.Created.UTC().Format(time.RFC3339)
	run := fmt.Sprintf("catalog revision %d, profile %s, seed %d, %d samples", r.CatalogRevision, r.Profile, r.Seed, r.Samples)
	return b.f.SetDocProps(&excelize.DocProperties{
		Title:       fmt.Sprintf("tidesift ranking: profile %s, catalog revision %d", r.Profile, r.CatalogRevision),
		Subject:     "Candidate moons ranked for habitability science, with Monte Carlo uncertainty ranges",
		Keywords:    fmt.Sprintf("tidesift; revision %d; seed %d; profile %s; samples %d", r.CatalogRevision, r.Seed, r.Profile, r.Samples),
		Description: run + "; catalog content hash " + r.CatalogHash + ". " + Caution,
		Creator:     "tidesift " + info.Version,
		Category:    "triage aid",
		Created:     created,
		Modified:    created,
		Version:     info.Version,
	})
}
