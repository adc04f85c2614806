package store

import (
	"context"
	"database/sql"
	"fmt"
	"strings"
	"time"

	"tidesift/schema"
)

// Problem is one thing wrong with a catalog, found by Check.
type Problem struct {
	Kind     schema.Kind // the body's kind, when the problem concerns a body
	Body     string      // body name (or "#id" when the body row is missing)
	Parent   string      // planet of a moon, star of a planet
	Key      string      // parameter key, when it concerns a value
	Revision int64       // the revision concerned, 0 if none
	What     string      // what is wrong, and what was expected
}

// String renders the problem on one line, e.g.
// `moon Aster (Test Giant) eccentricity, revision 2: value outside its physical domain: …`.
func (p Problem) String() string {
	var b strings.Builder
	if p.Body != "" {
		if p.Kind != "" {
			b.WriteString(string(p.Kind) + " ")
		}
		b.WriteString(p.Body)
		if p.Parent != "" {
			b.WriteString(" (" + p.Parent + ")")
		}
	}
	if p.Key != "" {
		if b.Len() > 0 {
			b.WriteString(" ")
		}
		b.WriteString(p.Key)
	}
	if p.Revision != 0 {
		if b.Len() > 0 {
			b.WriteString(", ")
		}
		fmt.Fprintf(&b, "revision %d", p.Revision)
	}
	if b.Len() > 0 {
		b.WriteString(": ")
	}
	b.WriteString(p.What)
	return b.String()
}

// CheckReport is the outcome of Check: what was examined and every problem found.
type CheckReport struct {
	Revisions int // revision rows examined
	Bodies    int // body rows examined
	Values    int // value rows examined, current and superseded
	Problems  []Problem
}

// OK reports whether the check found nothing wrong.
func (r *CheckReport) OK() bool { return len(r.Problems) == 0 }

// String lists the problems one per line, or says the catalog is sound.
func (r *CheckReport) String() string {
	if r.OK() {
		return fmt.Sprintf("catalog ok: %d revisions, %d bodies, %d values checked", r.Revisions, r.Bodies, r.Values)
	}
	lines := []string{fmt.Sprintf("catalog has %d problems (%d revisions, %d bodies, %d values checked):",
		len(r.Problems), r.Revisions, r.Bodies, r.Values)}
	for _, p := range r.Problems {
		lines = append(lines, "  "+p.String())
	}
	return strings.Join(lines, "\n")
}

// maxIntegrityRows bounds what Check copies from PRAGMA integrity_check.
const maxIntegrityRows = 100

// Check examines the whole catalog: SQLite's integrity_check and
// foreign_key_check; every stored value (current and superseded) against its
// key's physical domain and the form of its uncertainty (schema.CheckParam);
// rows that refer to missing bodies or revisions; the order of revisions
// (values superseded no later than they were set, bodies used before they
// were created, times going backwards); and whether each revision holds as
// many values as it says it changed, which is how a half-written revision
// would show. The error is for failing to run the check; what the check
// finds is in the report.
func (s *Store) Check(ctx context.Context) (*CheckReport, error) {
	var rep *CheckReport
	err := s.readTx(ctx, func(q queryer) error {
		rep = &CheckReport{}
		return check(ctx, q, rep)
	})
	if err != nil {
		return nil, fmt.Errorf("check catalog: %w", err)
	}
	return rep, nil
}

func check(ctx context.Context, q queryer, rep *CheckReport) error {
	add := func(p Problem) { rep.Problems = append(rep.Problems, p) }

	// SQLite's own checks.
	if err := eachRow(ctx, q, fmt.Sprintf("PRAGMA integrity_check(%d)", maxIntegrityRows), func(r *sql.Rows) error {
		var msg string
		if err := r.Scan(&msg); err != nil {
			return err
		}
		if msg != "ok" {
			add(Problem{What: "integrity check: " + msg})
		}
		return nil
	}); err != nil {
		return err
	}
	if err := eachRow(ctx, q, "PRAGMA foreign_key_check", func(r *sql.Rows) error {
		var table, parent string
		var rowid sql.NullInt64
		var fk int
		if err := r.Scan(&table, &rowid, &parent, &fk); err != nil {
			return err
		}
		add(Problem{What: fmt.Sprintf("foreign key check: %s row %d refers to a missing %s row", table, rowid.Int64, parent)})
		return nil
	}); err != nil {
		return err
	}

	nSQL := len(rep.Problems)

	// Bodies.
	type bodyInfo struct {
		kind         schema.Kind
		name, parent string
	}
	bodies := map[int64]bodyInfo{}
	if err := eachRow(ctx, q, `SELECT b.id, b.kind, b.name, b.name_key, ifnull(b.parent_id, 0), b.created_rev,
			ifnull(p.kind, ''), ifnull(p.name, ''), ifnull(p.created_rev, 0), r.id IS NOT NULL
		FROM body b LEFT JOIN body p ON p.id = b.parent_id LEFT JOIN revision r ON r.id = b.created_rev`, func(r *sql.Rows) error {
		var (
			id, parentID, created, parentCreated int64
			kind, name, key, pkind, pname        string
			revOK                                bool
		)
		if err := r.Scan(&id, &kind, &name, &key, &parentID, &created, &pkind, &pname, &parentCreated, &revOK); err != nil {
			return err
		}
		rep.Bodies++
		bodies[id] = bodyInfo{schema.Kind(kind), name, pname}
		pr := Problem{Kind: schema.Kind(kind), Body: name, Parent: pname, Revision: created}
		if !revOK {
			pr.What = "created by a revision that does not exist"
			add(pr)
		}
		if key != schema.NameKey(name) {
			pr.What = fmt.Sprintf("stored name key %q, expected %q", key, schema.NameKey(name))
			add(pr)
		}
		switch {
		case parentID != 0 && pkind == "":
			pr.What = fmt.Sprintf("its parent (body %d) does not exist", parentID)
			add(pr)
		case kind == string(schema.KindMoon) && pkind != "" && pkind != string(schema.KindPlanet),
			kind == string(schema.KindPlanet) && pkind != "" && pkind != string(schema.KindStar):
			pr.What = fmt.Sprintf("its parent %s is a %s", pname, pkind)
			add(pr)
		case parentID != 0 && parentCreated > created:
			pr.What = fmt.Sprintf("created before its parent (revision %d)", parentCreated)
			add(pr)
		}
		return nil
	}); err != nil {
		return err
	}
	if err := eachRow(ctx, q, `SELECT a.body_id, a.name, a.rev, ifnull(b.kind, ''), r.id IS NOT NULL
		FROM alias a LEFT JOIN body b ON b.id = a.body_id LEFT JOIN revision r ON r.id = a.rev`, func(r *sql.Rows) error {
		var id, rev int64
		var name, kind string
		var revOK bool
		if err := r.Scan(&id, &name, &rev, &kind, &revOK); err != nil {
			return err
		}
		b, ok := bodies[id]
		pr := Problem{Kind: b.kind, Body: b.name, Parent: b.parent, Revision: rev}
		switch {
		case !ok:
			pr.Body = fmt.Sprintf("#%d", id)
			pr.What = fmt.Sprintf("alias %q of a body that does not exist", name)
			add(pr)
		case kind != string(schema.KindMoon):
			pr.What = fmt.Sprintf("alias %q on a %s; only moons have aliases", name, kind)
			add(pr)
		}
		if !revOK {
			pr.What = fmt.Sprintf("alias %q added by a revision that does not exist", name)
			add(pr)
		}
		return nil
	}); err != nil {
		return err
	}

	// States and their values. Problems of revisions (which need the
	// values each holds) are reported before those of bodies and values.
	kc, err := loadKeyCodes(ctx, q)
	if err != nil {
		return err
	}
	held := map[int64]int{} // values set per revision
	var later []Problem
	addLater := func(p Problem) { later = append(later, p) }
	revExists := map[int64]bool{}
	if err := eachRow(ctx, q, "SELECT id FROM revision", func(r *sql.Rows) error {
		var id int64
		if err := r.Scan(&id); err != nil {
			return err
		}
		revExists[id] = true
		return nil
	}); err != nil {
		return err
	}
	in := interner{}
	var vals []entry
	if err := eachRow(ctx, q, `SELECT s.id, s.body_id, s.set_rev, ifnull(s.superseded_rev, 0), ifnull(b.created_rev, 0), s.data
		FROM state s LEFT JOIN body b ON b.id = s.body_id`, func(r *sql.Rows) error {
		var id, body, set, sup, created int64
		var data sql.RawBytes
		if err := r.Scan(&id, &body, &set, &sup, &created, &data); err != nil {
			return err
		}
		b, ok := bodies[body]
		base := Problem{Kind: b.kind, Body: b.name, Parent: b.parent, Revision: set}
		if !ok {
			base.Body = fmt.Sprintf("#%d", body)
			pr := base
			pr.What = "values of a body that does not exist"
			addLater(pr)
		}
		var err error
		if vals, err = kc.decode(vals[:0], data, in); err != nil {
			pr := base
			pr.What = fmt.Sprintf("state %d: %v", id, err)
			addLater(pr)
		}
		if sup != 0 && sup <= set {
			pr := base
			pr.What = fmt.Sprintf("superseded by revision %d, not after the revision that set it", sup)
			addLater(pr)
		}
		if sup != 0 && !revExists[sup] {
			pr := base
			pr.What = fmt.Sprintf("superseded by revision %d, which does not exist", sup)
			addLater(pr)
		}
		for _, e := range vals {
			p := e.p
			if p.Revision == set {
				held[set]++
				rep.Values++
			}
			pr := base
			pr.Key, pr.Revision = p.Key, p.Revision
			if err := schema.CheckParam(p); err != nil {
				pr.What = err.Error()
				addLater(pr)
			}
			if info, known := schema.LookupKey(p.Key); !known {
				pr.What = fmt.Sprintf("%v %q", schema.ErrUnknownKey, p.Key)
				addLater(pr)
			} else if ok && info.Body != b.kind {
				pr.What = fmt.Sprintf("a %s value stored on a %s", info.Body, b.kind)
				addLater(pr)
			}
			if p.Revision > set {
				pr.What = fmt.Sprintf("set by revision %d, after the state that holds it (revision %d)", p.Revision, set)
				addLater(pr)
			}
			if ok && created > p.Revision {
				pr.What = fmt.Sprintf("set before its body was created (revision %d)", created)
				addLater(pr)
			}
		}
		return nil
	}); err != nil {
		return err
	}
	// The links between bodies and states: each body's current state is
	// its own and current, no other state of it is current, and each
	// state's predecessor is the body's state it superseded.
	links := []struct{ query, what string }{
		{`SELECT b.id FROM body b LEFT JOIN state s ON s.id = b.state_id
			WHERE b.state_id IS NOT NULL AND (s.id IS NULL OR s.body_id <> b.id OR s.superseded_rev IS NOT NULL)`,
			"its current values point at a missing, superseded or foreign state"},
		{`SELECT s.body_id FROM state s JOIN body b ON b.id = s.body_id
			WHERE s.superseded_rev IS NULL AND b.state_id IS NOT s.id`,
			"holds two sets of current values"},
		{`SELECT s.body_id FROM state s LEFT JOIN state p ON p.id = s.prev_id
			WHERE s.prev_id IS NOT NULL AND (p.id IS NULL OR p.body_id <> s.body_id OR p.superseded_rev IS NOT s.set_rev)`,
			"its history is broken: a state's predecessor is missing or was not superseded by it"},
	}
	for _, l := range links {
		if err := eachRow(ctx, q, l.query, func(r *sql.Rows) error {
			var id int64
			if err := r.Scan(&id); err != nil {
				return err
			}
			b, ok := bodies[id]
			pr := Problem{Kind: b.kind, Body: b.name, Parent: b.parent, What: l.what}
			if !ok {
				pr.Body = fmt.Sprintf("#%d", id)
			}
			addLater(pr)
			return nil
		}); err != nil {
			return err
		}
	}
	// Revisions: times in order, and the number of values each holds.
	bodyProblems := rep.Problems[nSQL:]
	rep.Problems = append([]Problem(nil), rep.Problems[:nSQL]...)
	// Revisions: times in order, and the number of values each holds.
	made := map[int64]bool{} // revisions that created a body or alias
	if err := eachRow(ctx, q, "SELECT created_rev FROM body UNION SELECT rev FROM alias", func(r *sql.Rows) error {
		var rev int64
		if err := r.Scan(&rev); err != nil {
			return err
		}
		made[rev] = true
		return nil
	}); err != nil {
		return err
	}
	revs := map[int64]bool{}
	var lastTime time.Time
	var lastID int64
	if err := eachRow(ctx, q, "SELECT "+revisionColumns+" FROM revision ORDER BY id", func(r *sql.Rows) error {
		rev, err := scanRevision(r)
		rep.Revisions++
		if err != nil {
			add(Problem{What: err.Error()})
			return nil
		}
		revs[rev.ID] = true
		if lastID != 0 && rev.Time.Before(lastTime) {
			add(Problem{Revision: rev.ID, What: fmt.Sprintf("recorded at %s, before revision %d (%s): revision times must not go backwards",
				rev.Time.Format(time.RFC3339), lastID, lastTime.Format(time.RFC3339))})
		}
		lastTime, lastID = rev.Time, rev.ID
		if n := held[rev.ID]; n != rev.Changes {
			add(Problem{Revision: rev.ID, What: fmt.Sprintf("says it changed %d values but holds %d: the revision is incomplete or altered", rev.Changes, n)})
		}
		if rev.Changes == 0 && !made[rev.ID] {
			add(Problem{Revision: rev.ID, What: "changed nothing: an empty revision"})
		}
		return nil
	}); err != nil {
		return err
	}
	for rev := range held {
		if !revs[rev] {
			add(Problem{Revision: rev, What: fmt.Sprintf("%d values were set by this revision, which does not exist", held[rev])})
		}
	}

	rep.Problems = append(rep.Problems, bodyProblems...)
	rep.Problems = append(rep.Problems, later...)
	return nil
}

func prefixed(prefix, cols string) string {
	parts := strings.Split(cols, ", ")
	for i := range parts {
		parts[i] = prefix + parts[i]
	}
	return strings.Join(parts, ", ")
}

func eachRow(ctx context.Context, q queryer, query string, f func(*sql.Rows) error) error {
	rows, err := q.QueryContext(ctx, query)
	if err != nil {
		return err
	}
	defer rows.Close()
	for rows.Next() {
		if err := f(rows); err != nil {
			return err
		}
	}
	return rows.Err()
}
