package store

// API skeleton agreed between packages. The store helper replaces the bodies
// (and may move these declarations into other files) but keeps the signatures.

import (
	"context"
	"time"

	"tidesift/schema"
)

// Store is an open catalog.
type Store struct {
	// Now is the clock, read once per transaction. Tests replace it.
	Now func() time.Time
}

// Options adjust Open.
type Options struct {
	ReadOnly bool // open an existing catalog without writing (no migration)
}

// Open opens (creating if missing) the catalog at path and migrates it to the
// current schema. path may be ":memory:" for tests.
func Open(ctx context.Context, path string, opt Options) (*Store, error) { panic("not implemented") }

// Close closes the catalog, checkpointing the WAL.
func (s *Store) Close() error { panic("not implemented") }

// ImportRequest is one file's worth of records to apply as one revision.
type ImportRequest struct {
	File    string // display name of the file
	SHA256  string // hex SHA-256 of the file's bytes
	Note    string
	Records []schema.Record
	DryRun  bool // compute the outcome, write nothing
}

// ImportResult says what an import did.
type ImportResult struct {
	Revision  *schema.Revision // nil when nothing changed
	Duplicate *schema.Revision // set when the same file (SHA-256) was imported before: a no-op
	Added     int              // values new to the catalog
	Changed   int              // values that replaced a different value
	Unchanged int              // values identical to the current ones
	NewBodies int              // stars, planets and moons created
	Changes   []ValueChange    // every added or changed value
}

// ValueChange is one value added, changed or removed.
type ValueChange struct {
	Kind   schema.Kind
	Body   string // body name
	Parent string // planet of a moon, star of a planet
	Key    string
	Old    *schema.Param // nil when added
	New    *schema.Param // nil when removed
}

// Import applies a request in one transaction: all of it or nothing.
func (s *Store) Import(ctx context.Context, req ImportRequest) (*ImportResult, error) {
	panic("not implemented")
}

// Revisions lists every revision, oldest first.
func (s *Store) Revisions(ctx context.Context) ([]schema.Revision, error) { panic("not implemented") }

// Snapshot reads the catalog as it was at revision rev (0: the latest).
func (s *Store) Snapshot(ctx context.Context, rev int64) (*schema.Catalog, error) {
	panic("not implemented")
}

// HistoryEntry is one value a parameter held, with the revision span it held it.
type HistoryEntry struct {
	Key          string
	Param        schema.Param // Param.Revision is the revision that set it
	SupersededBy int64        // 0 while current
}

// History lists every value a moon's parameters have held, oldest first; key ""
// means all keys. The moon is matched by name (and planet, when not empty).
func (s *Store) History(ctx context.Context, moon, planet, key string) ([]HistoryEntry, error) {
	panic("not implemented")
}

// Diff lists the values added, removed and changed between revisions a and b.
func (s *Store) Diff(ctx context.Context, a, b int64) ([]ValueChange, error) {
	panic("not implemented")
}
