// Package store keeps a tidesift catalog in one SQLite file: revisions,
// bodies (stars, planets, moons), their parameter values with uncertainty and
// source, and the history of every value.
//
// Open applies the schema migrations (package schema) and refuses a catalog
// written by a newer tidesift without touching it. The connection settings
// (WAL journal, foreign keys, busy timeout, immediate write transactions) are
// in the DSN, so every pooled connection has them. Each exported method is one
// transaction: an Import writes all of its records or none, and a Snapshot,
// History, Diff or Check reads one consistent revision even while another
// process imports. Writers in several processes wait for each other (SQLite's
// busy timeout, then a retry with backoff), so "database is locked" does not
// reach the caller unless another process holds the catalog for about a
// minute.
//
// A value row carries the revision that set it and the revision that
// superseded it, so the catalog as of any revision is one query:
//
//	st, err := store.Open(ctx, "tidesift.db", store.Options{})
//	res, err := st.Import(ctx, store.ImportRequest{File: "moons.csv", SHA256: sum, Records: recs})
//	// res.Revision.ID == 1; res.Added values added
//	cat, err := st.Snapshot(ctx, 0)    // latest; cat.Moons sorted by (planet, name)
//	old, err := st.Snapshot(ctx, 1)    // as of revision 1
//	changes, err := st.Diff(ctx, 1, 2) // what revision 2 changed (Diff(2, 1) undoes it)
//	report, err := st.Check(ctx)       // integrity, domains, orphans; report.OK()
//
// Re-importing a file with the same SHA-256 is a no-op (ImportResult.Duplicate),
// and an import that changes nothing makes no revision. Matching follows
// schema.NameKey: a moon is found by name or alias under its planet, and a
// name that reaches several bodies is an error listing them (ErrAmbiguous).
//
// Large imports: records are applied with prepared, batched statements in one
// transaction. ImportResult.Changes holds every added or changed value, about
// 230 bytes each; set ImportRequest.OmitAdded (list changed values only) or
// OmitChanges (counts only) for files of a million values. BenchmarkImport and
// BenchmarkImportLarge measure the speed and the heap.
package store
