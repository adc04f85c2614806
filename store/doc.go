// Package store keeps a tidesift catalog in one SQLite file: revisions,
// bodies (stars, planets, moons), their parameter values with uncertainty and
// source, and the history of every value.
//
// Open applies the schema migrations (package schema) and refuses a catalog
// written by a newer tidesift without touching it. The connection settings
// (WAL journal, foreign keys, busy timeout, immediate write transactions) are
// in the DSN, so every pooled connection has them. Each exported method is one
// transaction: an Import writes all of its records or none, and a Snapshot
// reads one consistent revision even while another process imports.
//
// A value row carries the revision that set it and the revision that
// superseded it, so the catalog as of any revision is one query:
//
//	st, err := store.Open(ctx, "tidesift.db", store.Options{})
//	res, err := st.Import(ctx, store.ImportRequest{File: "moons.csv", SHA256: sum, Records: recs})
//	// res.Revision.ID == 1; res.Added values added
//	cat, err := st.Snapshot(ctx, 0)            // latest; cat.Moons sorted by (planet, name)
//	old, err := st.Snapshot(ctx, 1)            // as of revision 1
//	changes, err := st.Diff(ctx, 1, 2)         // what revision 2 changed
//	report, err := st.Check(ctx)               // integrity, domains, orphans
//
// Re-importing a file with the same SHA-256 is a no-op (ImportResult.Duplicate),
// and an import that changes nothing makes no revision.
package store
