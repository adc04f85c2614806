package store

import (
	"context"
	"crypto/sha256"
	"database/sql"
	"encoding/hex"
	"errors"
	"fmt"
	"hash"
	"slices"
	"sort"
	"strconv"
	"strings"
	"time"

	"tidesift/schema"
)

const revisionColumns = "id, time, file, sha256, note, changes"

func scanRevision(sc scanner) (schema.Revision, error) {
	var r schema.Revision
	var t string
	if err := sc.Scan(&r.ID, &t, &r.File, &r.SHA256, &r.Note, &r.Changes); err != nil {
		return r, err
	}
	tm, err := time.Parse(time.RFC3339Nano, t)
	if err != nil {
		return r, fmt.Errorf("revision %d: stored time %q: %w", r.ID, t, err)
	}
	r.Time = tm
	return r, nil
}

// Revisions lists every revision, oldest first.
func (s *Store) Revisions(ctx context.Context) ([]schema.Revision, error) {
	var out []schema.Revision
	err := s.readTx(ctx, func(q queryer) error {
		out = out[:0]
		rows, err := q.QueryContext(ctx, "SELECT "+revisionColumns+" FROM revision ORDER BY id")
		if err != nil {
			return err
		}
		defer rows.Close()
		for rows.Next() {
			r, err := scanRevision(rows)
			if err != nil {
				return err
			}
			out = append(out, r)
		}
		return rows.Err()
	})
	if err != nil {
		return nil, fmt.Errorf("list revisions: %w", err)
	}
	return out, nil
}

// resolveRevision returns revision rev, or the latest for 0 (a zero Revision
// when the catalog has none). An unknown revision is an error naming the
// valid range.
func resolveRevision(ctx context.Context, q queryer, rev int64) (schema.Revision, error) {
	if rev == 0 {
		r, err := scanRevision(q.QueryRowContext(ctx, "SELECT "+revisionColumns+" FROM revision ORDER BY id DESC LIMIT 1"))
		if errors.Is(err, sql.ErrNoRows) {
			return schema.Revision{}, nil
		}
		return r, err
	}
	r, err := scanRevision(q.QueryRowContext(ctx, "SELECT "+revisionColumns+" FROM revision WHERE id = ?", rev))
	if !errors.Is(err, sql.ErrNoRows) {
		return r, err
	}
	var lo, hi sql.NullInt64
	if err := q.QueryRowContext(ctx, "SELECT min(id), max(id) FROM revision").Scan(&lo, &hi); err != nil {
		return r, err
	}
	if !hi.Valid {
		return r, fmt.Errorf("%w: revision %d: the catalog has no revisions yet", ErrNotFound, rev)
	}
	return r, fmt.Errorf("%w: revision %d: valid revisions are %d to %d (0 means the latest)", ErrNotFound, rev, lo.Int64, hi.Int64)
}

// Snapshot reads the catalog as it was at revision rev (0: the latest). The
// snapshot is read in one transaction, so a concurrent import is either wholly
// in it or not at all. Stars are sorted by name, planets by (name, star) and
// moons by (planet, name, star), comparing schema.NameKey forms.
func (s *Store) Snapshot(ctx context.Context, rev int64) (*schema.Catalog, error) {
	var cat *schema.Catalog
	err := s.readTx(ctx, func(q queryer) error {
		var err error
		cat, err = snapshot(ctx, q, rev)
		return err
	})
	if err != nil {
		return nil, fmt.Errorf("snapshot: %w", err)
	}
	return cat, nil
}

// snapBody is a body with the keys it sorts by.
type snapBody struct {
	b              *schema.Body
	parentID       int64
	key, parentKey string
	grandKey       string // star of a moon's planet
	grand          string
}

func snapshot(ctx context.Context, q queryer, rev int64) (*schema.Catalog, error) {
	r, err := resolveRevision(ctx, q, rev)
	if err != nil {
		return nil, err
	}
	bodies, err := loadBodies(ctx, q, r.ID)
	if err != nil {
		return nil, err
	}
	// Aliases and values.
	rows, err := q.QueryContext(ctx, "SELECT body_id, name FROM alias WHERE rev <= ? ORDER BY body_id, name_key", r.ID)
	if err != nil {
		return nil, err
	}
	for rows.Next() {
		var id int64
		var name string
		if err := rows.Scan(&id, &name); err != nil {
			rows.Close()
			return nil, err
		}
		if sb := bodies[id]; sb != nil {
			sb.b.Aliases = append(sb.b.Aliases, name)
		}
	}
	rows.Close()
	if err := rows.Err(); err != nil {
		return nil, err
	}
	if err := eachValueAt(ctx, q, r.ID, func(id int64, p schema.Param) {
		if sb := bodies[id]; sb != nil {
			sb.b.Params[p.Key] = p
		}
	}); err != nil {
		return nil, err
	}
	cat := assemble(r, bodies)
	cat.ContentHash = contentHash(cat, bodies)
	return cat, nil
}

// assemble builds a catalog of the loaded bodies, in the snapshot's order.
func assemble(r schema.Revision, bodies map[int64]*snapBody) *schema.Catalog {
	cat := &schema.Catalog{Revision: r, Stars: []schema.Body{}, Planets: []schema.Body{}, Moons: []schema.Body{}}
	for _, kind := range []schema.Kind{schema.KindStar, schema.KindPlanet, schema.KindMoon} {
		list := sortedBodies(bodies, kind)
		for _, sb := range list {
			switch kind {
			case schema.KindStar:
				cat.Stars = append(cat.Stars, *sb.b)
			case schema.KindPlanet:
				cat.Planets = append(cat.Planets, *sb.b)
			default:
				cat.Moons = append(cat.Moons, *sb.b)
			}
		}
	}
	return cat
}

// SnapshotOf is Snapshot cut down to the moons that name (or one of their
// aliases) matches, as of revision rev, with their planets and stars: what a
// command about one moon needs, read in time that does not grow with the
// catalog. The moons of every planet that match are included, so that the
// caller can resolve an ambiguous name as it would in the whole snapshot.
// ContentHash is left empty: it describes whole catalogs only.
func (s *Store) SnapshotOf(ctx context.Context, rev int64, name string) (*schema.Catalog, error) {
	var cat *schema.Catalog
	err := s.readTx(ctx, func(q queryer) error {
		r, err := resolveRevision(ctx, q, rev)
		if err != nil {
			return err
		}
		key := schema.NameKey(name)
		bodies := map[int64]*snapBody{}
		var order []int64
		load := func(query string, args ...any) error {
			rows, err := q.QueryContext(ctx, query, args...)
			if err != nil {
				return err
			}
			defer rows.Close()
			for rows.Next() {
				b := &schema.Body{Params: map[string]schema.Param{}}
				sb := &snapBody{b: b}
				var kind string
				if err := rows.Scan(&b.ID, &kind, &b.Name, &sb.parentID); err != nil {
					return err
				}
				if bodies[b.ID] == nil {
					b.Kind = schema.Kind(kind)
					sb.key = schema.NameKey(b.Name)
					bodies[b.ID] = sb
					order = append(order, b.ID)
				}
			}
			return rows.Err()
		}
		const cols = "SELECT b.id, b.kind, b.name, ifnull(b.parent_id, 0) FROM body b "
		if err := load(cols+`WHERE b.name_key = ?1 AND b.kind = 'moon' AND b.created_rev <= ?2
			UNION ALL `+cols+`JOIN alias a ON a.body_id = b.id
			WHERE a.name_key = ?1 AND a.rev <= ?2 AND b.kind = 'moon' AND b.created_rev <= ?2`, key, r.ID); err != nil {
			return err
		}
		// Their planets, then the planets' stars.
		for range 2 {
			for _, id := range slices.Clone(order) {
				if p := bodies[id].parentID; p != 0 && bodies[p] == nil {
					if err := load(cols+"WHERE b.id = ? AND b.created_rev <= ?", p, r.ID); err != nil {
						return err
					}
				}
			}
		}
		for _, sb := range bodies {
			if p := bodies[sb.parentID]; p != nil {
				sb.b.Parent, sb.parentKey = p.b.Name, p.key
				if g := bodies[p.parentID]; g != nil {
					sb.grand, sb.grandKey = g.b.Name, g.key
				}
			}
		}
		kc, err := loadKeyCodes(ctx, q)
		if err != nil {
			return err
		}
		in := interner{}
		for _, id := range order {
			sb := bodies[id]
			if sb.b.Kind == schema.KindMoon {
				rows, err := q.QueryContext(ctx, "SELECT name FROM alias WHERE body_id = ? AND rev <= ? ORDER BY name_key", id, r.ID)
				if err != nil {
					return err
				}
				for rows.Next() {
					var a string
					if err := rows.Scan(&a); err != nil {
						rows.Close()
						return err
					}
					sb.b.Aliases = append(sb.b.Aliases, a)
				}
				rows.Close()
				if err := rows.Err(); err != nil {
					return err
				}
			}
			vals, err := valuesAt(ctx, q, kc, in, id, r.ID)
			if err != nil {
				return err
			}
			for _, e := range vals {
				sb.b.Params[e.p.Key] = e.p
			}
		}
		cat = assemble(r, bodies)
		return nil
	})
	if err != nil {
		return nil, fmt.Errorf("snapshot of %s: %w", name, err)
	}
	return cat, nil
}

// valuesAt returns a body's values as of revision rev, walking its chain of
// states back from the current one.
func valuesAt(ctx context.Context, q queryer, kc *keyCodes, in interner, body, rev int64) ([]entry, error) {
	var next sql.NullInt64
	if err := q.QueryRowContext(ctx, "SELECT state_id FROM body WHERE id = ?", body).Scan(&next); err != nil {
		return nil, err
	}
	for steps := 0; next.Valid && next.Int64 != 0; steps++ {
		if steps > 1<<20 {
			return nil, fmt.Errorf("body %d: its states form a loop", body)
		}
		var set int64
		var data []byte
		id := next.Int64
		if err := q.QueryRowContext(ctx, "SELECT set_rev, prev_id, data FROM state WHERE id = ?", id).Scan(&set, &next, &data); err != nil {
			return nil, fmt.Errorf("body %d, state %d: %w", body, id, err)
		}
		if set <= rev {
			vals, err := kc.decode(nil, data, in)
			if err != nil {
				return nil, fmt.Errorf("body %d, state %d: %w", body, id, err)
			}
			return vals, nil
		}
	}
	return nil, nil // no values yet at rev
}

// loadBodies reads the bodies that existed at revision rev, with their
// parents' names filled in.
func loadBodies(ctx context.Context, q queryer, rev int64) (map[int64]*snapBody, error) {
	rows, err := q.QueryContext(ctx, "SELECT id, kind, name, ifnull(parent_id, 0) FROM body WHERE created_rev <= ?", rev)
	if err != nil {
		return nil, err
	}
	defer rows.Close()
	bodies := map[int64]*snapBody{}
	for rows.Next() {
		b := &schema.Body{Params: map[string]schema.Param{}}
		sb := &snapBody{b: b}
		var kind string
		if err := rows.Scan(&b.ID, &kind, &b.Name, &sb.parentID); err != nil {
			return nil, err
		}
		b.Kind = schema.Kind(kind)
		sb.key = schema.NameKey(b.Name)
		bodies[b.ID] = sb
	}
	if err := rows.Err(); err != nil {
		return nil, err
	}
	for _, sb := range bodies {
		if p := bodies[sb.parentID]; p != nil {
			sb.b.Parent = p.b.Name
			sb.parentKey = p.key
			if g := bodies[p.parentID]; g != nil {
				sb.grand, sb.grandKey = g.b.Name, g.key
			}
		}
	}
	return bodies, nil
}

// eachValueAt calls f for every value current at revision rev, without
// holding them all.
func eachValueAt(ctx context.Context, q queryer, rev int64, f func(bodyID int64, p schema.Param)) error {
	kc, err := loadKeyCodes(ctx, q)
	if err != nil {
		return err
	}
	rows, err := q.QueryContext(ctx, "SELECT body_id, data FROM state WHERE set_rev <= ?1 AND (superseded_rev IS NULL OR superseded_rev > ?1)", rev)
	if err != nil {
		return err
	}
	defer rows.Close()
	var (
		id   int64
		data sql.RawBytes
		buf  []entry
	)
	in := interner{}
	for rows.Next() {
		if err := rows.Scan(&id, &data); err != nil {
			return err
		}
		if buf, err = kc.decode(buf[:0], data, in); err != nil {
			return fmt.Errorf("values of body %d: %w", id, err)
		}
		for _, e := range buf {
			f(id, e.p)
		}
	}
	return rows.Err()
}

func sortedBodies(bodies map[int64]*snapBody, kind schema.Kind) []*snapBody {
	var list []*snapBody
	for _, sb := range bodies {
		if sb.b.Kind == kind {
			list = append(list, sb)
		}
	}
	sort.Slice(list, func(i, j int) bool {
		a, b := list[i], list[j]
		if kind == schema.KindMoon {
			if a.parentKey != b.parentKey {
				return a.parentKey < b.parentKey
			}
			if a.key != b.key {
				return a.key < b.key
			}
			if a.grandKey != b.grandKey {
				return a.grandKey < b.grandKey
			}
			return a.b.ID < b.b.ID
		}
		if a.key != b.key {
			return a.key < b.key
		}
		if a.parentKey != b.parentKey {
			return a.parentKey < b.parentKey
		}
		return a.b.ID < b.b.ID
	})
	return list
}

// contentHash is the hex SHA-256 of a canonical serialisation of the
// snapshot: every body (kind, name, parent, grandparent, aliases) and every
// value (key, value, uncertainty, source, status), in the snapshot's order.
// Revision ids, times and row ids are left out, so two catalogs holding the
// same content hash the same however they were built. Strings are
// length-prefixed and floats written in their shortest exact form, so the
// serialisation is unambiguous.
func contentHash(cat *schema.Catalog, bodies map[int64]*snapBody) string {
	c := &canon{h: sha256.New()}
	c.str("tidesift catalog content v1")
	for _, list := range [][]schema.Body{cat.Stars, cat.Planets, cat.Moons} {
		for i := range list {
			c.body(&list[i], bodies[list[i].ID])
		}
	}
	c.flush()
	return hex.EncodeToString(c.h.Sum(nil))
}

// canon writes contentHash's serialisation through a buffer (a million
// bodies make tens of millions of small writes).
type canon struct {
	h   hash.Hash
	buf []byte
}

func (c *canon) flush() {
	c.h.Write(c.buf)
	c.buf = c.buf[:0]
}

// str writes a length-prefixed string: "len:s;".
func (c *canon) str(s string) {
	c.buf = strconv.AppendInt(c.buf, int64(len(s)), 10)
	c.buf = append(c.buf, ':')
	c.buf = append(c.buf, s...)
	c.buf = append(c.buf, ';')
	if len(c.buf) > 32<<10 {
		c.flush()
	}
}

// num writes a float in its shortest exact form: "x;".
func (c *canon) num(x float64) {
	c.buf = strconv.AppendFloat(c.buf, x, 'g', -1, 64)
	c.buf = append(c.buf, ';')
}

// count writes "label n;".
func (c *canon) count(label string, n int) {
	c.buf = append(c.buf, label...)
	c.buf = append(c.buf, ' ')
	c.buf = strconv.AppendInt(c.buf, int64(n), 10)
	c.buf = append(c.buf, ';')
}

func (c *canon) body(b *schema.Body, sb *snapBody) {
	c.str("body")
	c.str(string(b.Kind))
	c.str(b.Name)
	c.str(b.Parent)
	if sb != nil {
		c.str(sb.grand)
	}
	aliases := append([]string(nil), b.Aliases...)
	sort.Strings(aliases)
	c.count("aliases", len(aliases))
	for _, a := range aliases {
		c.str(a)
	}
	keys := make([]string, 0, len(b.Params))
	for k := range b.Params {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	c.count("params", len(keys))
	for _, k := range keys {
		p := b.Params[k]
		c.str(k)
		c.num(p.Value)
		u := normUnc(p.Unc)
		c.str(u.Kind.String())
		for _, x := range [...]float64{u.Sigma, u.Plus, u.Minus, u.Min, u.Max, u.Factor} {
			c.num(x)
		}
		c.str(p.Source)
		c.str(string(p.Status))
	}
}

// moonRef is a moon found by name, with its planet and star.
type moonRef struct {
	id, planetID, starID int64
	name, planet         string
}

// findMoon finds a moon by name or alias, optionally under a named planet.
func findMoon(ctx context.Context, q queryer, moon, planet string) (moonRef, error) {
	mk, pk := schema.NameKey(moon), schema.NameKey(planet)
	// Two lookups, by name and by alias, each on its index (an OR across
	// the join would scan every body).
	rows, err := q.QueryContext(ctx, `
		SELECT DISTINCT id, name, pid, pname, sid FROM (
			SELECT m.id, m.name, m.name_key AS mkey, p.id AS pid, p.name AS pname, p.name_key AS pkey, ifnull(p.parent_id, 0) AS sid
			FROM body m JOIN body p ON p.id = m.parent_id
			WHERE m.name_key = ?1 AND m.kind = 'moon'
			UNION ALL
			SELECT m.id, m.name, m.name_key, p.id, p.name, p.name_key, ifnull(p.parent_id, 0)
			FROM alias a JOIN body m ON m.id = a.body_id JOIN body p ON p.id = m.parent_id
			WHERE a.name_key = ?1 AND m.kind = 'moon')
		WHERE ?2 = '' OR pkey = ?2
		ORDER BY pkey, mkey, id`, mk, pk)
	if err != nil {
		return moonRef{}, err
	}
	defer rows.Close()
	var found []moonRef
	for rows.Next() {
		var m moonRef
		if err := rows.Scan(&m.id, &m.name, &m.planetID, &m.planet, &m.starID); err != nil {
			return moonRef{}, err
		}
		found = append(found, m)
	}
	if err := rows.Err(); err != nil {
		return moonRef{}, err
	}
	where := ""
	if pk != "" {
		where = fmt.Sprintf(" of planet %q", planet)
	}
	switch len(found) {
	case 0:
		return moonRef{}, fmt.Errorf("%w: no moon %q%s", ErrNotFound, moon, where)
	case 1:
		return found[0], nil
	}
	var list []string
	for _, m := range found {
		list = append(list, fmt.Sprintf("%s (planet %s)", m.name, m.planet))
	}
	return moonRef{}, fmt.Errorf("%w: moon %q%s matches %s; give the planet", ErrAmbiguous, moon, where, strings.Join(list, ", "))
}

// History lists every value a moon's parameters have held, oldest first; key ""
// means all keys. The moon is matched by name or alias (and planet, when not
// empty). Keys of the moon's planet and star (planet_mass, star_luminosity, …)
// give that body's history, and key "" includes them, as Catalog.Inputs
// does. Entries are ordered by the revision that set them, then by key in the
// order of schema.Keys.
func (s *Store) History(ctx context.Context, moon, planet, key string) ([]HistoryEntry, error) {
	var out []HistoryEntry
	err := s.readTx(ctx, func(q queryer) error {
		out = nil
		m, err := findMoon(ctx, q, moon, planet)
		if err != nil {
			return err
		}
		ids := []int64{m.id, m.planetID, m.starID}
		if key != "" {
			info, ok := schema.LookupKey(key)
			if !ok {
				return fmt.Errorf("%w %q", schema.ErrUnknownKey, key)
			}
			switch info.Body {
			case schema.KindPlanet:
				ids = []int64{m.planetID}
			case schema.KindStar:
				ids = []int64{m.starID}
			default:
				ids = []int64{m.id}
			}
		}
		kc, err := loadKeyCodes(ctx, q)
		if err != nil {
			return err
		}
		for _, id := range ids {
			if id == 0 {
				continue
			}
			entries, err := bodyHistory(ctx, q, kc, id, key)
			if err != nil {
				return err
			}
			out = append(out, entries...)
		}
		return nil
	})
	if err != nil {
		return nil, fmt.Errorf("history of %s: %w", moon, err)
	}
	order := map[string]int{}
	for i, k := range schema.Keys {
		order[k.Key] = i
	}
	sort.SliceStable(out, func(i, j int) bool {
		if out[i].Param.Revision != out[j].Param.Revision {
			return out[i].Param.Revision < out[j].Param.Revision
		}
		return order[out[i].Key] < order[out[j].Key]
	})
	return out, nil
}

// storedState is one row of the state table, decoded.
type storedState struct {
	id, setRev, sup, prev int64
	vals                  []entry
}

// bodyHistory returns the values a body's states held (only key's, unless
// key is ""), each once, with the revision that superseded it. It walks the
// body's chain of states from the current one back.
func bodyHistory(ctx context.Context, q queryer, kc *keyCodes, body int64, key string) ([]HistoryEntry, error) {
	var chain []storedState // newest first
	var next sql.NullInt64
	if err := q.QueryRowContext(ctx, "SELECT state_id FROM body WHERE id = ?", body).Scan(&next); err != nil {
		return nil, err
	}
	in := interner{}
	seen := map[int64]bool{}
	for next.Valid && next.Int64 != 0 {
		id := next.Int64
		if seen[id] {
			return nil, fmt.Errorf("body %d: its states form a loop at state %d", body, id)
		}
		seen[id] = true
		st := storedState{id: id}
		var sup sql.NullInt64
		var data []byte
		if err := q.QueryRowContext(ctx, "SELECT set_rev, superseded_rev, prev_id, data FROM state WHERE id = ?", id).
			Scan(&st.setRev, &sup, &next, &data); err != nil {
			return nil, fmt.Errorf("body %d, state %d: %w", body, id, err)
		}
		st.sup = sup.Int64
		var err error
		if st.vals, err = kc.decode(nil, data, in); err != nil {
			return nil, fmt.Errorf("body %d, state %d: %w", body, id, err)
		}
		chain = append(chain, st)
	}
	var out []HistoryEntry
	for i := len(chain) - 1; i >= 0; i-- { // oldest first
		for _, e := range chain[i].vals {
			if (key != "" && e.p.Key != key) || e.p.Revision != chain[i].setRev && i != len(chain)-1 {
				continue // another key, or a value carried over from an older state
			}
			h := HistoryEntry{Key: e.p.Key, Param: e.p}
			// Superseded by the first newer state that no longer holds it.
			for j := i - 1; j >= 0; j-- {
				if k := find(chain[j].vals, e.code); k < 0 || chain[j].vals[k].p.Revision != e.p.Revision {
					h.SupersededBy = chain[j].setRev
					break
				}
			}
			out = append(out, h)
		}
	}
	return out, nil
}

// Diff lists the values added, removed and changed between revisions a and b
// (0 meaning the latest): what turns the catalog as of a into the catalog as
// of b. a may be later than b; the list then says how to go back (values set
// after b show as removed or changed back). A value changed and then changed
// back between a and b is not listed. The changes are sorted by body kind
// (stars, planets, moons), then as Snapshot sorts bodies, then by key in the
// order of schema.Keys.
//
// Only rows set or superseded between the two revisions are read, so the
// work and memory follow the size of the change, not of the catalog.
func (s *Store) Diff(ctx context.Context, a, b int64) ([]ValueChange, error) {
	var out []ValueChange
	err := s.readTx(ctx, func(q queryer) error {
		out = nil
		ra, err := resolveRevision(ctx, q, a)
		if err != nil {
			return err
		}
		rb, err := resolveRevision(ctx, q, b)
		if err != nil {
			return err
		}
		lo, hi := min(ra.ID, rb.ID), max(ra.ID, rb.ID)
		if lo == hi {
			return nil
		}
		type vk struct {
			body int64
			key  string
		}
		type pair struct{ atLo, atHi *schema.Param }
		touched := map[vk]*pair{}
		var order []vk
		kc, err := loadKeyCodes(ctx, q)
		if err != nil {
			return err
		}
		rows, err := q.QueryContext(ctx, `SELECT body_id, set_rev, ifnull(superseded_rev, 0), data FROM state
			WHERE (set_rev > ?1 AND set_rev <= ?2) OR (superseded_rev > ?1 AND superseded_rev <= ?2)`, lo, hi)
		if err != nil {
			return err
		}
		defer rows.Close()
		in := interner{}
		var vals []entry
		for rows.Next() {
			var id, set, sup int64
			var data sql.RawBytes
			if err := rows.Scan(&id, &set, &sup, &data); err != nil {
				return err
			}
			atLo := set <= lo // held at lo, superseded by hi
			if !atLo && sup != 0 && sup <= hi {
				continue // set and superseded between the two: not visible from either end
			}
			if vals, err = kc.decode(vals[:0], data, in); err != nil {
				return fmt.Errorf("values of body %d: %w", id, err)
			}
			for _, e := range vals {
				k := vk{id, e.p.Key}
				pr := touched[k]
				if pr == nil {
					pr = &pair{}
					touched[k] = pr
					order = append(order, k)
				}
				p := e.p
				if atLo {
					pr.atLo = &p
				} else {
					pr.atHi = &p
				}
			}
		}
		if err := rows.Err(); err != nil {
			return err
		}
		rows.Close()
		bodies, err := loadBodies(ctx, q, hi)
		if err != nil {
			return err
		}
		var ids []int64
		for _, k := range order {
			pr := touched[k]
			old, nw := pr.atLo, pr.atHi
			if ra.ID > rb.ID {
				old, nw = nw, old
			}
			if old != nil && nw != nil && sameValue(*old, *nw) || old == nil && nw == nil {
				continue
			}
			sb := bodies[k.body]
			if sb == nil {
				continue
			}
			ids = append(ids, k.body)
			out = append(out, ValueChange{Kind: sb.b.Kind, Body: sb.b.Name, Parent: sb.b.Parent, Key: k.key, Old: old, New: nw})
		}
		sortChanges(out, ids, bodies)
		return nil
	})
	if err != nil {
		return nil, fmt.Errorf("diff %d %d: %w", a, b, err)
	}
	return out, nil
}

func sortChanges(cs []ValueChange, ids []int64, bodies map[int64]*snapBody) {
	keyOrder := map[string]int{}
	for i, k := range schema.Keys {
		keyOrder[k.Key] = i
	}
	// Rank bodies as Snapshot orders them: stars, planets, moons.
	rank := map[int64]int{}
	for _, kind := range []schema.Kind{schema.KindStar, schema.KindPlanet, schema.KindMoon} {
		for _, sb := range sortedBodies(bodies, kind) {
			rank[sb.b.ID] = len(rank)
		}
	}
	idx := make([]int, len(cs))
	for i := range idx {
		idx[i] = i
	}
	sort.Slice(idx, func(i, j int) bool {
		a, b := idx[i], idx[j]
		if ra, rb := rank[ids[a]], rank[ids[b]]; ra != rb {
			return ra < rb
		}
		return keyOrder[cs[a].Key] < keyOrder[cs[b].Key]
	})
	sorted := make([]ValueChange, len(cs))
	for i, k := range idx {
		sorted[i] = cs[k]
	}
	copy(cs, sorted)
}
