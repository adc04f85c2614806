package store

import (
	"cmp"
	"context"
	"database/sql"
	"database/sql/driver"
	"encoding/hex"
	"errors"
	"fmt"
	"hash/maphash"
	"maps"
	"slices"
	"sort"
	"strconv"
	"strings"
	"time"

	"tidesift/schema"
)

// ErrAmbiguous is wrapped by Import and History when a name matches several
// bodies; the message lists the candidates.
var ErrAmbiguous = errors.New("ambiguous name")

// ErrConflict is wrapped by Import when records of one request give a star
// or planet different values for one key.
var ErrConflict = errors.New("conflicting values for one body")

// ErrDuplicate is wrapped by Import when a request names one moon twice.
var ErrDuplicate = errors.New("moon given twice")

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
// Revision is nil. A moon may appear once per request (ErrDuplicate). A
// star's or planet's value repeated on many records must be the same value
// and uncertainty on each (ErrConflict); the first record's source and status
// stand, and Changes lists the value once. These checks need memory only for
// the stars and planets in the import's cache, not for the whole request:
// the rest is read back from the transaction.
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
		res, err = s.importTx(ctx, req, sum, func(apply func(*prepared, int) error, pp *preparer) error {
			var pr prepared
			for i := range req.Records {
				pr = prepared{rec: req.Records[i]}
				pp.prepare(&pr, false) // the caller's records stay as they are
				if err := apply(&pr, i); err != nil {
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
	feed func(apply func(rec *prepared, i int) error, pp *preparer) error) (res *ImportResult, err error) {
	// The import's rows are written parents first, with ids it hands out
	// itself under the write lock, so foreign keys hold by construction;
	// enforcing them costs a lookup per key and row (about a tenth of a
	// large import, measured with bench/import.sh). They are switched off
	// for this transaction only (the pragma is a no-op inside one), and
	// `tidesift check` still runs foreign_key_check.
	conn, err := s.db.Conn(ctx)
	if err != nil {
		return nil, err
	}
	defer conn.Close()
	if _, err := conn.ExecContext(ctx, "PRAGMA foreign_keys = OFF"); err != nil {
		return nil, err
	}
	defer func() {
		// A connection that cannot be put back as it was is not reused.
		bg := context.WithoutCancel(ctx)
		if _, ferr := conn.ExecContext(bg, "PRAGMA foreign_keys = ON; DROP TABLE IF EXISTS temp."+summaryTable); ferr != nil {
			_ = conn.Raw(func(any) error { return driver.ErrBadConn })
		}
	}()
	tx, err := conn.BeginTx(ctx, nil) // BEGIN IMMEDIATE (see writerParams)
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
	im.maxChanges = req.MaxChanges
	defer im.close()
	// New moons' states can be encoded while records are prepared when no
	// change needs listing for them (a large first import).
	pp := &preparer{rev: revID, codes: maps.Clone(im.kc.byKey), encode: req.OmitChanges || req.OmitAdded}
	if err := feed(func(pr *prepared, i int) error {
		if err := im.record(pr); err != nil {
			return fmt.Errorf("%s: %w", recordPlace(req.File, &pr.rec, i), err)
		}
		return nil
	}, pp); err != nil {
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
	// moons are the names and aliases (name keys) of the moons records of
	// this import named under a planet while it was cached: a second record
	// naming one is found here without writing the queues first.
	moons map[string]moonName

	// The body's values. A star's or planet's are kept across the records
	// that repeat them and written when the body leaves the cache (or at
	// the end); a moon's live for its one record.
	loaded bool
	baseID int64   // the state current before this import; 0: none
	base   []entry // its values
	cur    []entry // the values as this import leaves them
	ownID  int64   // the state this import wrote for a star or planet; 0: none
	dirty  bool    // the moon's record changed or added a value
	// given are the key codes the request gave a star or planet, with the
	// order in which each was first given (Changes are listed in it).
	given    []uint64
	givenSeq []int
	givenRow []int // the row that first gave each (0: not known, after the cache was dropped)
	// queued is 1 + the index of the state_id argument in importer.bodies
	// while the body's row waits there (queuedGen == importer.bodyGen).
	queued, queuedGen int
}

// hostCacheLimit bounds how many stars and planets an import keeps cached
// with their values. Past it their states are written, the cache is dropped
// and bodies are read back from the transaction as they recur, so memory
// stays flat however many planets a file names (rows of one planet usually
// come together).
var hostCacheLimit = 4096 // a variable so that tests can make it tiny

// hostSummary is what must outlive a star's or planet's cache entry, in
// case a later record names the body again: which keys the request gave it
// and what they were counted as: the keys as a bit set of their codes, the
// changes as a run of Changes. One row per star and planet of a large file
// waits in a temporary table (flushSummaries), not in memory.
type hostSummary struct {
	given                     uint64 // bit c: key code c (below 64) was given
	firstChange               int32  // index in Changes of the first of its changes; -1: none
	nChanges                  uint8
	added, changed, unchanged uint8
}

// maxHostKeys bounds the keys of one star or planet that a summary counts
// (uint8 counts): far above the registry's few host keys.
const maxHostKeys = 255

type moonName struct {
	id   int64
	name string
	row  int // the row that named it
}

type childKey struct {
	parent int64 // 0: no parent (a planet without a star)
	key    string
}

const bodyInsert = "INSERT INTO body (id, kind, name, name_key, parent_id, created_rev, state_id) VALUES "

const stateInsert = "INSERT INTO state (id, body_id, set_rev, prev_id, data) VALUES "

// Arguments per queued row.
const (
	bodyArgs  = 7
	stateArgs = 5
)

// batchRows is how many rows one multi-row statement carries: fewer
// statement executions (measured about 1.5× faster than one row per INSERT
// with this driver).
const batchRows = 128

const bodyInsertRow = "(?, ?, ?, ?, ?, ?, ?)"

const stateInsertRow = "(?, ?, ?, ?, ?)"

type importer struct {
	ctx        context.Context // for statements: never cancelled
	outer      context.Context // the caller's
	tx         *sql.Tx
	rev        int64
	omit       bool
	omitAdded  bool
	maxChanges int
	res        ImportResult
	seq        []int        // per Changes entry: the order it was first given in
	nextSeq    int          // the next such order
	dead       map[int]bool // indexes of Changes undone later in the request
	kc         *keyCodes
	in         interner

	findBody, findPlanets, matchMoon, insBody, insAlias, loadState, hostState *sql.Stmt
	insBodyBatch, insState, insStateBatch, supersede, supersedeBatch          *sql.Stmt
	setCurrent, setCurrentBatch, updState, addKey                             *sql.Stmt
	stmts                                                                     []*sql.Stmt

	// Queued rows, written in batches. Row ids are given here, not by
	// SQLite, so that rows can be queued: the transaction holds the write
	// lock, so no one else takes an id meanwhile.
	bodies     []any   // body rows, bodyArgs arguments each
	bodyGen    int     // incremented each time bodies is written
	states     []any   // state rows, stateArgs arguments each
	superseded []int64 // ids of states to mark superseded
	current    []int64 // (body id, state id) pairs of existing bodies' new current states
	arena      []byte  // the queued states' encodings
	scratch    []schema.StateValue

	nextBody, nextState int64

	stars      map[string]*bodyState
	planets    map[childKey]*bodyState
	anyPlanet  map[string]*bodyState // planets looked up without a star
	planetByID map[int64]*bodyState
	// seen is the set of moons that existed before this import and that
	// a record named (by id: ids are dense, so a bit set is small and
	// exact); seenRow keeps the row for the most recent of them.
	seen    bitset
	seenRow map[int64]int
	cached  int // stars and planets in the caches
	// The summaries of stars and planets that left the cache wait in a
	// temporary table (see summaries), so that memory stays flat however
	// many a file names: queued rows, then the table's statements.
	summaries                []any
	summaryReady             bool
	insSummary, insSummaries *sql.Stmt
	getSummary, delSummary   *sql.Stmt
	moonBody                 bodyState // reused for each record's moon
	// created holds hashes of the stars and planets this import created,
	// when the catalog had no bodies before it (nil otherwise): see mayExist.
	created *bloom
}

func newImporter(ctx context.Context, tx *sql.Tx, rev int64, omit bool) (*importer, error) {
	// The statements run without the caller's cancellation: with a
	// cancellable context the driver watches each statement on a goroutine
	// of its own, which cost about a seventh of a large import. record
	// checks the caller's context instead, and the transaction still rolls
	// back when it is cancelled.
	im := &importer{ctx: context.WithoutCancel(ctx), outer: ctx, tx: tx, rev: rev, omit: omit, dead: map[int]bool{},
		in: interner{}, stars: map[string]*bodyState{}, planets: map[childKey]*bodyState{}, anyPlanet: map[string]*bodyState{},
		planetByID: map[int64]*bodyState{}, seenRow: map[int64]int{}}
	batchOf := func(row string) string { return strings.TrimSuffix(strings.Repeat(row+", ", batchRows), ", ") }
	prep := []struct {
		dst **sql.Stmt
		sql string
	}{
		// ifnull(parent_id, 0) matches the body_natural index expression.
		{&im.findBody, "SELECT id, name FROM body WHERE name_key = ? AND kind = ? AND ifnull(parent_id, 0) = ?"},
		{&im.findPlanets, `SELECT p.id, p.name, ifnull(p.parent_id, 0), ifnull(s.name, '') FROM body p
			LEFT JOIN body s ON s.id = p.parent_id WHERE p.name_key = ? AND p.kind = 'planet' ORDER BY p.id`},
		// UNION ALL: the caller drops a moon found twice (no temporary
		// b-tree per lookup); the current state comes along.
		{&im.matchMoon, `SELECT b.id, b.name, b.created_rev, ifnull(b.state_id, 0), s.data FROM body b
			LEFT JOIN state s ON s.id = b.state_id
			WHERE b.name_key = ?2 AND b.kind = 'moon' AND ifnull(b.parent_id, 0) = ?1
			UNION ALL SELECT b.id, b.name, b.created_rev, ifnull(b.state_id, 0), s.data FROM alias a JOIN body b ON b.id = a.body_id
			LEFT JOIN state s ON s.id = b.state_id
			WHERE a.name_key = ?2 AND b.kind = 'moon' AND b.parent_id = ?1`},
		{&im.insBody, bodyInsert + bodyInsertRow},
		{&im.insBodyBatch, bodyInsert + batchOf(bodyInsertRow)},
		{&im.insAlias, "INSERT OR IGNORE INTO alias (body_id, name, name_key, rev) VALUES (?, ?, ?, ?)"},
		{&im.loadState, "SELECT data FROM state WHERE id = ?"},
		{&im.hostState, `SELECT ifnull(b.state_id, 0), ifnull(s.set_rev, 0), ifnull(s.prev_id, 0), s.data
			FROM body b LEFT JOIN state s ON s.id = b.state_id WHERE b.id = ?`},
		{&im.insState, stateInsert + stateInsertRow},
		{&im.insStateBatch, stateInsert + batchOf(stateInsertRow)},
		{&im.supersede, "UPDATE state SET superseded_rev = ? WHERE id = ?"},
		{&im.supersedeBatch, "UPDATE state SET superseded_rev = ? WHERE id IN (?" + strings.Repeat(", ?", batchRows-1) + ")"},
		{&im.setCurrent, "UPDATE body SET state_id = ?2 WHERE id = ?1"},
		{&im.setCurrentBatch, "UPDATE body SET state_id = v.column2 FROM (VALUES " + batchOf("(?, ?)") + ") AS v WHERE body.id = v.column1"},
		{&im.updState, "UPDATE state SET data = ? WHERE id = ?"},
		{&im.addKey, "INSERT INTO key_name (code, key) VALUES (?, ?)"},
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
	var err error
	if im.kc, err = loadKeyCodes(ctx, tx); err != nil {
		im.close()
		return nil, err
	}
	if err := tx.QueryRowContext(ctx, "SELECT ifnull(max(id), 0) + 1 FROM body").Scan(&im.nextBody); err != nil {
		im.close()
		return nil, err
	}
	if err := tx.QueryRowContext(ctx, "SELECT ifnull(max(id), 0) + 1 FROM state").Scan(&im.nextState); err != nil {
		im.close()
		return nil, err
	}
	if im.nextBody == 1 {
		im.created = new(bloom)
	}
	return im, nil
}

func (im *importer) close() {
	for _, st := range im.stmts {
		st.Close()
	}
	im.stmts = nil
}

// result returns the counts and the live changes, in request order.
func (im *importer) result() *ImportResult {
	res := im.res
	type ordered struct {
		c   ValueChange
		seq int
	}
	kept := make([]ordered, 0, len(res.Changes))
	for i, c := range res.Changes {
		if !im.dead[i] {
			kept = append(kept, ordered{c, im.seq[i]})
		}
	}
	sort.SliceStable(kept, func(i, j int) bool { return kept[i].seq < kept[j].seq })
	res.Changes = res.Changes[:0]
	for _, k := range kept {
		res.Changes = append(res.Changes, k.c)
	}
	if len(res.Changes) == 0 {
		res.Changes = nil
	}
	return &res
}

// sources returns the interner for the sources of states read back. It is
// emptied now and then, so that a file of many distinct citations does not
// grow it without end (sharing is an economy, not a need).
func (im *importer) sources() interner {
	if len(im.in) > 1<<12 {
		clear(im.in)
	}
	return im.in
}

// code returns the key code of a key, giving it one when it has none yet (a
// key added to the registry after the catalog was made).
func (im *importer) code(key string) (uint64, error) {
	if c, ok := im.kc.byKey[key]; ok {
		return c, nil
	}
	c := im.kc.next
	if _, err := im.addKey.ExecContext(im.ctx, c, key); err != nil {
		return 0, fmt.Errorf("record key %q: %w", key, err)
	}
	im.kc.byCode[c], im.kc.byKey[key] = key, c
	im.kc.next++
	return c, nil
}

// prepared is a record with the work that needs no catalog done: its
// values checked and completed, its names' keys and each value's body
// found. ImportStream prepares records on the reading goroutine, so that
// this work overlaps the writing.
type prepared struct {
	rec                         schema.Record
	nameKey, planetKey, starKey string
	// kinds[i] is the body of rec.Params[i] (for the first len(kinds)
	// values; the rest are looked up again).
	kinds [24]schema.Kind
	err   error // the record's own problem, reported when it is applied
	// fresh is the encoded state of the record's moon values alone, with
	// the import's revision: the state of the moon if it is new (nil when
	// not encoded, see preparer); nFresh counts its values.
	fresh  []byte
	nFresh int
}

// preparer holds what prepare needs of the import: its revision, and a copy
// of the key codes (records are prepared on another goroutine).
type preparer struct {
	rev    int64
	codes  map[string]uint64
	encode bool // encode prepared.fresh
}

// prepare checks and completes a record's values in place (a shallow copy of
// the caller's record: own says whether its Params may be changed, or must
// be copied first), and encodes its moon values when pp says so.
func (pp *preparer) prepare(pr *prepared, own bool) {
	r := &pr.rec
	pr.nameKey, pr.planetKey, pr.starKey = schema.NameKey(r.Name), schema.NameKey(r.Planet), schema.NameKey(r.Star)
	if pr.nameKey == "" {
		pr.err = errors.New("the moon has no name")
		return
	}
	if pr.planetKey == "" {
		pr.err = fmt.Errorf("moon %q has no planet", r.Name)
		return
	}
	if !own {
		r.Params = slices.Clone(r.Params)
	}
	for i := range r.Params {
		p := &r.Params[i]
		for _, q := range r.Params[:i] {
			if q.Key == p.Key {
				pr.err = fmt.Errorf("%s is given twice", p.Key)
				return
			}
		}
		info, ok := schema.LookupKey(p.Key)
		if !ok {
			pr.err = fmt.Errorf("%w %q (want one of the keys of the canonical layout)", schema.ErrUnknownKey, p.Key)
			return
		}
		if info.Body == schema.KindStar && pr.starKey == "" {
			pr.err = fmt.Errorf("%s is a value of the star, but the record names no star", p.Key)
			return
		}
		if i < len(pr.kinds) {
			pr.kinds[i] = info.Body
		}
		if p.Source == "" {
			p.Source = r.Source
		}
		if p.Status == "" {
			p.Status = schema.StatusMeasured
		}
		if p.Status != schema.StatusMeasured && p.Status != schema.StatusAssumed {
			pr.err = fmt.Errorf("%s: unknown status %q (want %q or %q)", p.Key, p.Status, schema.StatusMeasured, schema.StatusAssumed)
			return
		}
		p.Unc = normUnc(p.Unc)
		if err := schema.CheckParam(*p); err != nil {
			pr.err = err
			return
		}
	}
	if pp.encode && len(r.Params) <= len(pr.kinds) {
		pr.fresh, pr.nFresh = pp.freshState(pr)
	}
}

// freshState encodes the moon values of a prepared record as a new moon's
// state, as the importer would (see encodeEntries); nil when a key has no
// code yet (the importer gives it one).
func (pp *preparer) freshState(pr *prepared) ([]byte, int) {
	var vals [24]schema.StateValue
	n := 0
	for i := range pr.rec.Params {
		if pr.kinds[i] != schema.KindMoon {
			continue
		}
		p := pr.rec.Params[i]
		c, ok := pp.codes[p.Key]
		if !ok {
			return nil, 0
		}
		p.Revision = pp.rev
		vals[n] = schema.StateValue{Code: c, Param: p}
		n++
	}
	if n == 0 {
		return nil, 0
	}
	sorted := vals[:n]
	slices.SortFunc(sorted, func(a, b schema.StateValue) int { return cmp.Compare(a.Code, b.Code) })
	return schema.AppendState(nil, sorted), n
}

// record applies one prepared record.
func (im *importer) record(pr *prepared) error {
	if err := im.outer.Err(); err != nil {
		return err
	}
	if pr.err != nil {
		return pr.err
	}
	if im.cached > hostCacheLimit {
		if err := im.dropHosts(); err != nil {
			return err
		}
	}
	r := &pr.rec
	var star *bodyState
	if pr.starKey != "" {
		var err error
		if star, err = im.star(r.Star, pr.starKey); err != nil {
			return err
		}
	}
	planet, err := im.planet(r.Planet, pr.planetKey, star)
	if err != nil {
		return err
	}
	moon, err := im.moon(r, planet)
	if err != nil {
		return err
	}
	// A new moon takes the state prepared for it, when there is one.
	fresh := moon.isNew && pr.fresh != nil
	for i := range r.Params {
		p := r.Params[i]
		var kind schema.Kind
		if i < len(pr.kinds) {
			kind = pr.kinds[i]
		} else {
			info, _ := schema.LookupKey(p.Key) // checked by prepare
			kind = info.Body
		}
		b := moon
		switch kind {
		case schema.KindPlanet:
			b = planet
		case schema.KindStar:
			b = star
		default:
			if fresh {
				continue
			}
		}
		p.Revision = im.rev
		c, err := im.code(p.Key)
		if err != nil {
			return err
		}
		if b == moon {
			im.setMoon(moon, c, p)
		} else if err := im.setHost(b, c, p, r.Row); err != nil {
			return fmt.Errorf("%s: %w", p.Key, err)
		}
	}
	if fresh {
		im.res.Added += pr.nFresh
		start := len(im.arena)
		im.arena = append(im.arena, pr.fresh...)
		_, err := im.queueEncoded(moon, im.arena[start:len(im.arena):len(im.arena)])
		return err
	}
	return im.finishMoon(moon)
}

func (im *importer) star(name, key string) (*bodyState, error) {
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
	// was last dropped (dropHosts writes the queue then), so it is cached
	// and never looked up here.
	if !im.mayExist(kind, key) {
		return im.create(kind, parentID, parentName, name, key, &bodyState{})
	}
	b := &bodyState{kind: kind, parent: parentName}
	err := im.findBody.QueryRowContext(im.ctx, key, string(kind), parentID).Scan(&b.id, &b.name)
	if err == nil {
		return b, nil
	}
	if !errors.Is(err, sql.ErrNoRows) {
		return nil, err
	}
	return im.create(kind, parentID, parentName, name, key, &bodyState{})
}

// mayExist reports whether a star or planet of that kind and name key could
// be in the catalog. In a catalog that held no bodies when the import began,
// only those the import created can be: a Bloom filter of them then spares a
// query per new star and planet (a false positive only costs the query).
func (im *importer) mayExist(kind schema.Kind, key string) bool {
	return im.created == nil || im.created.has(hostHash(kind, key))
}

// bloom is a Bloom filter of fixed size, so that memory stays flat however
// many bodies a file creates; with 2²³ bits and three probes, 200,000
// members give about one false positive in 3,000 lookups (Bloom 1970; the
// rate (1 − e^(−kn/m))^k is common practice).
type bloom [1 << 17]uint64

func (f *bloom) probes(h uint64, visit func(word int, bit uint64)) {
	const bits = uint64(len(f) * 64)
	h1, h2 := h, h>>32|h<<32|1
	for i := uint64(0); i < 3; i++ {
		x := (h1 + i*h2) % bits
		visit(int(x/64), 1<<(x%64))
	}
}

func (f *bloom) add(h uint64) {
	f.probes(h, func(w int, b uint64) { f[w] |= b })
}

func (f *bloom) has(h uint64) bool {
	all := true
	f.probes(h, func(w int, b uint64) { all = all && f[w]&b != 0 })
	return all
}

// maxSeenRows bounds importer.seenRow: past it, a duplicate's message says
// "an earlier row" instead of its number.
const maxSeenRows = 1 << 16

// bitset is a set of non-negative ids, one bit each.
type bitset []uint64

func (s *bitset) add(id int64) {
	w := int(id / 64)
	if w >= len(*s) {
		*s = append(*s, make([]uint64, w+1-len(*s))...)
	}
	(*s)[w] |= 1 << (id % 64)
}

func (s bitset) has(id int64) bool {
	w := int(id / 64)
	return w < len(s) && s[w]&(1<<(id%64)) != 0
}

// hostSeed keys hostHash; one per process is enough.
var hostSeed = maphash.MakeSeed()

func hostHash(kind schema.Kind, key string) uint64 {
	var h maphash.Hash
	h.SetSeed(hostSeed)
	h.WriteString(string(kind))
	h.WriteByte(0)
	h.WriteString(key)
	return h.Sum64()
}

// create queues a new body's row and fills b (reset) with it.
func (im *importer) create(kind schema.Kind, parentID int64, parentName, name, key string, b *bodyState) (*bodyState, error) {
	var parent any
	if parentID != 0 {
		parent = parentID
	}
	display := schema.CollapseSpace(name)
	id := im.nextBody
	im.nextBody++
	if len(im.bodies) >= batchRows*bodyArgs {
		// A full batch of bodies: write it, then the states waiting for it.
		// (Before queueing the new one, so that its state_id can still be
		// set in its queued row.)
		if err := im.flushBodies(); err != nil {
			return nil, err
		}
		if err := im.flushStates(false); err != nil {
			return nil, err
		}
	}
	*b = bodyState{id: id, kind: kind, name: display, parent: parentName, isNew: true, loaded: true,
		queued: len(im.bodies) + bodyArgs, queuedGen: im.bodyGen, base: b.base[:0], cur: b.cur[:0]}
	im.bodies = append(im.bodies, id, string(kind), display, key, parent, im.rev, nil)
	im.res.NewBodies++
	if im.created != nil && kind != schema.KindMoon {
		im.created.add(hostHash(kind, key))
	}
	return b, nil
}

func (im *importer) planet(name, key string, star *bodyState) (*bodyState, error) {
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
	if !im.mayExist(schema.KindPlanet, key) {
		b, err := im.create(schema.KindPlanet, 0, "", name, key, &bodyState{})
		if err != nil {
			return nil, err
		}
		b = im.intern(b)
		im.anyPlanet[key] = b
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
		if b, err = im.create(schema.KindPlanet, 0, "", name, key, &bodyState{}); err != nil {
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
		id      int64
		name    string
		rev     int64 // the revision that created it
		row     int   // for a moon of a planet this import created: the row that named it
		stateID int64
		data    []byte // its current state
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
	// Moons this import gave the planet while it was cached are in
	// planet.moons (still queued, perhaps); the catalog holds the rest, so
	// there is no need to write the queue first.
	for _, n := range names {
		k := schema.NameKey(n)
		if k == "" {
			continue
		}
		keys = append(keys, k)
		if c, ok := planet.moons[k]; ok && !seen(c.id) {
			cands = append(cands, cand{id: c.id, name: c.name, rev: im.rev, row: c.row})
		}
		if planet.isNew {
			continue // nothing in the catalog can match under it
		}
		rows, err := im.matchMoon.QueryContext(im.ctx, planet.id, k)
		if err != nil {
			return nil, err
		}
		for rows.Next() {
			var c cand
			if err := rows.Scan(&c.id, &c.name, &c.rev, &c.stateID, &c.data); err != nil {
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
	m := &im.moonBody
	switch len(cands) {
	case 0:
		if _, err := im.create(schema.KindMoon, planet.id, planet.name, r.Name, keys[0], m); err != nil {
			return nil, err
		}
		// A second record naming it finds it by its created_rev.
	case 1:
		c := cands[0]
		// A moon this import created, or one it has seen, was named by an
		// earlier record: the row is known from planet.moons or seenRow,
		// unless it has been forgotten since.
		dup, row := c.rev == im.rev, c.row
		if !dup && im.seen.has(c.id) {
			dup, row = true, im.seenRow[c.id]
		}
		if dup {
			first := "an earlier row"
			if row > 0 {
				first = fmt.Sprintf("row %d", row)
			}
			return nil, fmt.Errorf("%w: moon %q of planet %q appears twice in one import (first at %s)", ErrDuplicate, c.name, planet.name, first)
		}
		im.seen.add(c.id)
		if len(im.seenRow) >= maxSeenRows {
			clear(im.seenRow)
		}
		im.seenRow[c.id] = r.Row
		*m = bodyState{id: c.id, kind: schema.KindMoon, name: c.name, parent: planet.name,
			base: m.base[:0], cur: m.cur[:0], baseID: c.stateID}
		if c.stateID != 0 {
			var err error
			if m.base, err = im.kc.decode(m.base, c.data, im.sources()); err != nil {
				return nil, fmt.Errorf("read the values of moon %q: %w", c.name, err)
			}
			m.cur = append(m.cur, m.base...)
		}
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
	if planet.moons == nil {
		planet.moons = map[string]moonName{}
	}
	planet.moons[mkey] = moonName{m.id, m.name, r.Row}
	for _, n := range names {
		k := schema.NameKey(n)
		if k == "" || k == mkey {
			continue
		}
		planet.moons[k] = moonName{m.id, m.name, r.Row}
		if err := im.flushBodies(); err != nil {
			return nil, err
		}
		res, err := im.insAlias.ExecContext(im.ctx, m.id, schema.CollapseSpace(n), k, im.rev)
		if err != nil {
			return nil, fmt.Errorf("record alias %q: %w", n, err)
		}
		if n, _ := res.RowsAffected(); n > 0 {
			im.res.NewAliases++
		}
	}
	m.dirty = false
	return m, nil
}

func quoteAll(ss []string) string {
	q := make([]string, len(ss))
	for i, s := range ss {
		q[i] = fmt.Sprintf("%q", s)
	}
	return strings.Join(q, ", ")
}

// setMoon applies one value to the record's moon. A moon appears once per
// request and a record gives each key once, so each value is counted here.
func (im *importer) setMoon(m *bodyState, c uint64, p schema.Param) {
	var old *schema.Param
	if j := find(m.base, c); j >= 0 {
		if sameValue(m.base[j].p, p) {
			im.res.Unchanged++
			return
		}
		o := m.base[j].p
		old = &o
		im.res.Changed++
	} else {
		im.res.Added++
	}
	if i := find(m.cur, c); i >= 0 {
		m.cur[i].p = p
	} else {
		m.cur = append(m.cur, entry{c, p})
	}
	im.addChange(m, old, p, im.nextSeq)
	im.nextSeq++
	m.dirty = true
}

// finishMoon queues the moon's new state, when its record changed it.
func (im *importer) finishMoon(m *bodyState) error {
	if !m.dirty {
		return nil
	}
	_, err := im.queueState(m)
	return err
}

// queueState queues a new state of b holding b.cur, superseding b.baseID,
// and makes it b's current state. It returns the new state's id.
func (im *importer) queueState(b *bodyState) (int64, error) {
	start := len(im.arena)
	im.arena, im.scratch = encodeEntries(im.arena, b.cur, im.scratch)
	return im.queueEncoded(b, im.arena[start:len(im.arena):len(im.arena)])
}

// queueEncoded is queueState for a state already encoded (data, which must
// stay unchanged until the queue is written).
func (im *importer) queueEncoded(b *bodyState, data []byte) (int64, error) {
	id := im.nextState
	im.nextState++
	var prev any
	if b.baseID != 0 {
		prev = b.baseID
		im.superseded = append(im.superseded, b.baseID)
	}
	im.states = append(im.states, id, b.id, im.rev, prev, data)
	if b.queued > 0 && b.queuedGen == im.bodyGen {
		im.bodies[b.queued-1] = id
	} else {
		im.current = append(im.current, b.id, id)
	}
	if len(im.states) >= 4*batchRows*stateArgs {
		if err := im.flushBodies(); err != nil {
			return 0, err
		}
		if err := im.flushStates(false); err != nil {
			return 0, err
		}
	}
	return id, nil
}

// loadHost reads a star's or planet's values: those it held before this
// import, and those this import gave it before it left the cache.
func (im *importer) loadHost(b *bodyState) error {
	b.loaded = true
	if b.isNew {
		return nil
	}
	// Nothing of b waits in the queues: a body this import created and
	// cached is new (and not loaded), and dropHosts writes everything
	// before a cached body can be read back.
	var stateID, setRev, prevID int64
	var data []byte
	if err := im.hostState.QueryRowContext(im.ctx, b.id).Scan(&stateID, &setRev, &prevID, &data); err != nil {
		return fmt.Errorf("read the values of %s %q: %w", b.kind, b.name, err)
	}
	var err error
	if stateID != 0 && setRev == im.rev {
		// Written by this import before the body left the cache.
		b.ownID = stateID
		if b.cur, err = im.kc.decode(nil, data, im.sources()); err != nil {
			return fmt.Errorf("read the values of %s %q: %w", b.kind, b.name, err)
		}
		b.baseID = prevID
		if prevID != 0 {
			if err := im.loadState.QueryRowContext(im.ctx, prevID).Scan(&data); err != nil {
				return fmt.Errorf("read the values of %s %q: %w", b.kind, b.name, err)
			}
			if b.base, err = im.kc.decode(nil, data, im.sources()); err != nil {
				return fmt.Errorf("read the values of %s %q: %w", b.kind, b.name, err)
			}
		}
	} else if stateID != 0 {
		b.baseID = stateID
		if b.base, err = im.kc.decode(nil, data, im.sources()); err != nil {
			return fmt.Errorf("read the values of %s %q: %w", b.kind, b.name, err)
		}
		b.cur = append([]entry(nil), b.base...)
	}
	s, wide, ok, err := im.takeSummary(b.id)
	if err != nil {
		return err
	}
	if ok {
		// Counted when it left the cache: count it again when it leaves
		// again, with what later records add. Its changes are listed
		// anew, in the order of this record.
		for c := uint64(0); c < 64; c++ {
			if s.given&(1<<c) != 0 {
				b.given = append(b.given, c)
			}
		}
		b.given = append(b.given, wide...)
		for range b.given {
			b.givenSeq = append(b.givenSeq, im.nextSeq)
			b.givenRow = append(b.givenRow, 0)
			im.nextSeq++
		}
		im.res.Added -= int(s.added)
		im.res.Changed -= int(s.changed)
		im.res.Unchanged -= int(s.unchanged)
		for i := range int(s.nChanges) {
			im.dead[int(s.firstChange)+i] = true
		}
	}
	return nil
}

// setHost applies one value to a star or planet. Its rows repeat on many
// records: the last value given wins, and a value given back as it was
// before this import keeps its original revision.
func (im *importer) setHost(b *bodyState, c uint64, p schema.Param, row int) error {
	if !b.loaded {
		if err := im.loadHost(b); err != nil {
			return err
		}
	}
	if gi := slices.Index(b.given, c); gi >= 0 {
		// Given by an earlier record: it must say the same. The first
		// record's source and status stand.
		have := b.cur[find(b.cur, c)].p
		if have.Value == p.Value && normUnc(have.Unc) == normUnc(p.Unc) {
			return nil
		}
		first := "an earlier row"
		if r := b.givenRow[gi]; r > 0 {
			first = fmt.Sprintf("row %d", r)
		}
		return fmt.Errorf("%w: %s %q has %s here but %s on %s; expected the same value on every row (or give it once)",
			ErrConflict, b.kind, b.name, describeValue(p), describeValue(have), first)
	}
	b.given = append(b.given, c)
	b.givenSeq = append(b.givenSeq, im.nextSeq)
	b.givenRow = append(b.givenRow, row)
	im.nextSeq++
	if j := find(b.base, c); j >= 0 && sameValue(b.base[j].p, p) {
		p = b.base[j].p
	}
	if i := find(b.cur, c); i >= 0 {
		b.cur[i].p = p
	} else {
		b.cur = append(b.cur, entry{c, p})
	}
	return nil
}

// describeValue writes a value and its uncertainty in SI units for an error
// message.
func describeValue(p schema.Param) string {
	unit := ""
	if info, ok := schema.LookupKey(p.Key); ok && info.Unit != "" {
		unit = " " + info.Unit
	}
	num := func(x float64) string { return strconv.FormatFloat(x, 'g', -1, 64) }
	u := p.Unc
	switch u.Kind {
	case schema.UncSymmetric:
		return fmt.Sprintf("%s ± %s%s", num(p.Value), num(u.Sigma), unit)
	case schema.UncAsymmetric:
		return fmt.Sprintf("%s +%s −%s%s", num(p.Value), num(u.Plus), num(u.Minus), unit)
	case schema.UncRange:
		return fmt.Sprintf("%s [%s, %s]%s", num(p.Value), num(u.Min), num(u.Max), unit)
	case schema.UncFactor:
		return fmt.Sprintf("%s ×/÷ %s%s", num(p.Value), num(u.Factor), unit)
	}
	return num(p.Value) + unit
}

// finishHost counts what the request did to a star or planet and writes its
// state. It returns the summary to keep if the body leaves the cache.
func (im *importer) finishHost(b *bodyState) (*hostSummary, error) {
	if !b.loaded || len(b.given) == 0 {
		return nil, nil
	}
	if len(b.given) > maxHostKeys {
		return nil, fmt.Errorf("%s %q: more than %d keys", b.kind, b.name, maxHostKeys)
	}
	s := &hostSummary{firstChange: -1}
	var added, changed, unchanged int
	for i, c := range b.given {
		if c < 64 {
			s.given |= 1 << c
		}
		p := b.cur[find(b.cur, c)].p
		j := find(b.base, c)
		var old *schema.Param
		switch {
		case j < 0:
			added++
		case sameValue(b.base[j].p, p):
			unchanged++
			continue
		default:
			changed++
			o := b.base[j].p
			old = &o
		}
		if k := im.addChange(b, old, p, b.givenSeq[i]); k >= 0 {
			if s.firstChange < 0 {
				s.firstChange = int32(k)
			}
			s.nChanges++
		}
	}
	s.added, s.changed, s.unchanged = uint8(added), uint8(changed), uint8(unchanged)
	im.res.Added += added
	im.res.Changed += changed
	im.res.Unchanged += unchanged
	switch {
	case changed+added > 0 && b.ownID != 0:
		if err := im.flushAll(); err != nil {
			return nil, err
		}
		data, scratch := encodeEntries(nil, b.cur, im.scratch)
		im.scratch = scratch
		if _, err := im.updState.ExecContext(im.ctx, data, b.ownID); err != nil {
			return nil, fmt.Errorf("store the values of %s %q: %w", b.kind, b.name, err)
		}
	case changed+added > 0:
		id, err := im.queueState(b)
		if err != nil {
			return nil, err
		}
		b.ownID = id
	}
	return s, nil
}

// dropHosts writes the cached stars' and planets' states and empties the
// caches; bodies read back from now on come from the transaction.
func (im *importer) dropHosts() error {
	if err := im.finishHosts(true); err != nil {
		return err
	}
	if err := im.flushAll(); err != nil {
		return err
	}
	clear(im.stars)
	clear(im.planets)
	clear(im.anyPlanet)
	clear(im.planetByID)
	im.cached = 0
	return nil
}

// finishHosts finishes every cached star and planet, keeping their
// summaries when they are about to leave the cache.
func (im *importer) finishHosts(keep bool) error {
	hosts := make([]*bodyState, 0, len(im.stars)+len(im.planetByID))
	for _, b := range im.stars {
		hosts = append(hosts, b)
	}
	for _, b := range im.planetByID {
		hosts = append(hosts, b)
	}
	// In id order, so that the states' ids do not depend on map order.
	sort.Slice(hosts, func(i, j int) bool { return hosts[i].id < hosts[j].id })
	for _, b := range hosts {
		s, err := im.finishHost(b)
		if err != nil {
			return err
		}
		if keep && s != nil {
			var wide []string
			for _, c := range b.given {
				if c >= 64 {
					wide = append(wide, strconv.FormatUint(c, 10))
				}
			}
			var w any
			if len(wide) > 0 {
				w = strings.Join(wide, " ")
			}
			im.summaries = append(im.summaries, b.id, int64(s.given), w, s.firstChange, s.nChanges, s.added, s.changed, s.unchanged)
		}
	}
	if keep {
		return im.flushSummaries()
	}
	return nil
}

// summaryTable is the temporary table of the summaries of stars and planets
// that left the cache; the import's connection drops it when done.
const summaryTable = "tidesift_import_host"

const summaryArgs = 8

const summaryRow = "(?, ?, ?, ?, ?, ?, ?, ?)"

// flushSummaries writes the queued summaries to the temporary table,
// creating it first when needed.
func (im *importer) flushSummaries() error {
	if len(im.summaries) == 0 {
		return nil
	}
	if !im.summaryReady {
		if _, err := im.tx.ExecContext(im.ctx, "CREATE TEMP TABLE IF NOT EXISTS "+summaryTable+
			" (body_id INTEGER PRIMARY KEY, given INTEGER NOT NULL, wide TEXT, first_change INTEGER NOT NULL,"+
			" n_changes INTEGER NOT NULL, added INTEGER NOT NULL, changed INTEGER NOT NULL, unchanged INTEGER NOT NULL)"); err != nil {
			return fmt.Errorf("create the table of cached bodies: %w", err)
		}
		for _, p := range []struct {
			dst **sql.Stmt
			sql string
		}{
			{&im.insSummary, "INSERT INTO temp." + summaryTable + " VALUES " + summaryRow},
			{&im.insSummaries, "INSERT INTO temp." + summaryTable + " VALUES " +
				strings.TrimSuffix(strings.Repeat(summaryRow+", ", batchRows), ", ")},
			{&im.getSummary, "SELECT given, ifnull(wide, ''), first_change, n_changes, added, changed, unchanged FROM temp." + summaryTable + " WHERE body_id = ?"},
			{&im.delSummary, "DELETE FROM temp." + summaryTable + " WHERE body_id = ?"},
		} {
			st, err := im.tx.PrepareContext(im.ctx, p.sql)
			if err != nil {
				return fmt.Errorf("prepare: %w", err)
			}
			*p.dst = st
			im.stmts = append(im.stmts, st)
		}
		im.summaryReady = true
	}
	rows := im.summaries
	for ; len(rows) >= batchRows*summaryArgs; rows = rows[batchRows*summaryArgs:] {
		if _, err := im.insSummaries.ExecContext(im.ctx, rows[:batchRows*summaryArgs]...); err != nil {
			return fmt.Errorf("store cached bodies' summaries: %w", err)
		}
	}
	for ; len(rows) > 0; rows = rows[summaryArgs:] {
		if _, err := im.insSummary.ExecContext(im.ctx, rows[:summaryArgs]...); err != nil {
			return fmt.Errorf("store a cached body's summary: %w", err)
		}
	}
	clear(im.summaries)
	im.summaries = im.summaries[:0]
	return nil
}

// takeSummary reads and removes the summary of a body that left the cache
// (ok false when it has none).
func (im *importer) takeSummary(id int64) (s hostSummary, wide []uint64, ok bool, err error) {
	if !im.summaryReady {
		return s, nil, false, nil
	}
	var given int64
	var w string
	err = im.getSummary.QueryRowContext(im.ctx, id).Scan(&given, &w, &s.firstChange, &s.nChanges, &s.added, &s.changed, &s.unchanged)
	if errors.Is(err, sql.ErrNoRows) {
		return s, nil, false, nil
	}
	if err != nil {
		return s, nil, false, fmt.Errorf("read a cached body's summary: %w", err)
	}
	s.given = uint64(given)
	for _, f := range strings.Fields(w) {
		c, err := strconv.ParseUint(f, 10, 64)
		if err != nil {
			return s, nil, false, fmt.Errorf("read a cached body's summary: key code %q: %w", f, err)
		}
		wide = append(wide, c)
	}
	if _, err := im.delSummary.ExecContext(im.ctx, id); err != nil {
		return s, nil, false, fmt.Errorf("remove a cached body's summary: %w", err)
	}
	return s, wide, true, nil
}

// flushBodies writes the queued bodies: the states, aliases and children
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
	im.bodyGen++
	return nil
}

// flushStates writes the queued states in full batches, and with all the
// rest too, then marks the states they replace superseded and makes them
// their bodies' current ones. Their bodies must have been written.
func (im *importer) flushStates(all bool) error {
	rows := im.states
	for len(rows) >= batchRows*stateArgs {
		if _, err := im.insStateBatch.ExecContext(im.ctx, rows[:batchRows*stateArgs]...); err != nil {
			return fmt.Errorf("store values: %w", err)
		}
		rows = rows[batchRows*stateArgs:]
	}
	if all {
		for ; len(rows) > 0; rows = rows[stateArgs:] {
			if _, err := im.insState.ExecContext(im.ctx, rows[:stateArgs]...); err != nil {
				return fmt.Errorf("store values: %w", err)
			}
		}
	}
	n := copy(im.states, rows)
	clear(im.states[n:])
	im.states = im.states[:n]
	if n == 0 {
		im.arena = im.arena[:0] // every queued encoding is written
	}
	if err := im.flushSuperseded(); err != nil {
		return err
	}
	return im.flushCurrent()
}

// flushSuperseded marks the queued states superseded, batchRows at a time.
func (im *importer) flushSuperseded() error {
	ids := im.superseded
	args := make([]any, 0, batchRows+1)
	for len(ids) >= batchRows {
		args = append(args[:0], im.rev)
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

// flushCurrent points existing bodies at their new states.
func (im *importer) flushCurrent() error {
	pairs := im.current
	args := make([]any, 0, 2*batchRows)
	for len(pairs) >= 2*batchRows {
		args = args[:0]
		for _, x := range pairs[:2*batchRows] {
			args = append(args, x)
		}
		if _, err := im.setCurrentBatch.ExecContext(im.ctx, args...); err != nil {
			return fmt.Errorf("store current values: %w", err)
		}
		pairs = pairs[2*batchRows:]
	}
	for ; len(pairs) > 0; pairs = pairs[2:] {
		if _, err := im.setCurrent.ExecContext(im.ctx, pairs[0], pairs[1]); err != nil {
			return fmt.Errorf("store current values: %w", err)
		}
	}
	im.current = im.current[:0]
	return nil
}

// flushAll writes everything queued: before a statement that reads or
// changes states by id.
func (im *importer) flushAll() error {
	if err := im.flushBodies(); err != nil {
		return err
	}
	return im.flushStates(true)
}

// flush writes what is left at the end: the cached stars' and planets'
// states, then every queued row.
func (im *importer) flush() error {
	if err := im.finishHosts(false); err != nil {
		return err
	}
	return im.flushAll()
}

// addChange records a change at request order seq and returns its index in
// Changes (-1 when changes are omitted).
func (im *importer) addChange(b *bodyState, old *schema.Param, p schema.Param, seq int) int {
	if im.omit || (old == nil && im.omitAdded) || (im.maxChanges > 0 && len(im.res.Changes) >= im.maxChanges) {
		return -1
	}
	np := p
	im.res.Changes = append(im.res.Changes, ValueChange{Kind: b.kind, Body: b.name, Parent: b.parent, Key: p.Key, Old: old, New: &np})
	im.seq = append(im.seq, seq)
	return len(im.res.Changes) - 1
}
