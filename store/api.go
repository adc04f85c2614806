package store

import (
	"database/sql"
	"time"

	"tidesift/schema"
)

// Store is an open catalog. It is safe for concurrent use by several
// goroutines; several processes may also share one catalog file (SQLite's WAL
// mode and locks keep them apart, and Import retries while another writer
// holds the lock).
type Store struct {
	// Now is the clock, read once per transaction. Tests replace it. Nil means
	// time.Now; the store always records UTC.
	Now func() time.Time

	db       *sql.DB
	path     string // as given to Open
	readOnly bool
	memory   bool
}

// Options adjust Open.
type Options struct {
	ReadOnly bool // open an existing catalog without writing (no migration)
}

// ImportRequest is one file's worth of records to apply as one revision.
type ImportRequest struct {
	File    string // display name of the file
	SHA256  string // hex SHA-256 of the file's bytes; "" for an edit that is not a file
	Note    string
	Records []schema.Record
	DryRun  bool // compute the outcome, write nothing

	// OmitChanges leaves ImportResult.Changes empty (the counts are still
	// filled). A million-value import otherwise holds a million ValueChanges.
	OmitChanges bool
	// OmitAdded lists only changed values in ImportResult.Changes, not
	// added ones (which a first import of a large file is all of).
	OmitAdded bool
	// MaxChanges, when positive, keeps at most this many entries in
	// ImportResult.Changes (the first found), so that a large update holds
	// its counts but not a million ValueChanges.
	MaxChanges int
}

// ImportResult says what an import did.
type ImportResult struct {
	// Revision is the new revision; nil when nothing changed. Under DryRun it
	// describes the revision that would have been made (it is not stored).
	Revision   *schema.Revision
	Duplicate  *schema.Revision // set when the same file (SHA-256) was imported before: a no-op
	Added      int              // values new to the catalog
	Changed    int              // values that replaced a different value
	Unchanged  int              // values identical to the current ones (each body and key counted once)
	NewBodies  int              // stars, planets and moons created
	NewAliases int              // moon aliases recorded
	Changes    []ValueChange    // every added or changed value, in request order (unless OmitChanges; see MaxChanges)
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

// HistoryEntry is one value a parameter held, with the revision span it held it.
type HistoryEntry struct {
	Key          string
	Param        schema.Param // Param.Revision is the revision that set it
	SupersededBy int64        // 0 while current
}
