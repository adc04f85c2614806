package importers

import (
	"errors"
	"fmt"
	"io"
	"math"
	"slices"
	"strconv"
	"strings"
	"unicode"
	"unicode/utf8"

	"golang.org/x/text/unicode/norm"

	"tidesift/importers/csv"
	"tidesift/importers/table"
	"tidesift/schema"
)

// maxColumns bounds the work a hostile header can cause.
const maxColumns = 4096

// bodyVal is the first value a planet or star was given in this file. Only
// what a comparison and a message need is kept: a file of many planets
// holds one of these per planet and key.
type bodyVal struct {
	kidx  uint16 // index in schema.Keys
	kind  schema.UncKind
	row   int32
	value float64
	a, b  float64 // the uncertainty's fields (see packUnc): 32 bytes in all
}

// packUnc keeps the one or two fields an uncertainty of its kind has.
func packUnc(u schema.Uncertainty) (a, b float64) {
	switch u.Kind {
	case schema.UncSymmetric:
		return u.Sigma, 0
	case schema.UncAsymmetric:
		return u.Plus, u.Minus
	case schema.UncRange:
		return u.Min, u.Max
	case schema.UncFactor:
		return u.Factor, 0
	}
	return 0, 0
}

// unc is the inverse of packUnc.
func (v *bodyVal) unc() schema.Uncertainty {
	u := schema.Uncertainty{Kind: v.kind}
	switch v.kind {
	case schema.UncSymmetric:
		u.Sigma = v.a
	case schema.UncAsymmetric:
		u.Plus, u.Minus = v.a, v.b
	case schema.UncRange:
		u.Min, u.Max = v.a, v.b
	case schema.UncFactor:
		u.Factor = v.a
	}
	return u
}

// same reports whether a value and uncertainty equal the stored ones.
func (v *bodyVal) same(value float64, u schema.Uncertainty) bool {
	a, b := packUnc(u)
	return v.value == value && v.kind == u.Kind && v.a == a && v.b == b
}

// bodyState tracks one planet or star across the rows of a file, so that two
// rows cannot give it different values. A file of many planets keeps one per
// planet and star: 64 bytes, plus its values (vals holds exactly the keys
// the first rows gave, not append's spare capacity).
type bodyState struct {
	name    string    // display name, normalised
	star    string    // planets: the star's display name, "" if none given yet
	vals    []bodyVal // the planet's (or star's) keys seen so far
	starRow int32     // planets: the row that gave star
}

// reader holds the state of one Read.
type reader struct {
	p      *plan
	opt    Options
	c      collector
	intern map[string]string
	moons  *keySet // the moons named so far, by planet and name
	bodies map[string]*bodyState
	keybuf []byte
	params []schema.Param
	kinds  []schema.Kind                          // body kind of each of params
	kidx   []int                                  // index in schema.Keys of each of params
	slab   []schema.Param                         // backing store of records' Params
	hosts  []int                                  // positions in params of planet and star keys
	last   [fieldIgnore]struct{ raw, val string } // one-entry intern caches

	// unquote: the file is CSV or TSV, whose text cells may carry the
	// apostrophe tidesift's own CSV output puts before formula-like text
	// (see unneutralise); text cells are read without it.
	unquote bool

	bodybuf    []byte
	lastPlanet *bodyState
	rowErr     []error
	cells      []string
}

func readTable(name string, tr table.Reader, opt Options, res *Result, emit func(*schema.Record) error) error {
	rd := &reader{
		opt:    opt,
		c:      collector{list: ErrorList{File: name}, max: opt.maxErrors()},
		intern: map[string]string{},
		moons:  newKeySet(),
		bodies: map[string]*bodyState{},
		// Only tidesift's own layout is read back: a foreign file's
		// apostrophes, read through a map, are the file's own text.
		unquote: (res.Format == "csv" || res.Format == "tsv") && opt.Map == nil,
	}
	headerRow := 1
	if hr, ok := tr.(interface{ HeaderRow() int }); ok {
		headerRow = hr.HeaderRow()
	}
	cols := tr.Columns()
	if len(cols) > maxColumns {
		rd.c.add(&ParseError{File: name, Row: headerRow, Err: fmt.Errorf("%w: the header has %d columns; tidesift reads at most %d", ErrTableSyntax, len(cols), maxColumns)})
		return rd.c.err()
	}
	res.Columns = make([]string, len(cols))
	for i, c := range cols {
		res.Columns[i] = c.Name
	}
	rd.p = buildPlan(name, cols, opt.Map, headerRow, &rd.c)
	if err := rd.c.err(); err != nil {
		return err
	}
	var rec schema.Record
	for {
		cells, row, err := tr.Next()
		if err == io.EOF {
			break
		}
		if err != nil {
			var rec interface{ Recoverable() bool }
			if !errors.As(err, &rec) || !rec.Recoverable() {
				rd.c.add(&ParseError{File: name, Row: row, Err: fmt.Errorf("%w: %w", ErrTableSyntax, err)})
				return rd.c.err()
			}
			res.Rows++
			pe := &ParseError{File: name, Row: row, Err: err}
			var re *csv.RowError
			if errors.As(err, &re) {
				pe.Err = re.Err
				if re.Column > 0 && re.Column <= len(rd.p.headers) {
					pe.Column = rd.p.headers[re.Column-1]
				}
			}
			rd.reject(row, cells, []error{pe}, res)
			continue
		}
		res.Rows++
		rd.rowErr = rd.rowErr[:0]
		ok := rd.row(cells, row, &rec)
		if !ok {
			rd.reject(row, cells, rd.rowErr, res)
			continue
		}
		if rd.c.list.Len() > 0 && !opt.SkipInvalid {
			continue // the file fails anyway; keep checking, stop handing out records
		}
		if err := emit(&rec); err != nil {
			return err
		}
	}
	if w, ok := tr.(interface{ Warnings() []string }); ok {
		res.Warnings = append(res.Warnings, w.Warnings()...)
	}
	return rd.c.err()
}

// slabFor returns an empty slice with room for n params at the free end of
// the shared slab, so that a row's params are built where they will stay: a
// row costs no allocation or copy of its own. commit keeps them.
func (rd *reader) slabFor(n int) []schema.Param {
	if cap(rd.slab)-len(rd.slab) < n {
		rd.slab = make([]schema.Param, 0, max(4096, n))
	}
	return rd.slab[len(rd.slab) : len(rd.slab) : len(rd.slab)+n]
}

// commit keeps params (built in slabFor's slice) and returns them capped, so
// that a later append can never reach into the next record's.
func (rd *reader) commit(params []schema.Param) []schema.Param {
	i := len(rd.slab)
	rd.slab = rd.slab[:i+len(params)]
	return rd.slab[i : i+len(params) : i+len(params)]
}

// reject records a bad row: as a Reject under SkipInvalid, as errors otherwise.
func (rd *reader) reject(row int, cells []string, errs []error, res *Result) {
	if !rd.opt.SkipInvalid {
		for _, e := range errs {
			rd.c.add(e)
		}
		return
	}
	reasons := make([]string, len(errs))
	for i, e := range errs {
		var pe *ParseError
		if errors.As(e, &pe) {
			// The report has the file and row in columns of their own.
			q := *pe
			q.File, q.Row = "", 0
			reasons[i] = strings.TrimPrefix(q.Error(), ": ")
		} else {
			reasons[i] = e.Error()
		}
	}
	raw := make([]string, len(cells))
	for i, c := range cells {
		raw[i] = strings.Clone(c)
	}
	res.Rejects = append(res.Rejects, Reject{Row: row, Raw: raw, Reason: strings.Join(reasons, "; ")})
}

func (rd *reader) fail(row, col int, key, value string, err error, hint string) {
	pe := &ParseError{File: rd.p.file, Row: row, Key: key, Value: value, Err: err, Hint: hint}
	if col >= 0 {
		pe.Column = rd.p.headers[col]
	}
	rd.rowErr = append(rd.rowErr, pe)
}

// cell returns the trimmed text of column i, or "" when the column is absent.
func cell(cells []string, i int) string {
	if i < 0 || i >= len(cells) {
		return ""
	}
	return strings.TrimSpace(cells[i])
}

// textCell is cell for a text column (a name, a source): in a canonical CSV
// or TSV it also undoes the export side's formula neutralisation.
func (rd *reader) textCell(cells []string, i int) string {
	s := cell(cells, i)
	if rd.unquote {
		s = unneutralise(s)
	}
	return s
}

// isMissing reports the spellings that mean "no value": empty, "--", NaN,
// null and N/A (any case). Inf is not among them: it is an error.
func isMissing(s string) bool {
	switch len(s) {
	case 0:
		return true
	case 2:
		return s == "--"
	case 3:
		return strings.EqualFold(s, "nan") || strings.EqualFold(s, "n/a")
	case 4:
		return strings.EqualFold(s, "null")
	}
	return false
}

var errNumber = fmt.Errorf("%w; expected a decimal number such as 4.8e22 or 0.0094, or an empty cell when unknown", ErrNotNumber)

// number parses a trimmed, non-missing cell. Hexadecimal floats and '_'
// digit separators, which strconv accepts, are refused: tables do not write
// them, and "1_5" is more likely a typo than fifteen.
func number(s string) (float64, error) {
	if v, ok := fastDecimal(s); ok {
		return v, nil
	}
	t := s
	if len(t) > 0 && (t[0] == '+' || t[0] == '-') {
		t = t[1:]
	}
	if len(t) > 1 && t[0] == '0' && (t[1] == 'x' || t[1] == 'X') || strings.IndexByte(s, '_') >= 0 {
		return 0, errNumber // strconv takes hex floats and digit separators (8_100)
	}
	v, err := strconv.ParseFloat(s, 64)
	if err != nil {
		var ne *strconv.NumError
		if errors.As(err, &ne) && ne.Err == strconv.ErrRange && math.IsInf(v, 0) {
			return 0, fmt.Errorf("%w: beyond the range of a 64-bit float", schema.ErrNotFinite)
		}
		return 0, errNumber
	}
	if math.IsInf(v, 0) {
		return 0, fmt.Errorf("%w: infinity is not a measurement; leave the cell empty when unknown", schema.ErrNotFinite)
	}
	return v, nil
}

// row converts one data row into rec. It reports false when the row has a
// problem (recorded in rd.rowErr).
func (rd *reader) row(cells []string, row int, rec *schema.Record) bool {
	p := rd.p
	*rec = schema.Record{File: p.file, Row: row}
	if len(rd.bodies) >= maxTrackedBodies || len(rd.moons.index) >= maxTrackedMoons {
		rd.forgetBodies()
	}

	// Text fields.
	rawName := rd.textCell(cells, p.text[fieldName])
	if rawName == "" {
		rd.fail(row, p.text[fieldName], "name", "", fmt.Errorf("%w: the moon's name is empty", ErrMissingName), "")
	} else {
		rec.Name = normName(rawName)
	}
	planet := rd.textCell(cells, p.text[fieldPlanet])
	if planet == "" {
		planet = p.constName[fieldPlanet]
	} else {
		planet = rd.cached(fieldPlanet, planet, rd.internName)
	}
	if planet == "" {
		rd.fail(row, p.text[fieldPlanet], "planet", "", fmt.Errorf("%w: the planet's name is empty; a moon is known by its name and its planet", ErrMissingName), "")
	}
	rec.Planet = planet
	if s := rd.textCell(cells, p.text[fieldStar]); s != "" {
		rec.Star = rd.cached(fieldStar, s, rd.internName)
	} else {
		rec.Star = p.constName[fieldStar]
	}
	if s := rd.textCell(cells, p.text[fieldSource]); s != "" {
		rec.Source = rd.cached(fieldSource, s, rd.internText)
	} else {
		rec.Source = p.constName[fieldSource]
	}
	// The whole cell, as written, before it is split: the export side
	// neutralises the joined list, not each alias.
	if s := rd.textCell(cells, p.text[fieldAlias]); s != "" {
		for a := range strings.SplitSeq(s, ";") {
			if a = strings.TrimSpace(a); a != "" {
				rec.Aliases = append(rec.Aliases, normName(a))
			}
		}
	}

	// Numeric keys, in key order.
	params, kinds, kidx, hosts := rd.slabFor(len(p.keys)), rd.kinds[:0], rd.kidx[:0], rd.hosts[:0]
	for i := range p.keys {
		kp := &p.keys[i]
		if par, ok := rd.param(kp, cells, row); ok {
			if kp.info.Body != schema.KindMoon {
				hosts = append(hosts, len(params))
			}
			params = append(params, par)
			kinds = append(kinds, kp.info.Body)
			kidx = append(kidx, kp.index)
		}
	}
	rd.params, rd.kinds, rd.kidx, rd.hosts = params, kinds, kidx, hosts

	// Duplicates, then conflicts with earlier rows about the same planet or star.
	if rec.Name != "" && planet != "" {
		rd.body(schema.KindPlanet, planet, true)
		rd.keybuf = appendMoonKey(rd.keybuf[:0], planet, rec.Name)
		if first, added := rd.moons.add(rd.keybuf, row); first < 0 {
			rd.fail(row, -1, "", "", fmt.Errorf("%w: row %d is beyond the duplicate check's reach (2³¹−1 rows); split the file", ErrTableSyntax, row), "")
		} else if !added {
			rd.fail(row, p.text[fieldName], "name", rawName,
				fmt.Errorf("%w: %q of planet %q is also on row %d; give each moon once per file", ErrDuplicateMoon, rec.Name, planet, first), "")
		}
	}
	if planet != "" {
		rd.bodyChecks(rec, row, cells)
	}

	if len(rd.rowErr) > 0 {
		return false
	}
	if len(params) > 0 {
		rec.Params = rd.commit(params)
	}
	rd.commitBodies(rec, row, cells)
	return true
}

// param reads one key from a row. ok is false when the row gives no value
// (or a bad one; the problem is then in rd.rowErr).
func (rd *reader) param(kp *keyPlan, cells []string, row int) (schema.Param, bool) {
	key := kp.info.Key
	vi := kp.col[roleValue]
	vs := cell(cells, vi)
	var comp [nRoles]float64
	var present [nRoles]bool
	bad := false
	for _, r := range kp.comps {
		ci := kp.col[r]
		s := cell(cells, ci)
		if isMissing(s) {
			continue
		}
		v, err := number(s)
		if err != nil {
			rd.fail(row, ci, key, s, err, "")
			bad = true
			continue
		}
		comp[r] = v * kp.factor[r]
		present[r] = true
	}
	if isMissing(vs) {
		if kp.konst != nil && !bad && !anyOf(present[:]) {
			return *kp.konst, true
		}
		for r := roleErr; r < roleSource; r++ {
			if present[r] {
				rd.fail(row, kp.col[r], key, cell(cells, kp.col[r]),
					fmt.Errorf("%w: an uncertainty for %s is given but its value is missing; expected a value in column %q too", ErrUncertaintyForm, key, rd.p.headers[vi]), "")
				break
			}
		}
		return schema.Param{}, false
	}
	v, err := number(vs)
	if err != nil {
		rd.fail(row, vi, key, vs, err, "")
		return schema.Param{}, false
	}
	v *= kp.factor[roleValue]
	if err := kp.info.Check(v); err != nil {
		rd.fail(row, vi, key, vs, err, "")
		bad = true
	}
	par := schema.Param{Key: key, Value: v, Status: schema.StatusMeasured}
	if si := kp.col[roleSource]; si >= 0 {
		if s := rd.textCell(cells, si); s != "" {
			par.Source = rd.internText(s)
		}
	}

	// Uncertainty: exactly one form.
	forms := 0
	u := &par.Unc
	if present[roleErr] {
		forms++
		*u = schema.Uncertainty{Kind: schema.UncSymmetric, Sigma: comp[roleErr]}
		if comp[roleErr] < 0 {
			rd.fail(row, kp.col[roleErr], key, cell(cells, kp.col[roleErr]), fmt.Errorf("%w: expected σ ≥ 0", schema.ErrNegativeUncertainty), "")
			bad = true
		}
	}
	if present[roleErrPlus] || present[roleErrMinus] {
		forms++
		if !present[roleErrPlus] || !present[roleErrMinus] {
			rd.failPair(kp, row, cells, roleErrPlus, roleErrMinus, present)
			bad = true
		}
		*u = schema.Uncertainty{Kind: schema.UncAsymmetric, Plus: comp[roleErrPlus], Minus: comp[roleErrMinus]}
		for _, r := range []role{roleErrPlus, roleErrMinus} {
			if present[r] && comp[r] < 0 {
				rd.fail(row, kp.col[r], key, cell(cells, kp.col[r]), fmt.Errorf("%w: expected a magnitude ≥ 0 (write 0.3, not -0.3, under %s)", schema.ErrNegativeUncertainty, key+roleSuffix[r]), "")
				bad = true
			}
		}
	}
	if present[roleMin] || present[roleMax] {
		forms++
		if !present[roleMin] || !present[roleMax] {
			rd.failPair(kp, row, cells, roleMin, roleMax, present)
			bad = true
		}
		*u = schema.Uncertainty{Kind: schema.UncRange, Min: comp[roleMin], Max: comp[roleMax]}
		if present[roleMin] && present[roleMax] {
			switch {
			case comp[roleMin] > comp[roleMax]:
				rd.fail(row, kp.col[roleMin], key, cell(cells, kp.col[roleMin]),
					fmt.Errorf("%w: %s_min %s > %s_max %s; expected min ≤ max", schema.ErrMinAboveMax, key, cell(cells, kp.col[roleMin]), key, cell(cells, kp.col[roleMax])), "")
				bad = true
			case !bad && (v < comp[roleMin] || v > comp[roleMax]):
				rd.fail(row, vi, key, vs, fmt.Errorf("%w: expected %s within [%s, %s] (its %s_min and %s_max)",
					ErrValueOutsideRange, key, cell(cells, kp.col[roleMin]), cell(cells, kp.col[roleMax]), key, key), "")
				bad = true
			}
		}
	}
	if present[roleFactor] {
		forms++
		*u = schema.Uncertainty{Kind: schema.UncFactor, Factor: comp[roleFactor]}
		if comp[roleFactor] < 1 {
			rd.fail(row, kp.col[roleFactor], key, cell(cells, kp.col[roleFactor]), fmt.Errorf("%w: a ×/÷ factor must be ≥ 1 (2 means \"within a factor of 2\")", schema.ErrOutOfDomain), "")
			bad = true
		}
	}
	if forms > 1 {
		rd.fail(row, vi, key, "", fmt.Errorf("%w: %s has %d uncertainty forms on this row; expected one of %s_err, %s_err_plus with %s_err_minus, %s_min with %s_max, or %s_factor",
			ErrUncertaintyForm, key, forms, key, key, key, key, key, key), "")
		bad = true
	}
	if bad {
		return schema.Param{}, false
	}
	if u.Kind != schema.UncNone {
		if err := u.Validate(); err != nil { // a backstop: the checks above should have caught it
			rd.fail(row, vi, key, vs, err, "")
			return schema.Param{}, false
		}
	}
	return par, true
}

func anyOf(b []bool) bool {
	for _, x := range b {
		if x {
			return true
		}
	}
	return false
}

func (rd *reader) failPair(kp *keyPlan, row int, cells []string, a, b role, present [nRoles]bool) {
	have, lack := a, b
	if !present[a] {
		have, lack = b, a
	}
	key := kp.info.Key
	msg := fmt.Errorf("%w: %s%s is given without %s%s; expected both", ErrUncertaintyForm, key, roleSuffix[have], key, roleSuffix[lack])
	if kp.col[lack] < 0 {
		msg = fmt.Errorf("%w: %s%s is given but the file has no %s%s column; expected both", ErrUncertaintyForm, key, roleSuffix[have], key, roleSuffix[lack])
	}
	rd.fail(row, kp.col[have], key, cell(cells, kp.col[have]), msg, "")
}

// The file-wide checks between rows (a moon given twice, a planet or star
// given different values or stars) remember what they have seen for at
// most these many planets and stars and these many moons; past that they
// start afresh, so that memory stays flat however long the file. Rows of one
// planet usually come together, so the window catches nearly every problem
// with the rows named. The store checks the same rules over the whole
// import (store.ErrDuplicate, store.ErrConflict), so an import never
// accepts what the window missed: it is refused then, naming the problem
// but maybe not the earlier row, and --skip-invalid cannot skip that row.
// One rule is the reader's alone: a planet given two different stars. Past
// the window the store takes the second for another planet of that name.
// (Variables so that tests can make the window tiny.)
var (
	maxTrackedBodies = 1 << 15
	maxTrackedMoons  = 1 << 18
)

// forgetBodies starts the file-wide checks afresh (see maxTrackedBodies).
func (rd *reader) forgetBodies() {
	clear(rd.bodies)
	rd.moons = newKeySet()
	rd.lastPlanet = nil
}

// body returns the state of a planet or star, nil if not seen yet. The last
// planet looked up is cached: rows of one planet usually come together.
func (rd *reader) body(kind schema.Kind, name string, create bool) *bodyState {
	if kind == schema.KindPlanet && rd.lastPlanet != nil && name == rd.lastPlanet.name {
		return rd.lastPlanet
	}
	rd.bodybuf = appendNameKey(append(rd.bodybuf[:0], kind[0], 0), name)
	st := rd.bodies[string(rd.bodybuf)]
	if st == nil && create {
		st = &bodyState{name: name}
		rd.bodies[string(rd.bodybuf)] = st
	}
	if kind == schema.KindPlanet && st != nil {
		rd.lastPlanet = st
	}
	return st
}

// bodyChecks compares this row's planet and star values with earlier rows'.
func (rd *reader) bodyChecks(rec *schema.Record, row int, cells []string) {
	p := rd.p
	pl := rd.body(schema.KindPlanet, rec.Planet, false)
	if pl != nil && rec.Star != "" && pl.star != "" && rec.Star != pl.star && schema.NameKey(rec.Star) != schema.NameKey(pl.star) {
		rd.fail(row, p.text[fieldStar], "star", rec.Star,
			fmt.Errorf("%w: planet %q has star %q here but star %q on row %d; expected one star per planet", ErrPlanetConflict, rec.Planet, rec.Star, pl.star, pl.starRow), "")
	}
	if !p.planetKeys {
		return
	}
	star := rec.Star
	if star == "" && pl != nil {
		star = pl.star
	}
	for _, i := range rd.hosts {
		par := rd.params[i]
		var st *bodyState
		kind := rd.kinds[i]
		switch kind {
		case schema.KindPlanet:
			st = pl
		case schema.KindStar:
			if star == "" {
				rd.fail(row, rd.colOf(par.Key), par.Key, "", fmt.Errorf("%w: %s is a star's value but the row names no star; expected a star column (or [constants] star in a map)", ErrMissingName, par.Key), "")
				continue
			}
			st = rd.body(schema.KindStar, star, false)
		default:
			continue
		}
		if st == nil {
			continue
		}
		old := st.val(rd.kidx[i])
		if old == nil || old.same(par.Value, par.Unc) {
			continue
		}
		who := fmt.Sprintf("planet %q", rec.Planet)
		if kind == schema.KindStar {
			who = fmt.Sprintf("star %q", star)
		}
		ci := rd.colOf(par.Key)
		rd.fail(row, ci, par.Key, cell(cells, ci),
			fmt.Errorf("%w: %s has %s %s here but %s on row %d; expected the same value on every row (or give it once)",
				ErrPlanetConflict, who, par.Key, rd.describe(par.Key, par.Value, par.Unc), rd.describe(par.Key, old.value, old.unc()), old.row), "")
	}
}

// commitBodies remembers this accepted row's planet and star values.
func (rd *reader) commitBodies(rec *schema.Record, row int, cells []string) {
	pl := rd.body(schema.KindPlanet, rec.Planet, true)
	if rec.Star != "" && pl.star == "" {
		pl.star, pl.starRow = rec.Star, int32(min(row, math.MaxInt32))
	}
	if !rd.p.planetKeys {
		return
	}
	star := rec.Star
	if star == "" {
		star = pl.star
	}
	for _, i := range rd.hosts {
		par := rd.params[i]
		st := pl
		switch rd.kinds[i] {
		case schema.KindPlanet:
		case schema.KindStar:
			st = rd.body(schema.KindStar, star, true)
		default:
			continue
		}
		if st.val(rd.kidx[i]) == nil {
			a, b := packUnc(par.Unc)
			if cap(st.vals) == len(st.vals) {
				// Room for this row's other keys of the same kind too, and
				// no more: most bodies get all their values from one row.
				st.vals = slices.Grow(st.vals, rd.countKind(rd.kinds[i]))
			}
			st.vals = append(st.vals, bodyVal{kidx: uint16(rd.kidx[i]), kind: par.Unc.Kind, row: int32(min(row, math.MaxInt32)), value: par.Value, a: a, b: b})
		}
	}
}

// countKind is how many of this row's planet and star values are of kind k.
func (rd *reader) countKind(k schema.Kind) int {
	n := 0
	for _, i := range rd.hosts {
		if rd.kinds[i] == k {
			n++
		}
	}
	return n
}

func (st *bodyState) val(kidx int) *bodyVal {
	for i := range st.vals {
		if int(st.vals[i].kidx) == kidx {
			return &st.vals[i]
		}
	}
	return nil
}

// describe renders a value and its uncertainty in the unit of the file's
// column, e.g. "1.2 ± 0.1 jupiterMass" (in SI for a map constant).
func (rd *reader) describe(key string, v float64, u schema.Uncertainty) string {
	f, unit := 1.0, ""
	for i := range rd.p.keys {
		kp := &rd.p.keys[i]
		if kp.info.Key != key {
			continue
		}
		if kp.col[roleValue] >= 0 && kp.factor[roleValue] != 0 {
			f, unit = kp.factor[roleValue], kp.unit
		} else {
			unit = kp.info.Unit
		}
	}
	g := func(x float64) string { return strconv.FormatFloat(x/f, 'g', 6, 64) }
	s := g(v)
	switch u.Kind {
	case schema.UncSymmetric:
		s += " ± " + g(u.Sigma)
	case schema.UncAsymmetric:
		s += " +" + g(u.Plus) + " −" + g(u.Minus)
	case schema.UncRange:
		s += " [" + g(u.Min) + ", " + g(u.Max) + "]"
	case schema.UncFactor:
		s += " ×/÷ " + strconv.FormatFloat(u.Factor, 'g', 6, 64)
	}
	if unit != "" {
		s += " " + unit
	}
	return s
}

func (rd *reader) colOf(key string) int {
	for i := range rd.p.keys {
		if rd.p.keys[i].info.Key == key {
			return rd.p.keys[i].col[roleValue]
		}
	}
	return -1
}

// cached is intern with a one-entry cache per field: rows of one planet,
// star or source usually come together.
func (rd *reader) cached(f field, s string, intern func(string) string) string {
	c := &rd.last[f]
	if c.val != "" && s == c.raw {
		return c.val
	}
	v := intern(s)
	c.raw, c.val = strings.Clone(s), v // a copy: s may pin a whole line
	return v
}

// internName normalises a planet or star name and shares one copy per spelling.
func (rd *reader) internName(s string) string {
	if v, ok := rd.intern[s]; ok {
		return v
	}
	rd.bound()
	v := normName(s)
	rd.intern[strings.Clone(s)] = v
	return v
}

// internText shares one copy of a repeated text (a source citation).
func (rd *reader) internText(s string) string {
	if v, ok := rd.intern[s]; ok {
		return v
	}
	rd.bound()
	v := strings.Clone(s)
	rd.intern[v] = v
	return v
}

// maxInterned bounds the intern table: a file of a million planets would
// otherwise keep every name twice. Sharing is an economy, not a promise, so
// the table simply starts again.
const maxInterned = 1 << 15

func (rd *reader) bound() {
	if len(rd.intern) >= maxInterned {
		clear(rd.intern)
	}
}

// normName is the stored form of a name: Unicode NFC, trimmed, runs of white
// space collapsed to one space; case and everything else are kept for
// display. The result never shares memory with s (s may pin a whole line).
func normName(s string) string {
	s = strings.TrimSpace(s)
	simple := true
	prevSpace := false
	for i := 0; i < len(s); i++ {
		c := s[i]
		if c >= utf8.RuneSelf || c < ' ' || (c == ' ' && prevSpace) {
			simple = false
			break
		}
		prevSpace = c == ' '
	}
	if simple {
		return strings.Clone(s)
	}
	s = norm.NFC.String(s)
	return strings.Join(strings.FieldsFunc(s, unicode.IsSpace), " ")
}

// appendNameKey appends the natural-key form of s (schema.NameKey: white
// space collapsed, lower case) without allocating for ASCII names.
func appendNameKey(b []byte, s string) []byte {
	space := false
	start := len(b)
	for _, r := range s {
		if unicode.IsSpace(r) {
			space = true
			continue
		}
		if space && len(b) > start {
			b = append(b, ' ')
		}
		space = false
		if r < utf8.RuneSelf {
			if 'A' <= r && r <= 'Z' {
				r += 'a' - 'A'
			}
			b = append(b, byte(r))
		} else {
			b = utf8.AppendRune(b, unicode.ToLower(r))
		}
	}
	return b
}
