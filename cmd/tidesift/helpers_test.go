package main

import (
	"bytes"
	"context"
	"path/filepath"
	"testing"

	"github.com/spf13/cobra"
)

// testApp is an app writing to buffers, with a fixed clock and an environment
// of its own (nothing leaks in from the test process).
type testApp struct {
	*app
	out, errOut *bytes.Buffer
	env         map[string]string
	dbPath      string // the catalog runCLI passes with --db, in t.TempDir()
}

func newTestApp(tb testing.TB) *testApp {
	tb.Helper()
	ta := &testApp{out: &bytes.Buffer{}, errOut: &bytes.Buffer{}, env: map[string]string{
		"TIDESIFT_NOW": "2026-01-02T03:04:05Z",
	}}
	ta.app = &app{
		streams: streams{In: &bytes.Buffer{}, Out: ta.out, ErrOut: ta.errOut},
		getenv:  func(k string) string { return ta.env[k] },
	}
	ta.dbPath = filepath.Join(tb.TempDir(), "test.db")
	return ta
}

// execute runs sub under a bare root (global flags only) with args, and
// returns the error with its exit status.
func execute(tb testing.TB, a *app, sub *cobra.Command, args ...string) (error, int) {
	tb.Helper()
	root := newBareRootCmd(a)
	root.AddCommand(sub)
	root.SetArgs(args)
	err := root.ExecuteContext(context.Background())
	return err, exitStatus(err)
}

// runCLI runs the whole program on a with args and returns its exit status.
func runCLI(tb testing.TB, a *testApp, args ...string) int {
	tb.Helper()
	root := newRootCmd(a.app)
	root.SetArgs(append([]string{"--db", a.dbPath}, args...))
	return report(a.errOut, root.ExecuteContext(context.Background()))
}

// mustRun is runCLI that fails the test unless the exit status is 0, and
// returns stdout, resetting the buffers.
func mustRun(tb testing.TB, a *testApp, args ...string) string {
	tb.Helper()
	a.out.Reset()
	a.errOut.Reset()
	if code := runCLI(tb, a, args...); code != 0 {
		tb.Fatalf("tidesift %v: exit %d\nstderr:\n%s", args, code, a.errOut)
	}
	return a.out.String()
}
