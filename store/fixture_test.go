package store

import (
	"context"
	"database/sql"
	"errors"
	"flag"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"tidesift/schema"
)

var updateFixtures = flag.Bool("update-fixtures", false, "rewrite store/testdata/catalog-v1.db and its golden content hash")

// The schema-1 fixture: a small catalog written by schema version 1 and kept
// as bytes, so that every later migration is tested against a real old file.
// Regenerate it only while schema.CurrentVersion is 1.
const (
	fixtureV1     = "testdata/catalog-v1.db"
	fixtureV1Hash = "testdata/catalog-v1.hash"
)

func buildFixtureV1(tb testing.TB, path string) {
	tb.Helper()
	if schema.CurrentVersion != 1 {
		tb.Fatal("the schema-1 fixture can only be rebuilt by a schema-1 build")
	}
	s, err := Open(context.Background(), path, Options{})
	if err != nil {
		tb.Fatal(err)
	}
	s.Now = fixedClock()
	mustImport(tb, s, firstFile())
	a := rec("Aster", "Test Giant", "", pSym("mass", 1.1e22, 5e19),
		schema.Param{Key: "k2_q", Value: 0.01, Unc: schema.Uncertainty{Kind: schema.UncFactor, Factor: 3}})
	a.Aliases = []string{"TG I"}
	mustImport(tb, s, ImportRequest{File: "second.csv", SHA256: sum("second"), Note: "update", Records: []schema.Record{a,
		rec("Dune", "Lone World", "", schema.Param{Key: "bond_albedo", Value: 0.4, Unc: schema.Uncertainty{Kind: schema.UncRange, Min: 0.3, Max: 0.5}},
			schema.Param{Key: "obliquity", Value: 0.1, Unc: schema.Uncertainty{Kind: schema.UncAsymmetric, Plus: 0.02, Minus: 0.01}})}})
	if err := s.Close(); err != nil {
		tb.Fatal(err)
	}
}

func TestFixtureV1OpensAndKeepsEverything(t *testing.T) {
	if *updateFixtures {
		os.Remove(fixtureV1)
		buildFixtureV1(t, fixtureV1)
		s, err := Open(context.Background(), fixtureV1, Options{ReadOnly: true})
		if err != nil {
			t.Fatal(err)
		}
		h := mustSnapshot(t, s, 0).ContentHash
		s.Close()
		os.Remove(fixtureV1 + "-shm")
		os.Remove(fixtureV1 + "-wal")
		if err := os.WriteFile(fixtureV1Hash, []byte(h+"\n"), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	data, err := os.ReadFile(fixtureV1)
	if err != nil {
		t.Fatalf("%v (rebuild with go test ./store -run TestFixtureV1 -update-fixtures)", err)
	}
	wantHash, err := os.ReadFile(fixtureV1Hash)
	if err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(t.TempDir(), "v1.db")
	if err := os.WriteFile(path, data, 0o644); err != nil {
		t.Fatal(err)
	}
	s := mustOpen(t, path) // migrates to the current schema
	ctx := context.Background()
	if v, _ := schema.Version(ctx, s.db); v != schema.CurrentVersion {
		t.Errorf("version after open = %d, want %d", v, schema.CurrentVersion)
	}
	if got := mustSnapshot(t, s, 0).ContentHash; got != strings.TrimSpace(string(wantHash)) {
		t.Errorf("content after upgrade hashes to %s, want %s", got, wantHash)
	}
	revs, err := s.Revisions(ctx)
	if err != nil || len(revs) != 2 || revs[0].File != "first.csv" || revs[1].Note != "update" {
		t.Errorf("revisions = %+v, %v", revs, err)
	}
	if old := moonOf(t, mustSnapshot(t, s, 1), "Aster", "Test Giant").Params["mass"]; old.Value != 1e22 {
		t.Errorf("Aster mass at revision 1 = %+v", old)
	}
	// History survives the change of storage: the superseded mass and the
	// revision that replaced it.
	h, err := s.History(ctx, "Aster", "Test Giant", "mass")
	if err != nil || len(h) != 2 || h[0].Param.Value != 1e22 || h[0].SupersededBy != 2 || h[1].Param.Value != 1.1e22 || h[1].SupersededBy != 0 {
		t.Errorf("history of Aster mass after upgrade = %+v, %v", h, err)
	}
	if d, err := s.Diff(ctx, 1, 2); err != nil || len(d) == 0 {
		t.Errorf("diff 1 2 after upgrade = %+v, %v", d, err)
	}
	rep, err := s.Check(ctx)
	if err != nil || !rep.OK() {
		t.Errorf("Check = %v, %v", rep, err)
	}
}

func TestImportWaitsForAnotherWriter(t *testing.T) {
	ctx := context.Background()
	path := filepath.Join(t.TempDir(), "c.db")
	s := mustOpen(t, path)
	other, err := sql.Open("sqlite", fileURI(path, []string{"_pragma=busy_timeout(0)", "_txlock=immediate"}))
	if err != nil {
		t.Fatal(err)
	}
	defer other.Close()
	tx, err := other.Begin() // holds the write lock
	if err != nil {
		t.Fatal(err)
	}
	released := make(chan struct{})
	go func() {
		time.Sleep(300 * time.Millisecond)
		tx.Commit()
		close(released)
	}()
	res, err := s.Import(ctx, ImportRequest{File: "a.csv", Records: []schema.Record{rec("Aster", "Test Giant", "", p("mass", 1e22))}})
	if err != nil || res.Revision == nil {
		t.Fatalf("Import while another writer held the lock = %+v, %v", res, err)
	}
	<-released
}

func TestWithRetryBacksOffOnBusy(t *testing.T) {
	ctx := context.Background()
	path := filepath.Join(t.TempDir(), "c.db")
	mustOpen(t, path)
	// Make a genuine SQLITE_BUSY: two connections that do not wait.
	open := func() *sql.DB {
		db, err := sql.Open("sqlite", fileURI(path, []string{"_pragma=busy_timeout(0)", "_txlock=immediate"}))
		if err != nil {
			t.Fatal(err)
		}
		t.Cleanup(func() { db.Close() })
		return db
	}
	a, b := open(), open()
	tx, err := a.Begin()
	if err != nil {
		t.Fatal(err)
	}
	_, busyErr := b.Begin()
	tx.Rollback()
	if !isBusy(busyErr) {
		t.Fatalf("second BEGIN IMMEDIATE = %v, want SQLITE_BUSY", busyErr)
	}
	defer func(b, m time.Duration) { retryBase, retryMax = b, m }(retryBase, retryMax)
	retryBase, retryMax = 50*time.Microsecond, time.Millisecond
	calls := 0
	err = withRetry(ctx, func() error {
		calls++
		if calls < 3 {
			return busyErr
		}
		return nil
	})
	if err != nil || calls != 3 {
		t.Errorf("withRetry = %v after %d calls, want success on the third", err, calls)
	}
	calls = 0
	err = withRetry(ctx, func() error { calls++; return busyErr })
	if err == nil || calls != retryLimit || !strings.Contains(err.Error(), "stayed locked") {
		t.Errorf("withRetry on constant busy = %v after %d calls, want a 'stayed locked' error after %d", err, calls, retryLimit)
	}
	other := errors.New("not busy")
	calls = 0
	if err := withRetry(ctx, func() error { calls++; return other }); err != other || calls != 1 {
		t.Errorf("withRetry on another error = %v after %d calls, want it returned at once", err, calls)
	}
}
