package schema

import (
	"bytes"
	"context"
	"database/sql"
	"errors"
	"flag"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"testing/fstest"

	_ "modernc.org/sqlite"
)

var update = flag.Bool("update", false, "rewrite testdata/schema.golden")

func openTestDB(tb testing.TB, path string) *sql.DB {
	tb.Helper()
	db, err := sql.Open("sqlite", path)
	if err != nil {
		tb.Fatal(err)
	}
	db.SetMaxOpenConns(1)
	tb.Cleanup(func() { db.Close() })
	return db
}

func mustExec(tb testing.TB, db *sql.DB, q string) {
	tb.Helper()
	if _, err := db.Exec(q); err != nil {
		tb.Fatalf("%s: %v", q, err)
	}
}

func mustVersion(tb testing.TB, db *sql.DB) int {
	tb.Helper()
	v, err := Version(context.Background(), db)
	if err != nil {
		tb.Fatal(err)
	}
	return v
}

// dumpSchema renders sqlite_schema and user_version as stable text.
func dumpSchema(tb testing.TB, db *sql.DB) string {
	tb.Helper()
	var b strings.Builder
	fmt.Fprintf(&b, "-- user_version %d\n", mustVersion(tb, db)) // before Query: the pool has one connection
	rows, err := db.Query("SELECT type, name, tbl_name, ifnull(sql, '') FROM sqlite_schema ORDER BY type, name")
	if err != nil {
		tb.Fatal(err)
	}
	defer rows.Close()
	for rows.Next() {
		var typ, name, tbl, q string
		if err := rows.Scan(&typ, &name, &tbl, &q); err != nil {
			tb.Fatal(err)
		}
		fmt.Fprintf(&b, "\n-- %s %s on %s\n%s;\n", typ, name, tbl, q)
	}
	if err := rows.Err(); err != nil {
		tb.Fatal(err)
	}
	return b.String()
}

func TestCurrentVersionMatchesMigrations(t *testing.T) {
	migs, err := Migrations()
	if err != nil {
		t.Fatal(err)
	}
	if len(migs) != CurrentVersion {
		t.Fatalf("%d embedded migrations, CurrentVersion = %d: bump CurrentVersion with each new migration", len(migs), CurrentVersion)
	}
}

func TestSchemaGolden(t *testing.T) {
	db := openTestDB(t, ":memory:")
	if err := Migrate(context.Background(), db); err != nil {
		t.Fatal(err)
	}
	got := dumpSchema(t, db)
	golden := filepath.Join("testdata", "schema.golden")
	if *update {
		if err := os.WriteFile(golden, []byte(got), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	want, err := os.ReadFile(golden)
	if err != nil {
		t.Fatalf("%v (run go test ./schema -run TestSchemaGolden -update)", err)
	}
	if got != string(want) {
		t.Errorf("schema differs from %s (rerun with -update if intended):\n%s", golden, got)
	}
}

func TestMigrateFreshAndReopen(t *testing.T) {
	ctx := context.Background()
	path := filepath.Join(t.TempDir(), "c.db")
	db := openTestDB(t, path)
	if err := Migrate(ctx, db); err != nil {
		t.Fatal(err)
	}
	if v := mustVersion(t, db); v != CurrentVersion {
		t.Fatalf("user_version = %d after Migrate, want %d", v, CurrentVersion)
	}
	want := dumpSchema(t, db)
	db.Close()
	before := readFile(t, path)

	db2 := openTestDB(t, path)
	if err := Migrate(ctx, db2); err != nil {
		t.Fatalf("second Migrate: %v", err)
	}
	if got := dumpSchema(t, db2); got != want {
		t.Errorf("schema changed on reopen:\n%s\nwant\n%s", got, want)
	}
	db2.Close()
	if !bytes.Equal(readFile(t, path), before) {
		t.Error("Migrate of a current catalog changed the file")
	}
}

func readFile(tb testing.TB, path string) []byte {
	tb.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		tb.Fatal(err)
	}
	return b
}

func TestMigrateRefusesNewer(t *testing.T) {
	ctx := context.Background()
	path := filepath.Join(t.TempDir(), "newer.db")
	db := openTestDB(t, path)
	if err := Migrate(ctx, db); err != nil {
		t.Fatal(err)
	}
	mustExec(t, db, "PRAGMA user_version = 7")
	db.Close()
	before := readFile(t, path)
	st, _ := os.Stat(path)

	db = openTestDB(t, path)
	err := Migrate(ctx, db)
	want := fmt.Sprintf("catalog schema version 7 is newer than this tidesift supports (%d); upgrade tidesift", CurrentVersion)
	if err == nil || err.Error() != want {
		t.Fatalf("Migrate = %v, want %q", err, want)
	}
	if !errors.Is(err, ErrNewerSchema) {
		t.Errorf("error %v does not match ErrNewerSchema", err)
	}
	var ne *NewerSchemaError
	if !errors.As(err, &ne) || ne.Found != 7 || ne.Supported != CurrentVersion {
		t.Errorf("NewerSchemaError = %+v", ne)
	}
	if _, err := CheckVersion(ctx, db); !errors.Is(err, ErrNewerSchema) {
		t.Errorf("CheckVersion = %v, want ErrNewerSchema", err)
	}
	db.Close()
	st2, _ := os.Stat(path)
	if !bytes.Equal(readFile(t, path), before) || !st2.ModTime().Equal(st.ModTime()) {
		t.Error("refused catalog was modified")
	}
}

func TestMigrateUpgradesOlder(t *testing.T) {
	ctx := context.Background()
	migs, err := loadMigrations(os.DirFS("testdata"), "upgrade")
	if err != nil {
		t.Fatal(err)
	}
	db := openTestDB(t, filepath.Join(t.TempDir(), "old.db"))
	if err := migrate(ctx, db, migs, 1); err != nil {
		t.Fatal(err)
	}
	mustExec(t, db, "INSERT INTO item (name) VALUES ('alpha'), ('beta')")
	if err := migrate(ctx, db, migs, 2); err != nil {
		t.Fatalf("upgrade 1 → 2: %v", err)
	}
	if v := mustVersion(t, db); v != 2 {
		t.Fatalf("user_version = %d, want 2", v)
	}
	var names string
	if err := db.QueryRow("SELECT group_concat(name || ':' || note, ',') FROM (SELECT * FROM item ORDER BY id)").Scan(&names); err != nil {
		t.Fatal(err)
	}
	if names != "alpha:,beta:" {
		t.Errorf("rows after upgrade = %q, want %q", names, "alpha:,beta:")
	}
}

func TestMigrateFailedStepRollsBack(t *testing.T) {
	ctx := context.Background()
	migs, err := loadMigrations(os.DirFS("testdata"), "broken")
	if err != nil {
		t.Fatal(err)
	}
	db := openTestDB(t, ":memory:")
	err = migrate(ctx, db, migs, 2)
	if err == nil || !strings.Contains(err.Error(), "0002_half.sql") {
		t.Fatalf("migrate = %v, want an error naming 0002_half.sql", err)
	}
	if v := mustVersion(t, db); v != 1 {
		t.Errorf("user_version = %d after a failed step 2, want 1", v)
	}
	var n int
	if err := db.QueryRow("SELECT count(*) FROM sqlite_schema WHERE name = 'extra'").Scan(&n); err != nil {
		t.Fatal(err)
	}
	if n != 0 {
		t.Error("the failed migration's first statement was kept")
	}
}

func TestLoadMigrationsRejectsBadNames(t *testing.T) {
	tests := []struct {
		name string
		fs   fstest.MapFS
		want string
	}{
		{"gap", fstest.MapFS{"m/0001_a.sql": {}, "m/0003_c.sql": {}}, "expected number 2"},
		{"no number", fstest.MapFS{"m/init.sql": {}}, "NNNN_description.sql"},
		{"zero", fstest.MapFS{"m/0000_a.sql": {}}, "NNNN_description.sql"},
		{"duplicate", fstest.MapFS{"m/0001_a.sql": {}, "m/0001_b.sql": {}}, "expected number 2"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			_, err := loadMigrations(tt.fs, "m")
			if err == nil || !strings.Contains(err.Error(), tt.want) {
				t.Fatalf("loadMigrations = %v, want error containing %q", err, tt.want)
			}
		})
	}
}
