// Package depcheck holds no code: its test states tidesift's import rules and
// fails when a package breaks them, after the Go standard library's own
// go/build/deps_test.go.
//
// The rules keep data flowing one way, importers → store → rank → export, with
// the command line as the only package that sees everything:
//
//   - schema imports only the standard library;
//   - rank (and every package under it) never imports database/sql or os, and
//     never depends on the store, the importers or the SQL driver;
//   - store never depends on rank or export;
//   - export never imports database/sql and never depends on store or the driver;
//   - importers never depend on store, rank or export.
//
// Run it with `go test ./internal/depcheck`.
package depcheck
