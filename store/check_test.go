package store

import (
	"context"
	"sort"
	"strings"
	"testing"

	"tidesift/schema"
)

func TestCheckCleanCatalog(t *testing.T) {
	s := threeRevisions(t)
	rep, err := s.Check(context.Background())
	if err != nil {
		t.Fatal(err)
	}
	if !rep.OK() {
		t.Fatalf("clean catalog has problems:\n%s", rep)
	}
	if rep.Revisions != 3 || rep.Bodies != 3 || rep.Values != 7 {
		t.Errorf("examined %d revisions, %d bodies, %d values; want 3, 3, 7", rep.Revisions, rep.Bodies, rep.Values)
	}
	if !strings.HasPrefix(rep.String(), "catalog ok") {
		t.Errorf("String() = %q", rep.String())
	}
}

// currentState returns the id of the current state of the body named name.
func currentState(tb testing.TB, s *Store, name string) int64 {
	tb.Helper()
	var id int64
	if err := s.db.QueryRow("SELECT state_id FROM body WHERE name = ?", name).Scan(&id); err != nil {
		tb.Fatalf("current state of %s: %v", name, err)
	}
	return id
}

// editState decodes a stored state, lets edit change its values and stores
// the result back: damage that SQL alone cannot do to an encoded state.
func editState(tb testing.TB, s *Store, id int64, edit func(kc *keyCodes, es []entry) []entry) {
	tb.Helper()
	ctx := context.Background()
	kc, err := loadKeyCodes(ctx, s.db)
	if err != nil {
		tb.Fatal(err)
	}
	var data []byte
	if err := s.db.QueryRow("SELECT data FROM state WHERE id = ?", id).Scan(&data); err != nil {
		tb.Fatal(err)
	}
	es, err := kc.decode(nil, data, interner{})
	if err != nil {
		tb.Fatal(err)
	}
	es = edit(kc, es)
	// Encoded as stored, without the importer's checks.
	sort.Slice(es, func(i, j int) bool { return es[i].code < es[j].code })
	var vals []schema.StateValue
	for _, e := range es {
		vals = append(vals, schema.StateValue{Code: e.code, Param: e.p})
	}
	if _, err := s.db.Exec("UPDATE state SET data = ? WHERE id = ?", schema.AppendState(nil, vals), id); err != nil {
		tb.Fatal(err)
	}
}

// setEntry changes the entry of key in es with f, or adds one.
func setEntry(kc *keyCodes, es []entry, key string, f func(p *schema.Param)) []entry {
	c := kc.byKey[key]
	if i := find(es, c); i >= 0 {
		f(&es[i].p)
		return es
	}
	e := entry{code: c, p: schema.Param{Key: key, Status: schema.StatusMeasured}}
	f(&e.p)
	return append(es, e)
}

func TestCheckFindsDamage(t *testing.T) {
	tests := []struct {
		name   string
		damage string                       // SQL run with foreign keys off
		edit   func(t *testing.T, s *Store) // damage to encoded states, after damage
		want   string                       // in one problem's String()
	}{
		{"in-domain edit is no problem", "", func(t *testing.T, s *Store) {
			editState(t, s, currentState(t, s, "Aster"), func(kc *keyCodes, es []entry) []entry {
				return setEntry(kc, es, "radius", func(p *schema.Param) { p.Value = 1.2 }) // 1.2 m is a valid radius
			})
		}, ""},
		{"eccentricity out of domain", "UPDATE revision SET changes = changes + 1 WHERE id = 3", func(t *testing.T, s *Store) {
			editState(t, s, currentState(t, s, "Aster"), func(kc *keyCodes, es []entry) []entry {
				return setEntry(kc, es, "eccentricity", func(p *schema.Param) { p.Value, p.Revision = 1.2, 3 })
			})
		}, "moon Aster (Test Giant) eccentricity, revision 3: value outside its physical domain: eccentricity = 1.2, expected [0, 1)"},
		{"negative sigma", "", func(t *testing.T, s *Store) {
			editState(t, s, currentState(t, s, "Aster"), func(kc *keyCodes, es []entry) []entry {
				return setEntry(kc, es, "radius", func(p *schema.Param) { p.Unc = schema.Uncertainty{Kind: schema.UncSymmetric, Sigma: -1} })
			})
		}, "radius, revision 3: radius: negative uncertainty"},
		{"unknown key", "INSERT INTO key_name (code, key) VALUES (99, 'colour')", func(t *testing.T, s *Store) {
			editState(t, s, currentState(t, s, "Aster"), func(kc *keyCodes, es []entry) []entry {
				kc.byKey["colour"] = 99
				return setEntry(kc, es, "colour", func(p *schema.Param) { p.Value, p.Revision = 1, 3 })
			})
		}, `unknown key "colour"`},
		{"key code not in key_name", "DELETE FROM key_name WHERE key = 'radius'", nil, "is not in key_name"},
		{"undecodable state", "UPDATE state SET data = x'01ff' WHERE id = (SELECT state_id FROM body WHERE name = 'Beryl')", nil,
			"moon Beryl (Test Giant), revision 2: state"},
		{"planet key on a moon", "", func(t *testing.T, s *Store) {
			editState(t, s, currentState(t, s, "Beryl"), func(kc *keyCodes, es []entry) []entry {
				return setEntry(kc, es, "planet_mass", func(p *schema.Param) { p.Value, p.Revision = 2e27, 2 })
			})
		}, "moon Beryl (Test Giant) planet_mass, revision 2: a planet value stored on a moon"},
		{"value set after its state", "", func(t *testing.T, s *Store) {
			editState(t, s, currentState(t, s, "Beryl"), func(kc *keyCodes, es []entry) []entry {
				return setEntry(kc, es, "mass", func(p *schema.Param) { p.Revision = 3 })
			})
		}, "moon Beryl (Test Giant) mass, revision 3: set by revision 3, after the state that holds it (revision 2)"},
		{"values of a missing body", "UPDATE state SET body_id = 999 WHERE id = (SELECT state_id FROM body WHERE name = 'Beryl')", nil,
			"#999, revision 2: values of a body that does not exist"},
		{"body of a missing revision", "UPDATE body SET created_rev = 77 WHERE name = 'Beryl'", nil, "moon Beryl (Test Giant), revision 77: created by a revision that does not exist"},
		{"missing revision", "DELETE FROM revision WHERE id = 2", nil, "revision 2: 2 values were set by this revision, which does not exist"},
		{"half a revision", "DELETE FROM state WHERE set_rev = 2 AND body_id = (SELECT id FROM body WHERE name = 'Beryl')", nil,
			"revision 2: says it changed 2 values but holds 1"},
		{"time backwards", "UPDATE revision SET time = '2001-01-01T00:00:00Z' WHERE id = 3", nil, "revision 3: recorded at 2001-01-01T00:00:00Z, before revision 2"},
		{"superseded by a missing revision", "UPDATE state SET superseded_rev = 50 WHERE set_rev = 1 AND body_id = (SELECT id FROM body WHERE name = 'Aster')", nil,
			"superseded by revision 50, which does not exist"},
		{"current values not current", "UPDATE body SET state_id = (SELECT min(id) FROM state WHERE body_id = body.id) WHERE name = 'Aster'", nil,
			"moon Aster (Test Giant): its current values point at a missing, superseded or foreign state"},
		{"two current states", "UPDATE state SET superseded_rev = NULL WHERE set_rev = 1 AND body_id = (SELECT id FROM body WHERE name = 'Aster')", nil,
			"moon Aster (Test Giant): holds two sets of current values"},
		{"broken history", "UPDATE state SET prev_id = 12345 WHERE id = (SELECT state_id FROM body WHERE name = 'Aster')", nil,
			"moon Aster (Test Giant): its history is broken"},
		{"moon without planet", "UPDATE body SET parent_id = 555 WHERE name = 'Beryl'", nil, "its parent (body 555) does not exist"},
		{"name key", "UPDATE body SET name_key = 'beryll' WHERE name = 'Beryl'", nil, `stored name key "beryll", expected "beryl"`},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			s := threeRevisions(t)
			if _, err := s.db.Exec("PRAGMA foreign_keys = OFF; PRAGMA ignore_check_constraints = ON; " + tt.damage); err != nil {
				t.Fatal(err)
			}
			if tt.edit != nil {
				tt.edit(t, s)
			}
			rep, err := s.Check(context.Background())
			if err != nil {
				t.Fatal(err)
			}
			if tt.want == "" {
				if !rep.OK() {
					t.Errorf("in-domain edit reported:\n%s", rep)
				}
				return
			}
			if rep.OK() {
				t.Fatalf("damage %q not found", tt.name)
			}
			found := false
			for _, p := range rep.Problems {
				if strings.Contains(p.String(), tt.want) {
					found = true
				}
			}
			if !found {
				t.Errorf("no problem contains %q; report:\n%s", tt.want, rep)
			}
		})
	}
}

func TestSchemaConstraintsRefuseBadRows(t *testing.T) {
	tests := []struct{ name, sql string }{
		{"empty state", "INSERT INTO state (body_id, set_rev, data) VALUES (1, 1, x'')"},
		{"superseded by the revision that set it", "INSERT INTO state (body_id, set_rev, superseded_rev, data) VALUES (1, 1, 1, x'0100')"},
		{"state of a missing body", "INSERT INTO state (body_id, set_rev, data) VALUES (99, 1, x'0100')"},
		{"state of a missing revision", "INSERT INTO state (body_id, set_rev, data) VALUES (1, 99, x'0100')"},
		{"key code zero", "INSERT INTO key_name (code, key) VALUES (0, 'colour')"},
		{"key named twice", "INSERT INTO key_name (code, key) VALUES (77, 'mass')"},
		{"unknown body kind", "INSERT INTO body (kind, name, name_key, created_rev) VALUES ('comet', 'X', 'x', 1)"},
		{"star with a parent", "INSERT INTO body (kind, name, name_key, parent_id, created_rev) VALUES ('star', 'X', 'x', 1, 1)"},
		{"moon without a planet", "INSERT INTO body (kind, name, name_key, created_rev) VALUES ('moon', 'X', 'x', 1)"},
		{"duplicate natural key", "INSERT INTO body (kind, name, name_key, created_rev) SELECT kind, name, name_key, created_rev FROM body WHERE kind = 'planet' LIMIT 1"},
		{"duplicate file digest", "INSERT INTO revision (time, sha256) SELECT time, sha256 FROM revision WHERE id = 1"},
		{"short digest", "INSERT INTO revision (time, sha256) VALUES ('2026-01-01T00:00:00Z', 'abc')"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			s := threeRevisions(t)
			if _, err := s.db.Exec(tt.sql); err == nil {
				t.Errorf("accepted: %s", tt.sql)
			}
		})
	}
}
