package store

import (
	"bytes"
	"context"
	"database/sql"
	"errors"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"

	"tidesift/schema"
)

func TestOpenFreshCatalog(t *testing.T) {
	ctx := context.Background()
	path := filepath.Join(t.TempDir(), "fresh.db")
	s := mustOpen(t, path)
	v, err := schema.Version(ctx, s.db)
	if err != nil {
		t.Fatal(err)
	}
	if v != schema.CurrentVersion {
		t.Errorf("user_version = %d, want %d", v, schema.CurrentVersion)
	}
	revs, err := s.Revisions(ctx)
	if err != nil || len(revs) != 0 {
		t.Errorf("Revisions = %v, %v; want none", revs, err)
	}
	c := mustSnapshot(t, s, 0)
	if c.Revision.ID != 0 || len(c.Moons)+len(c.Planets)+len(c.Stars) != 0 {
		t.Errorf("empty catalog snapshot = %+v", c)
	}
	var mode string
	if err := s.db.QueryRow("PRAGMA journal_mode").Scan(&mode); err != nil || mode != "wal" {
		t.Errorf("journal_mode = %q, %v; want wal", mode, err)
	}
	var page int
	if err := s.db.QueryRow("PRAGMA page_size").Scan(&page); err != nil || page != newPageSize {
		t.Errorf("page_size = %d, %v; want %d", page, err, newPageSize)
	}
}

// fileState is what "unchanged" means for a catalog file.
type fileState struct {
	data []byte
	mod  string
}

func stateOf(tb testing.TB, path string) fileState {
	tb.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		tb.Fatal(err)
	}
	st, err := os.Stat(path)
	if err != nil {
		tb.Fatal(err)
	}
	return fileState{b, st.ModTime().String()}
}

func assertUnchanged(tb testing.TB, path string, before fileState) {
	tb.Helper()
	after := stateOf(tb, path)
	if !bytes.Equal(after.data, before.data) {
		tb.Errorf("%s: contents changed", filepath.Base(path))
	}
	if after.mod != before.mod {
		tb.Errorf("%s: modification time changed from %s to %s", filepath.Base(path), before.mod, after.mod)
	}
}

func TestReopenIsNoop(t *testing.T) {
	ctx := context.Background()
	path := filepath.Join(t.TempDir(), "c.db")
	s := mustOpen(t, path)
	mustImport(t, s, ImportRequest{File: "a.csv", SHA256: sum("a"), Records: []schema.Record{rec("Aster", "Test Giant", "", p("mass", 1e20))}})
	want := mustSnapshot(t, s, 0).ContentHash
	if err := s.Close(); err != nil {
		t.Fatal(err)
	}
	before := stateOf(t, path)
	for _, ro := range []bool{false, true} {
		s2, err := Open(ctx, path, Options{ReadOnly: ro})
		if err != nil {
			t.Fatalf("reopen (read-only %v): %v", ro, err)
		}
		if got := mustSnapshot(t, s2, 0).ContentHash; got != want {
			t.Errorf("content hash after reopen = %s, want %s", got, want)
		}
		if err := s2.Close(); err != nil {
			t.Fatal(err)
		}
		assertUnchanged(t, path, before)
	}
}

// setUserVersion rewrites a closed catalog's schema version behind the store's back.
func setUserVersion(tb testing.TB, path string, v int) {
	tb.Helper()
	db, err := sql.Open("sqlite", fileURI(path, nil))
	if err != nil {
		tb.Fatal(err)
	}
	defer db.Close()
	if _, err := db.Exec(fmt.Sprintf("PRAGMA user_version = %d", v)); err != nil {
		tb.Fatal(err)
	}
	if _, err := db.Exec("PRAGMA wal_checkpoint(TRUNCATE)"); err != nil {
		tb.Fatal(err)
	}
}

func TestOpenRefusesNewerSchema(t *testing.T) {
	ctx := context.Background()
	path := filepath.Join(t.TempDir(), "newer.db")
	s := mustOpen(t, path)
	mustImport(t, s, ImportRequest{File: "a.csv", SHA256: sum("a"), Records: []schema.Record{rec("Aster", "Test Giant", "", p("mass", 1e20))}})
	s.Close()
	setUserVersion(t, path, 7)
	before := stateOf(t, path)
	want := fmt.Sprintf("catalog schema version 7 is newer than this tidesift supports (%d); upgrade tidesift", schema.CurrentVersion)
	for _, ro := range []bool{false, true} {
		_, err := Open(ctx, path, Options{ReadOnly: ro})
		if err == nil || !strings.Contains(err.Error(), want) || !errors.Is(err, schema.ErrNewerSchema) {
			t.Errorf("Open(read-only %v) = %v, want an error containing %q", ro, err, want)
		}
		assertUnchanged(t, path, before)
	}
}

func TestOpenUpgradesOlderSchema(t *testing.T) {
	ctx := context.Background()
	path := filepath.Join(t.TempDir(), "old.db")
	// A version-0 file: an SQLite database that has never been migrated.
	db, err := sql.Open("sqlite", path)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := db.Exec("PRAGMA user_version = 0; CREATE TABLE scratch (x)"); err != nil {
		t.Fatal(err)
	}
	db.Close()
	if _, err := Open(ctx, path, Options{ReadOnly: true}); err == nil || !strings.Contains(err.Error(), "older than this tidesift") {
		t.Errorf("read-only Open of an old catalog = %v, want a refusal saying it is older", err)
	}
	s := mustOpen(t, path)
	v, err := schema.Version(ctx, s.db)
	if err != nil || v != schema.CurrentVersion {
		t.Fatalf("version after upgrade = %d, %v; want %d", v, err, schema.CurrentVersion)
	}
	mustImport(t, s, ImportRequest{File: "a.csv", Records: []schema.Record{rec("Aster", "Test Giant", "", p("mass", 1e20))}})
}

func TestPragmasOnEveryConnection(t *testing.T) {
	ctx := context.Background()
	s := mustOpen(t, filepath.Join(t.TempDir(), "c.db"))
	// Hold two connections at once, so the second is a different one.
	c1, err := s.db.Conn(ctx)
	if err != nil {
		t.Fatal(err)
	}
	defer c1.Close()
	c2, err := s.db.Conn(ctx)
	if err != nil {
		t.Fatal(err)
	}
	defer c2.Close()
	for i, c := range []*sql.Conn{c1, c2} {
		for _, tc := range []struct {
			pragma string
			want   string
		}{
			{"foreign_keys", "1"},
			{"busy_timeout", fmt.Sprint(busyTimeoutMS)},
			{"journal_mode", "wal"},
			{"synchronous", "1"}, // NORMAL
		} {
			var got string
			if err := c.QueryRowContext(ctx, "PRAGMA "+tc.pragma).Scan(&got); err != nil {
				t.Fatal(err)
			}
			if got != tc.want {
				t.Errorf("connection %d: PRAGMA %s = %s, want %s", i+1, tc.pragma, got, tc.want)
			}
		}
	}
}

// protect makes path unwritable even for root: chattr +i when running as
// root (chmod does not stop root), chmod otherwise. It skips the test, saying
// why, when neither is possible here.
func protect(tb testing.TB, path string) {
	tb.Helper()
	if os.Geteuid() != 0 {
		st, err := os.Stat(path)
		if err != nil {
			tb.Fatal(err)
		}
		mode := os.FileMode(0o444)
		if st.IsDir() {
			mode = 0o555
		}
		if err := os.Chmod(path, mode); err != nil {
			tb.Fatal(err)
		}
		tb.Cleanup(func() { os.Chmod(path, st.Mode()) })
		return
	}
	chattr, err := exec.LookPath("chattr")
	if err != nil {
		tb.Skip("running as root without chattr: cannot make a file read-only for this test")
	}
	if out, err := exec.Command(chattr, "+i", path).CombinedOutput(); err != nil {
		tb.Skipf("running as root and chattr +i failed (%v: %s): cannot make a file read-only here", err, out)
	}
	tb.Cleanup(func() { exec.Command(chattr, "-i", path).Run() })
}

func TestOpenFaults(t *testing.T) {
	ctx := context.Background()
	tests := []struct {
		name  string
		setup func(t *testing.T, dir string) string // returns the path to open
		ro    bool
		want  string
	}{
		{"missing directory", func(t *testing.T, dir string) string {
			return filepath.Join(dir, "no-such-dir", "c.db")
		}, false, "does not exist; check the path and permissions"},
		{"missing file read-only", func(t *testing.T, dir string) string {
			return filepath.Join(dir, "absent.db")
		}, true, "no such file; check the path and permissions"},
		{"path is a directory", func(t *testing.T, dir string) string {
			return dir
		}, false, "is a directory, not a catalog file"},
		{"not a database", func(t *testing.T, dir string) string {
			path := filepath.Join(dir, "notes.db")
			os.WriteFile(path, bytes.Repeat([]byte("not a catalog\n"), 512), 0o644)
			return path
		}, false, "not a tidesift catalog"},
		{"read-only file", func(t *testing.T, dir string) string {
			path := makeCatalog(t, dir)
			protect(t, path)
			return path
		}, false, "read-only; check the path and permissions"},
		{"read-only directory", func(t *testing.T, dir string) string {
			path := makeCatalog(t, dir)
			protect(t, dir)
			return path
		}, false, "check the path and permissions"},
		{"new file in read-only directory", func(t *testing.T, dir string) string {
			protect(t, dir)
			return filepath.Join(dir, "new.db")
		}, false, "check the path and permissions"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			dir := t.TempDir()
			path := tt.setup(t, dir)
			var before *fileState
			if st, err := os.Stat(path); err == nil && !st.IsDir() {
				b := stateOf(t, path)
				before = &b
			}
			s, err := Open(ctx, path, Options{ReadOnly: tt.ro})
			if err == nil {
				s.Close()
				t.Fatalf("Open succeeded, want an error containing %q", tt.want)
			}
			t.Log(err)
			if !strings.Contains(err.Error(), tt.want) || !strings.Contains(err.Error(), path) {
				t.Errorf("Open error = %q, want it to name %s and contain %q", err, path, tt.want)
			}
			if before != nil {
				assertUnchanged(t, path, *before)
			}
		})
	}
}

// makeCatalog creates a closed catalog with one revision in dir.
func makeCatalog(tb testing.TB, dir string) string {
	tb.Helper()
	path := filepath.Join(dir, "c.db")
	s, err := Open(context.Background(), path, Options{})
	if err != nil {
		tb.Fatal(err)
	}
	s.Now = fixedClock()
	mustImport(tb, s, ImportRequest{File: "a.csv", SHA256: sum("a"), Records: []schema.Record{rec("Aster", "Test Giant", "", p("mass", 1e20))}})
	if err := s.Close(); err != nil {
		tb.Fatal(err)
	}
	return path
}

func TestReadOnlyStoreRefusesImport(t *testing.T) {
	path := makeCatalog(t, t.TempDir())
	before := stateOf(t, path)
	s, err := Open(context.Background(), path, Options{ReadOnly: true})
	if err != nil {
		t.Fatal(err)
	}
	_, err = s.Import(context.Background(), ImportRequest{File: "b.csv", Records: []schema.Record{rec("Beryl", "Test Giant", "", p("mass", 2e20))}})
	if !errors.Is(err, ErrReadOnly) {
		t.Errorf("Import on a read-only store = %v, want ErrReadOnly", err)
	}
	s.Close()
	assertUnchanged(t, path, before)
}

func TestOpenPathWithURICharacters(t *testing.T) {
	// '?', '#' and '%' would end or escape an SQLite URI if left as they are.
	path := filepath.Join(t.TempDir(), "team catalog #1?100%.db")
	s := mustOpen(t, path)
	mustImport(t, s, ImportRequest{File: "a.csv", Records: []schema.Record{rec("Aster", "Test Giant", "", p("mass", 1e22))}})
	s.Close()
	if _, err := os.Stat(path); err != nil {
		t.Fatalf("catalog not at the given path: %v", err)
	}
	s2, err := Open(context.Background(), path, Options{ReadOnly: true})
	if err != nil {
		t.Fatal(err)
	}
	defer s2.Close()
	if c := mustSnapshot(t, s2, 0); len(c.Moons) != 1 {
		t.Errorf("reopened catalog has %d moons", len(c.Moons))
	}
}

func TestReadOnlyOpenInReadOnlyDirectory(t *testing.T) {
	dir := t.TempDir()
	path := makeCatalog(t, dir)
	protect(t, dir)
	before := stateOf(t, path)
	s, err := Open(context.Background(), path, Options{ReadOnly: true})
	if err != nil {
		t.Fatalf("read-only Open in a read-only directory: %v", err)
	}
	if c := mustSnapshot(t, s, 0); len(c.Moons) != 1 || c.Revision.ID != 1 {
		t.Errorf("snapshot = %d moons at revision %d, want 1 at 1", len(c.Moons), c.Revision.ID)
	}
	s.Close()
	assertUnchanged(t, path, before)
}
