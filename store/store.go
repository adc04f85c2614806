package store

import (
	"context"
	"database/sql"
	"errors"
	"fmt"
	"io/fs"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"time"

	"modernc.org/sqlite"
	sqlite3 "modernc.org/sqlite/lib"

	"tidesift/schema"
)

// MemoryPath opens a private in-memory catalog (for tests).
const MemoryPath = ":memory:"

// busyTimeoutMS is how long SQLite itself waits for another connection's lock
// before returning SQLITE_BUSY; withRetry adds backoff on top.
const busyTimeoutMS = 5000

// writerParams are the DSN parameters of a read-write catalog. Pragmas in the
// DSN reach every pooled connection (db.Exec("PRAGMA …") would reach one).
// _txlock=immediate makes every read-write transaction take the write lock at
// BEGIN, so a transaction that reads and then writes cannot fail half-way with
// "database is locked" (see the shared library notes).
var writerParams = []string{
	fmt.Sprintf("_pragma=busy_timeout(%d)", busyTimeoutMS),
	"_pragma=journal_mode(WAL)",
	"_pragma=synchronous(NORMAL)",
	"_pragma=foreign_keys(1)",
	"_pragma=cache_size(-32768)",
	"_txlock=immediate",
}

// readerParams open an existing catalog without writing to it.
var readerParams = []string{
	"mode=ro",
	fmt.Sprintf("_pragma=busy_timeout(%d)", busyTimeoutMS),
	"_pragma=foreign_keys(1)",
	"_pragma=query_only(1)",
}

// fileURI turns a path into an SQLite URI filename. A plain name would have
// its query stripped by the driver; '%', '?' and '#' in the path are escaped
// so that they stay part of the name.
func fileURI(path string, params []string) string {
	esc := strings.NewReplacer("%", "%25", "?", "%3f", "#", "%23").Replace(filepath.ToSlash(path))
	return "file:" + esc + "?" + strings.Join(params, "&")
}

// Open opens (creating if missing) the catalog at path and migrates it to the
// current schema. path may be ":memory:" for tests. A catalog written by a
// newer tidesift is refused before anything touches the file; an older one is
// upgraded (unless ReadOnly, which refuses it).
func Open(ctx context.Context, path string, opt Options) (*Store, error) {
	if path == "" {
		return nil, errors.New("open catalog: empty path")
	}
	if path == MemoryPath {
		return openMemory(ctx, opt)
	}
	s, err := openFile(ctx, path, opt)
	if err != nil {
		return nil, fmt.Errorf("open catalog %s: %w", path, err)
	}
	return s, nil
}

func openMemory(ctx context.Context, opt Options) (*Store, error) {
	db, err := sql.Open("sqlite", ":memory:?_pragma=foreign_keys(1)")
	if err != nil {
		return nil, fmt.Errorf("open catalog :memory:: %w", err)
	}
	// Every connection to ":memory:" is a different, empty database.
	db.SetMaxOpenConns(1)
	if err := schema.Migrate(ctx, db); err != nil {
		db.Close()
		return nil, fmt.Errorf("open catalog :memory:: %w", err)
	}
	return &Store{db: db, path: MemoryPath, readOnly: opt.ReadOnly, memory: true}, nil
}

// hint is appended to errors a user fixes outside tidesift.
const hint = "; check the path and permissions"

func openFile(ctx context.Context, path string, opt Options) (*Store, error) {
	abs, err := filepath.Abs(path)
	if err != nil {
		return nil, err
	}
	dir := filepath.Dir(abs)
	if st, err := os.Stat(dir); err != nil {
		if errors.Is(err, fs.ErrNotExist) {
			return nil, fmt.Errorf("directory %s does not exist%s", dir, hint)
		}
		return nil, fmt.Errorf("%v%s", err, hint)
	} else if !st.IsDir() {
		return nil, fmt.Errorf("%s is not a directory%s", dir, hint)
	}
	exists := false
	if st, err := os.Stat(abs); err == nil {
		if st.IsDir() {
			return nil, fmt.Errorf("%s is a directory, not a catalog file%s", abs, hint)
		}
		exists = true
	} else if !errors.Is(err, fs.ErrNotExist) {
		return nil, fmt.Errorf("%v%s", err, hint)
	}
	if opt.ReadOnly && !exists {
		return nil, fmt.Errorf("no such file%s (create a catalog with init or import first)", hint)
	}
	var extra []string
	if exists {
		// Look at the version through a read-only connection first: the
		// writer's DSN switches the journal to WAL, which would touch a
		// catalog we are about to refuse.
		err := probe(ctx, abs, nil)
		if err != nil && opt.ReadOnly && hasCode(err, sqlite3.SQLITE_CANTOPEN) && !fileExists(abs+"-wal") {
			// A WAL catalog needs a -shm file beside it, which a read-only
			// directory refuses. With no -wal file there are no unmerged
			// transactions, and no writer can start without creating one,
			// so SQLite may treat the file as unchanging.
			extra = []string{"immutable=1"}
			err = probe(ctx, abs, extra)
		}
		if err != nil {
			return nil, err
		}
	}
	if !exists && !opt.ReadOnly {
		if err := create(ctx, abs); err != nil {
			return nil, err
		}
	}
	params := writerParams
	if opt.ReadOnly {
		params = append(append([]string(nil), readerParams...), extra...)
	}
	db, err := sql.Open("sqlite", fileURI(abs, params))
	if err != nil {
		return nil, err
	}
	s := &Store{db: db, path: path, readOnly: opt.ReadOnly}
	if err := s.init(ctx, opt); err != nil {
		db.Close()
		return nil, err
	}
	return s, nil
}

// newPageSize is the page size of a catalog this build creates. A bulk import
// writes every page twice (to the WAL, then into the file at the checkpoint),
// one system call per page: 16 KiB pages instead of SQLite's 4 KiB made a
// 1,000,000-row import about a tenth faster (bench/import.sh; no difference
// measurable at 100,000 rows). Once a file is in
// WAL mode its page size is fixed, so older catalogs keep theirs.
const newPageSize = 16384

// create makes an empty catalog file with newPageSize pages in WAL mode (the
// writer's DSN sets WAL first, which would fix the page size at 4 KiB).
func create(ctx context.Context, abs string) error {
	db, err := sql.Open("sqlite", fileURI(abs, nil))
	if err != nil {
		return err
	}
	defer db.Close()
	db.SetMaxOpenConns(1)
	if _, err := db.ExecContext(ctx, fmt.Sprintf("PRAGMA page_size = %d; PRAGMA journal_mode = WAL", newPageSize)); err != nil {
		return fmt.Errorf("create %s: %w", abs, describe(err))
	}
	return db.Close()
}

// probe refuses a file that is not a catalog this build can read.
func probe(ctx context.Context, abs string, extra []string) error {
	db, err := sql.Open("sqlite", fileURI(abs, append([]string{"mode=ro", fmt.Sprintf("_pragma=busy_timeout(%d)", busyTimeoutMS)}, extra...)))
	if err != nil {
		return err
	}
	defer db.Close()
	db.SetMaxOpenConns(1)
	if _, err := schema.CheckVersion(ctx, db); err != nil {
		return describe(err)
	}
	return nil
}

func (s *Store) init(ctx context.Context, opt Options) error {
	if opt.ReadOnly {
		v, err := schema.CheckVersion(ctx, s.db)
		if err != nil {
			return describe(err)
		}
		if v < schema.CurrentVersion {
			return fmt.Errorf("catalog schema version %d is older than this tidesift (%d); open it once for writing (e.g. import) to upgrade it", v, schema.CurrentVersion)
		}
		return nil
	}
	// A write-protected file opens read-only without complaint; say so now
	// rather than at the first import.
	if ro, err := s.isReadOnly(ctx); err != nil {
		return describe(err)
	} else if ro {
		return fmt.Errorf("the catalog file is read-only%s (open it read-only to only read it)", hint)
	}
	err := withRetry(ctx, func() error { return schema.Migrate(ctx, s.db) })
	if err != nil {
		return describe(err)
	}
	return nil
}

// isReadOnly asks SQLite whether the main database was opened read-only.
func (s *Store) isReadOnly(ctx context.Context) (bool, error) {
	conn, err := s.db.Conn(ctx)
	if err != nil {
		return false, err
	}
	defer conn.Close()
	var ro bool
	err = conn.Raw(func(dc any) error {
		c, ok := dc.(interface {
			IsReadOnly(string) (bool, error)
		})
		if !ok {
			return nil
		}
		var err error
		ro, err = c.IsReadOnly("main")
		return err
	})
	return ro, err
}

func fileExists(path string) bool {
	_, err := os.Stat(path)
	return err == nil
}

// hasCode reports whether err carries the SQLite primary result code.
func hasCode(err error, code int) bool {
	var se *sqlite.Error
	return errors.As(err, &se) && se.Code()&0xff == code
}

// describe turns SQLite's terse open-time errors into ones a user can act on.
// The SQLite error stays in the chain.
func describe(err error) error {
	var se *sqlite.Error
	if errors.Is(err, schema.ErrNewerSchema) || !errors.As(err, &se) {
		return err
	}
	switch se.Code() & 0xff {
	case sqlite3.SQLITE_CANTOPEN:
		return fmt.Errorf("cannot open the file or create its journal (%w)%s", err, hint)
	case sqlite3.SQLITE_READONLY, sqlite3.SQLITE_PERM, sqlite3.SQLITE_AUTH:
		return fmt.Errorf("cannot write (%w)%s", err, hint)
	case sqlite3.SQLITE_NOTADB:
		return fmt.Errorf("not a tidesift catalog (%w)", err)
	case sqlite3.SQLITE_CORRUPT:
		return fmt.Errorf("the catalog file is damaged (%w); restore it from a backup", err)
	case sqlite3.SQLITE_FULL:
		return fmt.Errorf("the disk is full (%w); free space and retry, the catalog is unchanged", err)
	case sqlite3.SQLITE_IOERR:
		return fmt.Errorf("input/output error (%w)%s", err, hint)
	}
	return err
}

// Close closes the catalog, checkpointing the WAL so that the -wal file does
// not stay as large as the last import.
func (s *Store) Close() error {
	if s.db == nil {
		return nil
	}
	if !s.readOnly && !s.memory {
		// Best effort: another process may be reading; SQLite then
		// checkpoints what it can and the last connection to close finishes.
		_, _ = s.db.Exec("PRAGMA wal_checkpoint(TRUNCATE)")
	}
	err := s.db.Close()
	s.db = nil
	return err
}

// Path returns the path the catalog was opened with.
func (s *Store) Path() string { return s.path }

// ReadOnly reports whether the catalog was opened read-only.
func (s *Store) ReadOnly() bool { return s.readOnly }

func (s *Store) now() time.Time {
	if s.Now != nil {
		return s.Now().UTC()
	}
	return time.Now().UTC()
}

// ErrReadOnly is returned by writing methods of a catalog opened read-only.
var ErrReadOnly = errors.New("catalog is open read-only")

// isBusy reports whether err is SQLite's "database is locked" (another
// connection holds a lock longer than busy_timeout).
func isBusy(err error) bool {
	var se *sqlite.Error
	if !errors.As(err, &se) {
		return false
	}
	c := se.Code() & 0xff
	return c == sqlite3.SQLITE_BUSY || c == sqlite3.SQLITE_LOCKED
}

// retryLimit bounds withRetry: with busy_timeout waiting up to 5 s inside each
// attempt, a caller gives up after roughly a minute of continuous contention.
const retryLimit = 10

// retryBase and retryMax bound withRetry's backoff; tests shorten them.
var (
	retryBase = 5 * time.Millisecond
	retryMax  = time.Second
)

// withRetry runs f again, with jittered exponential backoff, while it fails
// because the database is locked. f must be a whole transaction, so a failed
// attempt has written nothing.
func withRetry(ctx context.Context, f func() error) error {
	delay := retryBase
	for attempt := 1; ; attempt++ {
		err := f()
		if err == nil || !isBusy(err) || attempt == retryLimit {
			if err != nil && isBusy(err) {
				return fmt.Errorf("catalog stayed locked by another process after %d attempts: %w", attempt, err)
			}
			return err
		}
		d := delay/2 + rand.N(delay)
		select {
		case <-ctx.Done():
			return ctx.Err()
		case <-time.After(d):
		}
		if delay < retryMax {
			delay *= 2
		}
	}
}

// queryer is what the unexported helpers need: a *sql.DB or a *sql.Tx.
type queryer interface {
	ExecContext(ctx context.Context, query string, args ...any) (sql.Result, error)
	QueryContext(ctx context.Context, query string, args ...any) (*sql.Rows, error)
	QueryRowContext(ctx context.Context, query string, args ...any) *sql.Row
}

// readTx runs f in a read transaction, so that every query sees one revision
// even while another process imports. ReadOnly makes the driver issue a plain
// (deferred) BEGIN, which takes no write lock.
func (s *Store) readTx(ctx context.Context, f func(q queryer) error) error {
	return withRetry(ctx, func() error {
		tx, err := s.db.BeginTx(ctx, &sql.TxOptions{ReadOnly: true})
		if err != nil {
			return err
		}
		defer tx.Rollback()
		return f(tx)
	})
}
