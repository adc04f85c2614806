package main

import (
	"errors"
	"flag"
	"os/exec"
	"strconv"
	"testing"

	"github.com/rogpeppe/go-internal/testscript"
)

var update = flag.Bool("update", false, "rewrite the golden files inside testdata/script/*.txtar")

// TestMain lets testscript run this test binary as the tidesift command.
func TestMain(m *testing.M) {
	testscript.Main(m, map[string]func(){"tidesift": main})
}

// TestScripts drives the real program end to end: each testdata/script/*.txtar
// imports files, lists, shows and ranks, and compares the output with goldens
// kept in the same archive (`go test ./cmd/tidesift -run TestScripts -update`
// rewrites them).
func TestScripts(t *testing.T) {
	testscript.Run(t, testscript.Params{
		Dir:           "testdata/script",
		UpdateScripts: *update,
		Setup: func(env *testscript.Env) error {
			// Revisions get a fixed time, so outputs that show it are stable.
			env.Setenv("TIDESIFT_NOW", "2026-01-02T03:04:05Z")
			return nil
		},
		Cmds: map[string]func(ts *testscript.TestScript, neg bool, args []string){
			"exits": cmdExits,
		},
	})
}

// cmdExits is the script command `exits N PROG ARGS...`: it runs PROG like
// exec and fails unless the exit status is exactly N. Its stdout and stderr
// can be checked afterwards like exec's.
func cmdExits(ts *testscript.TestScript, neg bool, args []string) {
	if neg || len(args) < 2 {
		ts.Fatalf("usage: exits N PROG [ARGS...]")
	}
	want, err := strconv.Atoi(args[0])
	if err != nil {
		ts.Fatalf("exits: bad status %q", args[0])
	}
	got := 0
	if err := ts.Exec(args[1], args[2:]...); err != nil {
		var ee *exec.ExitError
		if !errors.As(err, &ee) {
			ts.Fatalf("exits: %v", err)
		}
		got = ee.ExitCode()
	}
	if got != want {
		ts.Fatalf("%s exited with status %d, want %d", args[1], got, want)
	}
}
