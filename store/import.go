package store

import (
	"context"
	"database/sql"
	"encoding/hex"
	"errors"
	"fmt"
	"sort"
	"strings"
	"time"

	"tidesift/schema"
)

// ErrAmbiguous is wrapped by Import and History when a name matches several
// bodies; the message lists the candidates.
var ErrAmbiguous = errors.New("ambiguous name")

// ErrNotFound is wrapped by History, Snapshot and Diff for a moon or revision
// that does not exist.
var ErrNotFound = errors.New("not found")

// Import applies a request in one transaction: all of it or nothing.
//
// Bodies are matched by schema.NameKey: a star by name; a planet by name
// under its star (a record naming no star matches the one planet of that
// name, whatever its star); a moon by name or alias under its planet. Every
// name of the record (its name and its aliases) takes part in matching, and a
// record whose names reach more than one moon is an error listing them. The
// record's names that differ from the moon's are recorded as aliases.
//
// A file with a SHA-256 imported before is a no-op (Duplicate is set). When
// no value, body or alias is new or different, nothing is written and
// Revision is nil. A moon may appear once per request; planet and star
// values repeated on many rows are compared with what the request itself set
// (the last one wins; Changes lists the value once).
func (s *Store) Import(ctx context.Context, req ImportRequest) (*ImportResult, error) {
	if s.readOnly {
		return nil, fmt.Errorf("import %s: %w", req.File, ErrReadOnly)
	}
	sum, err := checkSum(req)
	if err != nil {
		return nil, err
	}
	var res *ImportResult
	err = withRetry(ctx, func() error {
		var err error
		res, err = s.importTx(ctx, req, sum, func(apply func(*schema.Record, int) error) error {
			for i := range req.Records {
				if err := apply(&req.Records[i], i); err != nil {
					return err
				}
			}
			return nil
		})
		return err
	})
	if err != nil {
		return nil, describe(err)
	}
	return res, nil
}

// checkSum validates and normalises a request's SHA-256.
func checkSum(req ImportRequest) (string, error) {
	sum := strings.ToLower(strings.TrimSpace(req.SHA256))
	if sum != "" {
		if b, err := hex.DecodeString(sum); err != nil || len(b) != 32 {
			return "", fmt.Errorf("import %s: SHA-256 %q is not 64 hexadecimal digits", req.File, req.SHA256)
		}
	}
	return sum, nil
}

// importTx runs one import transaction; feed hands every record to apply,
// in order, with its 0-based index.
func (s *Store) importTx(ctx context.Context, req ImportRequest, sum string,
	feed func(apply func(rec *schema.Record, i int) error) error) (res *ImportResult, err error) {
	tx, err := s.db.BeginTx(ctx, nil) // BEGIN IMMEDIATE (see writerParams)
	if err != nil {
		return nil, err
	}
	committed := false
	defer func() {
		if !committed {
			_ = tx.Rollback()
		}
	}()
	if sum != "" {
		rev, err := scanRevision(tx.QueryRowContext(ctx, "SELECT "+revisionColumns+" FROM revision WHERE sha256 = ?", sum))
		switch {
		case err == nil:
			return &ImportResult{Duplicate: &rev}, nil
		case !errors.Is(err, sql.ErrNoRows):
			return nil, err
		}
	}
	now := s.now()
	// Revision times never go backwards (Check reports it when they do): a
	// clock set back makes the new revision share its predecessor's time.
	var last string
	if err := tx.QueryRowContext(ctx, "SELECT time FROM revision ORDER BY id DESC LIMIT 1").Scan(&last); err == nil {
		if t, err := time.Parse(time.RFC3339Nano, last); err == nil && now.Before(t) {
			now = t
		}
	} else if !errors.Is(err, sql.ErrNoRows) {
		return nil, err
	}
	r, err := tx.ExecContext(ctx, "INSERT INTO revision (time, file, sha256, note) VALUES (?, ?, ?, ?)",
		now.Format(time.RFC3339Nano), req.File, sum, req.Note)
	if err != nil {
		return nil, fmt.Errorf("create revision: %w", err)
	}
	revID, err := r.LastInsertId()
	if err != nil {
		return nil, err
	}
	im, err := newImporter(ctx, tx, revID, req.OmitChanges)
	if err != nil {
		return nil, err
	}
	im.omitAdded = req.OmitAdded
	defer im.close()
	if err := feed(func(rec *schema.Record, i int) error {
		if err := im.record(rec); err != nil {
			return fmt.Errorf("%s: %w", recordPlace(req.File, rec, i), err)
		}
		return nil
	}); err != nil {
		return nil, err
	}
	if err := im.flush(); err != nil {
		return nil, err
	}
	res = im.result()
	if res.Added+res.Changed+res.NewBodies+res.NewAliases == 0 {
		res.Changes = nil
		return res, nil // the deferred rollback discards the empty revision
	}
	res.Revision = &schema.Revision{ID: revID, Time: now, File: req.File, SHA256: sum, Note: req.Note,
		Changes: res.Added + res.Changed}
	if _, err := tx.ExecContext(ctx, "UPDATE revision SET changes = ? WHERE id = ?", res.Revision.Changes, revID); err != nil {
		return nil, err
	}
	if req.DryRun {
		return res, nil
	}
	im.close()
	if err := tx.Commit(); err != nil {
		return nil, fmt.Errorf("commit: %w", err)
	}
	committed = true
	return res, nil
}

// recordPlace names a record for an error message: its file and row.
func recordPlace(file string, rec *schema.Record, i int) string {
	if rec.File != "" {
		file = rec.File
	}
	row := rec.Row
	if row == 0 {
		row = i + 1
	}
	if file == "" {
		return fmt.Sprintf("record %d", row)
	}
	return fmt.Sprintf("%s row %d", file, row)
}

// bodyState is what one import knows of a body.
type bodyState struct {
	id     int64
	kind   schema.Kind
	name   string // display name
	parent string // display name of the parent, "" for none
	isNew  bool   // created by this import, and cached since
	// vals holds the current values of a star or planet, loaded on first
	// use and kept up to date (their rows repeat on many records). Moons
	// load theirs per record.
	vals map[string]*curVal
	// moons are the names and aliases (name keys) of the moons this import
	// gave a planet it created: nothing in the database can match under
	// it, so they are looked up here instead.
	moons map[string]moonName
}

// hostCacheLimit bounds how many stars and planets an import keeps cached
// with their values. Past it the cache is dropped and bodies are read back
// from the transaction as they recur, so memory stays flat however many
// planets a file names (rows of one planet usually come together).
var hostCacheLimit = 4096 // a variable so that tests can make it tiny

// hostKey names one value of a star or planet.
type hostKey struct {
	body int64
	key  string
}

// curVal is a current value as this import sees it.
type curVal struct {
	id      int64
	p       schema.Param  // p.Revision is the revision that set it
	prev    *schema.Param // the value this import superseded, nil if none
	prevID  int64
	change  int  // index in result.Changes, -1 if none or omitted
	counted bool // counted as Unchanged, or set by this import (then not counted)
	// prevUnknown: set by this import and read back after the cache was
	// dropped; prev is looked up when needed.
	prevUnknown bool
}

type moonName struct {
	id   int64
	name string
	row  int // the row that named it
}

type childKey struct {
	parent int64 // 0: no parent (a planet without a star)
	key    string
}

const valueInsert = "INSERT INTO value (id, body_id, key, value, unc_kind, sigma, plus, minus, min, max, factor, source, status, set_rev) VALUES "

const bodyInsert = "INSERT INTO body (id, kind, name, name_key, parent_id, created_rev) VALUES "

// Arguments per queued row.
const (
	valueArgs = 14
	bodyArgs  = 6
)

// maxPendingValues is how many value rows may wait for their bodies'
// batch before they are written anyway (an import that creates no bodies).
const maxPendingValues = 64 * batchRows

type importer struct {
	ctx       context.Context // for statements: never cancelled
	outer     context.Context // the caller's
	tx        *sql.Tx
	rev       int64
	omit      bool
	omitAdded bool
	res       ImportResult
	dead      map[int]bool // indexes of Changes undone later in the request

	findBody, findPlanets, matchMoon, insBody, insAlias                 *sql.Stmt
	curVals, insValue, insBatch, supersede, updValue, delValue, restore *sql.Stmt
	supersedeBatch                                                      *sql.Stmt
	pending                                                             []any   // queued value rows, valueArgs arguments each
	superseded                                                          []int64 // queued ids of values to supersede
	bodies                                                              []any   // queued body rows, bodyArgs arguments each
	insBodyBatch                                                        *sql.Stmt
	// Row ids are given here, not by SQLite, so that rows can be queued
	// and written in batches: the transaction holds the write lock, so no
	// one else takes an id meanwhile.
	nextBody, nextValue int64
	stmts               []*sql.Stmt

	stars      map[string]*bodyState
	planets    map[childKey]*bodyState
	anyPlanet  map[string]*bodyState // planets looked up without a star
	planetByID map[int64]*bodyState
	moonsSeen  map[int64]int // moon id → row that set it
	moonVals   map[string]*curVal
	cached     int // stars and planets in the caches

	// What must outlive a dropped cache: host values counted as
	// unchanged, and the Changes index of host values set by this import.
	countedHost map[hostKey]struct{}
	hostChange  map[hostKey]int
	prevValue   *sql.Stmt
}

func newImporter(ctx context.Context, tx *sql.Tx, rev int64, omit bool) (*importer, error) {
	// The statements run without the caller's cancellation: with a
	// cancellable context the driver watches each statement on a goroutine
	// of its own, which cost about a seventh of a large import. record
	// checks the caller's context instead, and the transaction still rolls
	// back when it is cancelled.
	im := &importer{ctx: context.WithoutCancel(ctx), outer: ctx, tx: tx, rev: rev, omit: omit, dead: map[int]bool{},
		stars: map[string]*bodyState{}, planets: map[childKey]*bodyState{}, anyPlanet: map[string]*bodyState{},
		planetByID: map[int64]*bodyState{}, moonsSeen: map[int64]int{}, moonVals: map[string]*curVal{},
		countedHost: map[hostKey]struct{}{}, hostChange: map[hostKey]int{}}
	prep := []struct {
		dst **sql.Stmt
		sql string
	}{
		// ifnull(parent_id, 0) matches the body_natural index expression.
		{&im.findBody, "SELECT id, name FROM body WHERE kind = ? AND ifnull(parent_id, 0) = ? AND name_key = ?"},
		{&im.findPlanets, `SELECT p.id, p.name, ifnull(p.parent_id, 0), ifnull(s.name, '') FROM body p
			LEFT JOIN body s ON s.id = p.parent_id WHERE p.kind = 'planet' AND p.name_key = ? ORDER BY p.id`},
		{&im.matchMoon, `SELECT id, name, created_rev FROM body WHERE kind = 'moon' AND ifnull(parent_id, 0) = ?1 AND name_key = ?2
			UNION SELECT b.id, b.name, b.created_rev FROM alias a JOIN body b ON b.id = a.body_id
			WHERE a.name_key = ?2 AND b.kind = 'moon' AND b.parent_id = ?1`},
		{&im.insBody, bodyInsert + bodyInsertRow},
		{&im.insBodyBatch, bodyInsert + strings.TrimSuffix(strings.Repeat(bodyInsertRow+", ", batchRows), ", ")},
		{&im.insAlias, "INSERT OR IGNORE INTO alias (body_id, name, name_key, rev) VALUES (?, ?, ?, ?)"},
		{&im.curVals, "SELECT id, " + valueColumns + " FROM value WHERE body_id = ? AND superseded_rev IS NULL"},
		{&im.prevValue, "SELECT id, " + valueColumns + " FROM value WHERE body_id = ? AND key = ? AND superseded_rev = ?"},
		{&im.insValue, valueInsert + valueInsertRow},
		{&im.insBatch, valueInsert + strings.TrimSuffix(strings.Repeat(valueInsertRow+", ", batchRows), ", ")},
		{&im.supersede, "UPDATE value SET superseded_rev = ? WHERE id = ?"},
		{&im.supersedeBatch, "UPDATE value SET superseded_rev = ? WHERE id IN (?" + strings.Repeat(", ?", batchRows-1) + ")"},
		{&im.updValue, `UPDATE value SET value = ?, unc_kind = ?, sigma = ?, plus = ?, minus = ?, min = ?, max = ?, factor = ?,
			source = ?, status = ? WHERE id = ?`},
		{&im.delValue, "DELETE FROM value WHERE id = ?"},
		{&im.restore, "UPDATE value SET superseded_rev = NULL WHERE id = ?"},
	}
	for _, p := range prep {
		st, err := tx.PrepareContext(ctx, p.sql)
		if err != nil {
			im.close()
			return nil, fmt.Errorf("prepare: %w", err)
		}
		*p.dst = st
		im.stmts = append(im.stmts, st)
	}
	if err := tx.QueryRowContext(ctx, "SELECT ifnull(max(id), 0) + 1 FROM body").Scan(&im.nextBody); err != nil {
		im.close()
		return nil, err
	}
	if err := tx.QueryRowContext(ctx, "SELECT ifnull(max(id), 0) + 1 FROM value").Scan(&im.nextValue); err != nil {
		im.close()
		return nil, err
	}
	return im, nil
}

func (im *importer) close() {
	for _, st := range im.stmts {
		st.Close()
	}
	im.stmts = nil
}

func (im *importer) result() *ImportResult {
	res := im.res
	if len(im.dead) > 0 {
		kept := res.Changes[:0]
		for i, c := range res.Changes {
			if !im.dead[i] {
				kept = append(kept, c)
			}
		}
		res.Changes = kept
	}
	return &res
}

func (im *importer) record(r *schema.Record) error {
	if err := im.outer.Err(); err != nil {
		return err
	}
	if im.cached > hostCacheLimit {
		// Bodies read back from now on must be in the database.
		if err := im.flushBodies(); err != nil {
			return err
		}
		clear(im.stars)
		clear(im.planets)
		clear(im.anyPlanet)
		clear(im.planetByID)
		im.cached = 0
	}
	if schema.NameKey(r.Name) == "" {
		return errors.New("the moon has no name")
	}
	if schema.NameKey(r.Planet) == "" {
		return fmt.Errorf("moon %q has no planet", r.Name)
	}
	var star *bodyState
	if schema.NameKey(r.Star) != "" {
		var err error
		if star, err = im.star(r.Star); err != nil {
			return err
		}
	}
	planet, err := im.planet(r.Planet, star)
	if err != nil {
		return err
	}
	moon, err := im.moon(r, planet)
	if err != nil {
		return err
	}
	for i, p := range r.Params {
		for _, q := range r.Params[:i] {
			if q.Key == p.Key {
				return fmt.Errorf("%s is given twice", p.Key)
			}
		}
		info, ok := schema.LookupKey(p.Key)
		if !ok {
			return fmt.Errorf("%w %q (want one of the keys of the canonical layout)", schema.ErrUnknownKey, p.Key)
		}
		var b *bodyState
		switch info.Body {
		case schema.KindMoon:
			b = moon
		case schema.KindPlanet:
			b = planet
		case schema.KindStar:
			if star == nil {
				return fmt.Errorf("%s is a value of the star, but the record names no star", p.Key)
			}
			b = star
		}
		if p.Source == "" {
			p.Source = r.Source
		}
		if p.Status == "" {
			p.Status = schema.StatusMeasured
		}
		if p.Status != schema.StatusMeasured && p.Status != schema.StatusAssumed {
			return fmt.Errorf("%s: unknown status %q (want %q or %q)", p.Key, p.Status, schema.StatusMeasured, schema.StatusAssumed)
		}
		p.Unc = normUnc(p.Unc)
		p.Revision = im.rev
		if err := schema.CheckParam(p); err != nil {
			return err
		}
		if err := im.set(b, p); err != nil {
			return fmt.Errorf("%s: %w", p.Key, err)
		}
	}
	return nil
}

func (im *importer) star(name string) (*bodyState, error) {
	key := schema.NameKey(name)
	if b := im.stars[key]; b != nil {
		return b, nil
	}
	b, err := im.findOrCreate(schema.KindStar, 0, "", name, key)
	if err != nil {
		return nil, err
	}
	im.stars[key] = b
	im.cached++
	return b, nil
}

func (im *importer) findOrCreate(kind schema.Kind, parentID int64, parentName, name, key string) (*bodyState, error) {
	// No flush first: a queued star or planet was created since the cache
	// was last dropped (record writes the queue then), so it is cached and
	// never looked up here.
	b := &bodyState{kind: kind, parent: parentName}
	err := im.findBody.QueryRowContext(im.ctx, string(kind), parentID, key).Scan(&b.id, &b.name)
	if err == nil {
		return b, nil
	}
	if !errors.Is(err, sql.ErrNoRows) {
		return nil, err
	}
	return im.create(kind, parentID, parentName, name, key)
}

func (im *importer) create(kind schema.Kind, parentID int64, parentName, name, key string) (*bodyState, error) {
	var parent any
	if parentID != 0 {
		parent = parentID
	}
	display := strings.Join(strings.Fields(name), " ")
	id := im.nextBody
	im.nextBody++
	im.bodies = append(im.bodies, id, string(kind), display, key, parent, im.rev)
	if len(im.bodies) == batchRows*bodyArgs {
		// A full batch of bodies: write it, then the values waiting for it.
		if err := im.flushBodies(); err != nil {
			return nil, err
		}
		if err := im.flushValues(false); err != nil {
			return nil, err
		}
	}
	im.res.NewBodies++
	return &bodyState{id: id, kind: kind, name: display, parent: parentName, isNew: true}, nil
}

func (im *importer) planet(name string, star *bodyState) (*bodyState, error) {
	key := schema.NameKey(name)
	if star != nil {
		pk := childKey{star.id, key}
		if b := im.planets[pk]; b != nil {
			return b, nil
		}
		b, err := im.findOrCreate(schema.KindPlanet, star.id, star.name, name, key)
		if err != nil {
			return nil, err
		}
		b = im.intern(b)
		im.planets[pk] = b
		return b, nil
	}
	if b := im.anyPlanet[key]; b != nil {
		return b, nil
	}
	if err := im.flushBodies(); err != nil {
		return nil, err
	}
	rows, err := im.findPlanets.QueryContext(im.ctx, key)
	if err != nil {
		return nil, err
	}
	var found []*bodyState
	for rows.Next() {
		b := &bodyState{kind: schema.KindPlanet}
		var starID int64
		if err := rows.Scan(&b.id, &b.name, &starID, &b.parent); err != nil {
			rows.Close()
			return nil, err
		}
		found = append(found, b)
	}
	rows.Close()
	if err := rows.Err(); err != nil {
		return nil, err
	}
	var b *bodyState
	switch len(found) {
	case 0:
		if b, err = im.create(schema.KindPlanet, 0, "", name, key); err != nil {
			return nil, err
		}
	case 1:
		b = found[0]
	default:
		var names []string
		for _, f := range found {
			if f.parent == "" {
				names = append(names, fmt.Sprintf("%s (no star)", f.name))
			} else {
				names = append(names, fmt.Sprintf("%s (star %s)", f.name, f.parent))
			}
		}
		return nil, fmt.Errorf("%w: planet %q matches %s; give the star", ErrAmbiguous, name, strings.Join(names, ", "))
	}
	b = im.intern(b)
	im.anyPlanet[key] = b
	return b, nil
}

// intern returns the one bodyState of a planet, however it was reached, so
// that its cached values stay consistent.
func (im *importer) intern(b *bodyState) *bodyState {
	if have := im.planetByID[b.id]; have != nil {
		return have
	}
	im.planetByID[b.id] = b
	im.cached++
	return b
}

func (im *importer) moon(r *schema.Record, planet *bodyState) (*bodyState, error) {
	names := append([]string{r.Name}, r.Aliases...)
	keys := make([]string, 0, len(names))
	type cand struct {
		id   int64
		name string
		rev  int64 // the revision that created it
		row  int   // for a moon of a planet this import created: the row that named it
	}
	var cands []cand
	seen := func(id int64) bool {
		for _, c := range cands {
			if c.id == id {
				return true
			}
		}
		return false
	}
	if !planet.isNew {
		if err := im.flushBodies(); err != nil {
			return nil, err
		}
		for _, n := range names {
			k := schema.NameKey(n)
			if k == "" {
				continue
			}
			keys = append(keys, k)
			rows, err := im.matchMoon.QueryContext(im.ctx, planet.id, k)
			if err != nil {
				return nil, err
			}
			for rows.Next() {
				var c cand
				if err := rows.Scan(&c.id, &c.name, &c.rev); err != nil {
					rows.Close()
					return nil, err
				}
				if !seen(c.id) {
					cands = append(cands, c)
				}
			}
			rows.Close()
			if err := rows.Err(); err != nil {
				return nil, err
			}
		}
	} else {
		// Nothing in the database can match under a planet this import
		// created; only moons created by earlier records can.
		for _, n := range names {
			k := schema.NameKey(n)
			if k == "" {
				continue
			}
			keys = append(keys, k)
			if c, ok := planet.moons[k]; ok && !seen(c.id) {
				cands = append(cands, cand{c.id, c.name, im.rev, c.row})
			}
		}
	}
	var m *bodyState
	switch len(cands) {
	case 0:
		var err error
		if m, err = im.create(schema.KindMoon, planet.id, planet.name, r.Name, keys[0]); err != nil {
			return nil, err
		}
		if !planet.isNew {
			im.moonsSeen[m.id] = r.Row
		} // else planet.moons keeps its row
	case 1:
		c := cands[0]
		m = &bodyState{id: c.id, kind: schema.KindMoon, name: c.name, parent: planet.name}
		// A moon this import created was named by an earlier record: the
		// row is known from planet.moons or moonsSeen, unless the planet
		// has left the cache since.
		row, dup := im.moonsSeen[m.id]
		if !dup && c.rev == im.rev {
			row, dup = c.row, true
		}
		if dup {
			first := "an earlier row"
			if row > 0 {
				first = fmt.Sprintf("row %d", row)
			}
			return nil, fmt.Errorf("moon %q of planet %q appears twice in one import (first at %s)", m.name, planet.name, first)
		}
		im.moonsSeen[m.id] = r.Row
	default:
		sort.Slice(cands, func(i, j int) bool { return cands[i].id < cands[j].id })
		var list []string
		for _, c := range cands {
			list = append(list, fmt.Sprintf("%q", c.name))
		}
		return nil, fmt.Errorf("%w: moon %q (names %s) matches several moons of planet %q: %s",
			ErrAmbiguous, r.Name, quoteAll(names), planet.name, strings.Join(list, ", "))
	}
	mkey := schema.NameKey(m.name)
	if planet.isNew {
		if planet.moons == nil {
			planet.moons = map[string]moonName{}
		}
		planet.moons[mkey] = moonName{m.id, m.name, r.Row}
	}
	for _, n := range names {
		k := schema.NameKey(n)
		if k == "" || k == mkey {
			continue
		}
		if planet.isNew {
			planet.moons[k] = moonName{m.id, m.name, r.Row}
		}
		if err := im.flushBodies(); err != nil {
			return nil, err
		}
		res, err := im.insAlias.ExecContext(im.ctx, m.id, strings.Join(strings.Fields(n), " "), k, im.rev)
		if err != nil {
			return nil, fmt.Errorf("record alias %q: %w", n, err)
		}
		if n, _ := res.RowsAffected(); n > 0 {
			im.res.NewAliases++
		}
	}
	// Load the moon's current values for this record.
	clear(im.moonVals)
	m.vals = im.moonVals
	if !m.isNew {
		if err := im.loadVals(m); err != nil {
			return nil, err
		}
	}
	return m, nil
}

func quoteAll(ss []string) string {
	q := make([]string, len(ss))
	for i, s := range ss {
		q[i] = fmt.Sprintf("%q", s)
	}
	return strings.Join(q, ", ")
}

func (im *importer) loadVals(b *bodyState) error {
	if b.kind != schema.KindMoon {
		// A star or planet read back after a dropped cache may have
		// queued values. (A moon's cannot: a moon named twice in one
		// import is refused before its values are read.)
		if err := im.flushAll(); err != nil {
			return err
		}
	}
	rows, err := im.curVals.QueryContext(im.ctx, b.id)
	if err != nil {
		return err
	}
	defer rows.Close()
	for rows.Next() {
		cv := &curVal{change: -1}
		p, err := scanParam(rows, &cv.id)
		if err != nil {
			return err
		}
		cv.p = p
		if b.kind != schema.KindMoon {
			hk := hostKey{b.id, p.Key}
			if p.Revision == im.rev {
				cv.counted, cv.prevUnknown = true, true
				if i, ok := im.hostChange[hk]; ok {
					cv.change = i
				}
			} else {
				_, cv.counted = im.countedHost[hk]
			}
		}
		b.vals[p.Key] = cv
	}
	return rows.Err()
}

// resolvePrev finds the value this import superseded for a host value read
// back after a dropped cache.
func (im *importer) resolvePrev(b *bodyState, cv *curVal) error {
	cv.prevUnknown = false
	if err := im.flushAll(); err != nil {
		return err
	}
	rows, err := im.prevValue.QueryContext(im.ctx, b.id, cv.p.Key, im.rev)
	if err != nil {
		return err
	}
	defer rows.Close()
	if !rows.Next() {
		return rows.Err() // none: added by this import
	}
	var id int64
	p, err := scanParam(rows, &id)
	if err != nil {
		return err
	}
	cv.prev, cv.prevID = &p, id
	return rows.Close()
}

// setChange records the Changes index of a host value (-1: none).
func (im *importer) setChange(b *bodyState, key string, i int) int {
	if i >= 0 {
		im.hostChange[hostKey{b.id, key}] = i
	} else {
		delete(im.hostChange, hostKey{b.id, key})
	}
	return i
}

// set applies one value to a body.
func (im *importer) set(b *bodyState, p schema.Param) error {
	if b.vals == nil { // a star or planet seen for the first time
		b.vals = map[string]*curVal{}
		if !b.isNew {
			if err := im.loadVals(b); err != nil {
				return err
			}
		}
	}
	cv := b.vals[p.Key]
	if b.kind == schema.KindMoon {
		return im.setMoon(b, cv, p)
	}
	if cv != nil && cv.prevUnknown && !sameValue(cv.p, p) {
		if err := im.resolvePrev(b, cv); err != nil {
			return err
		}
	}
	switch {
	case cv == nil:
		id, err := im.insert(b, p)
		if err != nil {
			return err
		}
		b.vals[p.Key] = &curVal{id: id, p: p, change: im.setChange(b, p.Key, im.addChange(b, nil, p)), counted: true}
		im.res.Added++
	case sameValue(cv.p, p):
		if !cv.counted {
			cv.counted = true
			im.countedHost[hostKey{b.id, p.Key}] = struct{}{}
			im.res.Unchanged++
		}
	case cv.p.Revision != im.rev:
		im.superseded = append(im.superseded, cv.id) // before the new row is written: see flushValues
		id, err := im.insert(b, p)
		if err != nil {
			return err
		}
		old := cv.p
		b.vals[p.Key] = &curVal{id: id, p: p, prev: &old, prevID: cv.id, change: im.setChange(b, p.Key, im.addChange(b, &old, p)), counted: true}
		im.res.Changed++
	case cv.prev != nil && sameValue(*cv.prev, p):
		// A later row of this request put back the value it started with:
		// undo the change instead of recording a no-op.
		if err := im.flushAll(); err != nil {
			return err
		}
		if _, err := im.delValue.ExecContext(im.ctx, cv.id); err != nil {
			return err
		}
		if _, err := im.restore.ExecContext(im.ctx, cv.prevID); err != nil {
			return err
		}
		if cv.change >= 0 {
			im.dead[cv.change] = true
		}
		im.res.Changed--
		im.res.Unchanged++
		im.setChange(b, p.Key, -1)
		im.countedHost[hostKey{b.id, p.Key}] = struct{}{}
		b.vals[p.Key] = &curVal{id: cv.prevID, p: *cv.prev, change: -1, counted: true}
	default:
		// Set earlier in this request to something else: the last one wins.
		if err := im.flushAll(); err != nil {
			return err
		}
		u := uncArgs(p.Unc)
		if _, err := im.updValue.ExecContext(im.ctx, p.Value, p.Unc.Kind.String(), u[0], u[1], u[2], u[3], u[4], u[5],
			p.Source, string(p.Status), cv.id); err != nil {
			return err
		}
		cv.p = p
		if cv.change >= 0 {
			np := p
			im.res.Changes[cv.change].New = &np
		}
	}
	return nil
}

// setMoon applies one value to a moon. A moon appears once per request and
// a record gives each key once, so its new rows are never read back by this
// import: they are queued and inserted batchRows at a time.
func (im *importer) setMoon(b *bodyState, cv *curVal, p schema.Param) error {
	switch {
	case cv == nil:
		im.addChange(b, nil, p)
		im.res.Added++
	case sameValue(cv.p, p):
		im.res.Unchanged++
		return nil
	default:
		im.superseded = append(im.superseded, cv.id) // before the new row is inserted: see queue
		old := cv.p
		im.addChange(b, &old, p)
		im.res.Changed++
	}
	_, err := im.queue(b, p)
	return err
}

// batchRows is how many value rows one multi-row INSERT carries: fewer
// statement executions (measured about 1.5× faster than one row per INSERT
// with this driver).
const batchRows = 32

const valueInsertRow = "(?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)"

const bodyInsertRow = "(?, ?, ?, ?, ?, ?)"

// queue adds a value row to the pending batch and returns its id.
func (im *importer) queue(b *bodyState, p schema.Param) (int64, error) {
	u := uncArgs(p.Unc)
	id := im.nextValue
	im.nextValue++
	im.pending = append(im.pending, id, b.id, p.Key, p.Value, p.Unc.Kind.String(), u[0], u[1], u[2], u[3], u[4], u[5],
		p.Source, string(p.Status), im.rev)
	if len(im.pending) < maxPendingValues*valueArgs {
		return id, nil
	}
	if err := im.flushBodies(); err != nil {
		return 0, err
	}
	return id, im.flushValues(false)
}

// flushBodies writes the queued bodies: the values, aliases and children
// that refer to them, and the queries that look for them, need them first.
func (im *importer) flushBodies() error {
	rows := im.bodies
	for len(rows) >= batchRows*bodyArgs {
		if _, err := im.insBodyBatch.ExecContext(im.ctx, rows[:batchRows*bodyArgs]...); err != nil {
			return fmt.Errorf("store bodies: %w", err)
		}
		rows = rows[batchRows*bodyArgs:]
	}
	for ; len(rows) > 0; rows = rows[bodyArgs:] {
		if _, err := im.insBody.ExecContext(im.ctx, rows[:bodyArgs]...); err != nil {
			return fmt.Errorf("create %s %q: %w", rows[1], rows[2], err)
		}
	}
	clear(im.bodies)
	im.bodies = im.bodies[:0]
	return nil
}

// flushValues writes the queued value rows in full batches, and with all the
// rest too. Their bodies must have been written.
func (im *importer) flushValues(all bool) error {
	// The rows these replace must leave the current set first, or the new
	// ones would collide with them in the value_key index.
	if err := im.flushSuperseded(); err != nil {
		return err
	}
	rows := im.pending
	for len(rows) >= batchRows*valueArgs {
		if _, err := im.insBatch.ExecContext(im.ctx, rows[:batchRows*valueArgs]...); err != nil {
			return fmt.Errorf("store values: %w", err)
		}
		rows = rows[batchRows*valueArgs:]
	}
	if all {
		for ; len(rows) > 0; rows = rows[valueArgs:] {
			if _, err := im.insValue.ExecContext(im.ctx, rows[:valueArgs]...); err != nil {
				return fmt.Errorf("store values: %w", err)
			}
		}
	}
	n := copy(im.pending, rows)
	clear(im.pending[n:])
	im.pending = im.pending[:n]
	return nil
}

// flushSuperseded marks the queued values superseded, batchRows at a time.
func (im *importer) flushSuperseded() error {
	ids := im.superseded
	for len(ids) >= batchRows {
		args := make([]any, 0, batchRows+1)
		args = append(args, im.rev)
		for _, id := range ids[:batchRows] {
			args = append(args, id)
		}
		if _, err := im.supersedeBatch.ExecContext(im.ctx, args...); err != nil {
			return fmt.Errorf("supersede values: %w", err)
		}
		ids = ids[batchRows:]
	}
	for _, id := range ids {
		if _, err := im.supersede.ExecContext(im.ctx, im.rev, id); err != nil {
			return fmt.Errorf("supersede values: %w", err)
		}
	}
	im.superseded = im.superseded[:0]
	return nil
}

// flushAll writes everything queued: before a statement that reads or
// changes values by id.
func (im *importer) flushAll() error {
	if err := im.flushBodies(); err != nil {
		return err
	}
	return im.flushValues(true)
}

// flush writes what is left at the end.
func (im *importer) flush() error { return im.flushAll() }

// insert queues a star's or planet's value and returns its row id.
func (im *importer) insert(b *bodyState, p schema.Param) (int64, error) {
	return im.queue(b, p)
}

func (im *importer) addChange(b *bodyState, old *schema.Param, p schema.Param) int {
	if im.omit || (old == nil && im.omitAdded) {
		return -1
	}
	np := p
	im.res.Changes = append(im.res.Changes, ValueChange{Kind: b.kind, Body: b.name, Parent: b.parent, Key: p.Key, Old: old, New: &np})
	return len(im.res.Changes) - 1
}
