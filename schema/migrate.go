package schema

import (
	"context"
	"database/sql"
	"embed"
	"errors"
	"fmt"
	"io/fs"
	"path"
	"sort"
	"strconv"
	"strings"
)

// CurrentVersion is the catalog schema version this build writes: the number of
// the last migration under migrations/. A test keeps the two in step.
const CurrentVersion = 2

//go:embed migrations/*.sql
var migrationFiles embed.FS

// ErrNewerSchema is wrapped by the error Migrate and CheckVersion return for a
// catalog written by a newer tidesift. Test with errors.Is.
var ErrNewerSchema = errors.New("catalog schema is newer than this tidesift supports")

// NewerSchemaError reports a catalog whose schema version is above
// CurrentVersion. It matches ErrNewerSchema under errors.Is.
type NewerSchemaError struct {
	Found     int // the catalog's PRAGMA user_version
	Supported int // CurrentVersion of this build
}

func (e *NewerSchemaError) Error() string {
	return fmt.Sprintf("catalog schema version %d is newer than this tidesift supports (%d); upgrade tidesift", e.Found, e.Supported)
}

// Is makes errors.Is(err, ErrNewerSchema) true.
func (e *NewerSchemaError) Is(target error) bool { return target == ErrNewerSchema }

// Migration is one numbered step of the catalog schema.
type Migration struct {
	Version int    // the schema version after this step (1, 2, …)
	Name    string // file name, e.g. "0001_catalog.sql"
	SQL     string
	// Go, when set, runs after SQL in the same transaction: for a step that
	// SQL alone cannot express (re-encoding rows).
	Go func(ctx context.Context, tx *sql.Tx) error
}

// Migrations returns the embedded migrations in order.
func Migrations() ([]Migration, error) {
	migs, err := loadMigrations(migrationFiles, "migrations")
	if err != nil {
		return nil, err
	}
	for i := range migs {
		migs[i].Go = goSteps[migs[i].Version]
	}
	return migs, nil
}

// loadMigrations reads dir/NNNN_name.sql files and checks they are numbered
// 1, 2, … without gaps, so a lost or duplicated file is caught at start-up.
func loadMigrations(fsys fs.FS, dir string) ([]Migration, error) {
	ents, err := fs.ReadDir(fsys, dir)
	if err != nil {
		return nil, fmt.Errorf("read migrations: %w", err)
	}
	var out []Migration
	for _, e := range ents {
		name := e.Name()
		if e.IsDir() || !strings.HasSuffix(name, ".sql") {
			continue
		}
		num, _, ok := strings.Cut(name, "_")
		v, err := strconv.Atoi(num)
		if !ok || err != nil || v <= 0 {
			return nil, fmt.Errorf("migration %s: name must be NNNN_description.sql", name)
		}
		b, err := fs.ReadFile(fsys, path.Join(dir, name))
		if err != nil {
			return nil, fmt.Errorf("migration %s: %w", name, err)
		}
		out = append(out, Migration{Version: v, Name: name, SQL: string(b)})
	}
	sort.Slice(out, func(i, j int) bool { return out[i].Version < out[j].Version })
	for i, m := range out {
		if m.Version != i+1 {
			return nil, fmt.Errorf("migration %s: expected number %d (migrations must be numbered 1, 2, … without gaps)", m.Name, i+1)
		}
	}
	return out, nil
}

// Querier is what Version needs: a *sql.DB, *sql.Conn or *sql.Tx.
type Querier interface {
	QueryRowContext(ctx context.Context, query string, args ...any) *sql.Row
}

// Version reads the catalog's schema version (PRAGMA user_version; 0 for a new file).
func Version(ctx context.Context, q Querier) (int, error) {
	var v int
	if err := q.QueryRowContext(ctx, "PRAGMA user_version").Scan(&v); err != nil {
		return 0, fmt.Errorf("read schema version: %w", err)
	}
	return v, nil
}

// CheckVersion reads the schema version and refuses one newer than
// CurrentVersion with a *NewerSchemaError. It writes nothing, so callers use
// it before anything that could touch the file.
func CheckVersion(ctx context.Context, q Querier) (int, error) {
	v, err := Version(ctx, q)
	if err != nil {
		return 0, err
	}
	if v > CurrentVersion {
		return v, &NewerSchemaError{Found: v, Supported: CurrentVersion}
	}
	return v, nil
}

// Migrate brings the catalog to CurrentVersion, applying each pending
// migration in its own transaction together with the new PRAGMA user_version,
// so an interrupted upgrade leaves the catalog at the last whole step. A
// catalog newer than this build is refused, untouched. Migrating a current
// catalog reads one pragma and writes nothing.
func Migrate(ctx context.Context, db *sql.DB) error {
	migs, err := Migrations()
	if err != nil {
		return err
	}
	return migrate(ctx, db, migs, CurrentVersion)
}

func migrate(ctx context.Context, db *sql.DB, migs []Migration, current int) error {
	v, err := Version(ctx, db)
	if err != nil {
		return err
	}
	if v > current {
		return &NewerSchemaError{Found: v, Supported: current}
	}
	for _, m := range migs {
		if m.Version <= v || m.Version > current {
			continue
		}
		if err := applyOne(ctx, db, m); err != nil {
			return err
		}
	}
	return nil
}

func applyOne(ctx context.Context, db *sql.DB, m Migration) (err error) {
	tx, err := db.BeginTx(ctx, nil)
	if err != nil {
		return fmt.Errorf("migration %s: begin: %w", m.Name, err)
	}
	defer func() {
		if err != nil {
			_ = tx.Rollback()
		}
	}()
	// Read the version again under the write lock: another process may have
	// applied this step since we looked.
	v, err := Version(ctx, tx)
	if err != nil {
		return fmt.Errorf("migration %s: %w", m.Name, err)
	}
	if v >= m.Version {
		return tx.Rollback()
	}
	if v != m.Version-1 {
		return fmt.Errorf("migration %s: catalog is at schema version %d, expected %d", m.Name, v, m.Version-1)
	}
	if _, err = tx.ExecContext(ctx, m.SQL); err != nil {
		return fmt.Errorf("migration %s: %w", m.Name, err)
	}
	if m.Go != nil {
		if err = m.Go(ctx, tx); err != nil {
			return fmt.Errorf("migration %s: %w", m.Name, err)
		}
	}
	// PRAGMA takes no bound parameters; m.Version is an int we parsed.
	if _, err = tx.ExecContext(ctx, fmt.Sprintf("PRAGMA user_version = %d", m.Version)); err != nil {
		return fmt.Errorf("migration %s: set version: %w", m.Name, err)
	}
	if err = tx.Commit(); err != nil {
		return fmt.Errorf("migration %s: commit: %w", m.Name, err)
	}
	return nil
}
