package store

import (
	"context"
	"strings"
	"testing"
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

func TestCheckFindsDamage(t *testing.T) {
	tests := []struct {
		name   string
		damage string // SQL run with foreign keys off
		want   string // in one problem's String()
	}{
		{"in-domain edit is no problem", "UPDATE value SET value = 1.2 WHERE key = 'radius'", ""}, // 1.2 m is a valid radius
		{"eccentricity out of domain", "INSERT INTO value (body_id, key, value, unc_kind, status, set_rev) SELECT id, 'eccentricity', 1.2, 'none', 'measured', 3 FROM body WHERE name = 'Aster'; UPDATE revision SET changes = changes + 1 WHERE id = 3",
			"moon Aster (Test Giant) eccentricity, revision 3: value outside its physical domain: eccentricity = 1.2, expected [0, 1)"},
		{"negative sigma", "UPDATE value SET unc_kind = 'symmetric', sigma = -1 WHERE key = 'radius' AND superseded_rev IS NULL",
			"radius, revision 3: radius: negative uncertainty"},
		{"unknown key", "UPDATE value SET key = 'colour' WHERE key = 'radius' AND superseded_rev IS NULL", `unknown key "colour"`},
		{"planet key on a moon", "UPDATE value SET body_id = (SELECT id FROM body WHERE name = 'Beryl') WHERE key = 'planet_mass' AND superseded_rev IS NULL",
			"moon Beryl (Test Giant) planet_mass, revision 3: a planet value stored on a moon"},
		{"value of a missing body", "INSERT INTO value (body_id, key, value, unc_kind, status, set_rev) VALUES (999, 'mass', 1, 'none', 'measured', 1); UPDATE revision SET changes = changes + 1 WHERE id = 1",
			"#999 mass, revision 1: value of a body that does not exist"},
		{"body of a missing revision", "UPDATE body SET created_rev = 77 WHERE name = 'Beryl'", "moon Beryl (Test Giant), revision 77: created by a revision that does not exist"},
		{"missing revision", "DELETE FROM revision WHERE id = 2", "revision 2: 2 values were set by this revision, which does not exist"},
		{"half a revision", "DELETE FROM value WHERE set_rev = 2 AND body_id = (SELECT id FROM body WHERE name = 'Beryl')",
			"revision 2: says it changed 2 values but holds 1"},
		{"time backwards", "UPDATE revision SET time = '2001-01-01T00:00:00Z' WHERE id = 3", "revision 3: recorded at 2001-01-01T00:00:00Z, before revision 2"},
		{"superseded by a missing revision", "UPDATE value SET superseded_rev = 50 WHERE key = 'mass' AND set_rev = 1", "superseded by revision 50, which does not exist"},
		{"moon without planet", "UPDATE body SET parent_id = 555 WHERE name = 'Beryl'", "its parent (body 555) does not exist"},
		{"name key", "UPDATE body SET name_key = 'beryll' WHERE name = 'Beryl'", `stored name key "beryll", expected "beryl"`},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			s := threeRevisions(t)
			if _, err := s.db.Exec("PRAGMA foreign_keys = OFF; PRAGMA ignore_check_constraints = ON; " + tt.damage); err != nil {
				t.Fatal(err)
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
				t.Fatalf("damage %q not found", tt.damage)
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
		{"unknown uncertainty kind", "INSERT INTO value (body_id, key, value, unc_kind, status, set_rev) VALUES (1, 'mass', 1, 'wide', 'measured', 1)"},
		{"symmetric without sigma", "INSERT INTO value (body_id, key, value, unc_kind, status, set_rev) VALUES (1, 'mass', 1, 'symmetric', 'measured', 1)"},
		{"none with a sigma", "INSERT INTO value (body_id, key, value, unc_kind, sigma, status, set_rev) VALUES (1, 'mass', 1, 'none', 0.1, 'measured', 1)"},
		{"range with a factor", "INSERT INTO value (body_id, key, value, unc_kind, min, max, factor, status, set_rev) VALUES (1, 'mass', 1, 'range', 0, 2, 3, 'measured', 1)"},
		{"unknown status", "INSERT INTO value (body_id, key, value, unc_kind, status, set_rev) VALUES (1, 'mass', 1, 'none', 'guessed', 1)"},
		{"superseded by the revision that set it", "INSERT INTO value (body_id, key, value, unc_kind, status, set_rev, superseded_rev) VALUES (1, 'mass', 1, 'none', 'measured', 1, 1)"},
		{"missing body", "INSERT INTO value (body_id, key, value, unc_kind, status, set_rev) VALUES (99, 'mass', 1, 'none', 'measured', 1)"},
		{"missing revision", "INSERT INTO value (body_id, key, value, unc_kind, status, set_rev) VALUES (1, 'mass', 1, 'none', 'measured', 99)"},
		{"second current value", "INSERT INTO value (body_id, key, value, unc_kind, status, set_rev) SELECT body_id, key, 2, 'none', 'measured', set_rev FROM value LIMIT 1"},
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
