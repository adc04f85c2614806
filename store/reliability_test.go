package store

// Reliability tests that need more than one process. The test binary re-runs
// itself as a child (TestMain checks childEnv) to import or read a shared
// catalog file; the parent kills children with SIGKILL, or runs several at
// once, and then inspects the file.

import (
	"bufio"
	"bytes"
	"context"
	"errors"
	"fmt"
	"math/rand/v2"
	"os"
	"os/exec"
	"path/filepath"
	"runtime"
	"strconv"
	"strings"
	"sync"
	"syscall"
	"testing"
	"time"

	"tidesift/schema"
)

const childEnv = "TIDESIFT_STORE_TEST_CHILD"

func TestMain(m *testing.M) {
	if mode := os.Getenv(childEnv); mode != "" {
		os.Exit(runChild(mode))
	}
	os.Exit(m.Run())
}

// crashMoons is how many moons each child import adds; each has
// crashParams values, and no planet or star values, so a whole revision
// holds exactly crashMoons*crashParams values and crashMoons new moons.
const (
	crashMoons  = 300
	crashParams = 9
)

// crashRecords are the invented moons of one child import, all new.
func crashRecords(tag string) []schema.Record {
	recs := synthRecords(crashMoons, 5, 0)
	for i := range recs {
		recs[i].Name = fmt.Sprintf("Moon %s %d", tag, i)
		recs[i].Star = ""
		var ps []schema.Param
		for _, p := range recs[i].Params {
			if p.Key != "planet_mass" {
				ps = append(ps, p)
			}
		}
		recs[i].Params = ps
	}
	return recs
}

// runChild is the child process: env TIDESIFT_DB is the catalog,
// TIDESIFT_TAG names its imports, TIDESIFT_COUNT how many to make.
func runChild(mode string) int {
	ctx := context.Background()
	path := os.Getenv("TIDESIFT_DB")
	s, err := Open(ctx, path, Options{ReadOnly: mode == "snapshot"})
	if err != nil {
		fmt.Fprintln(os.Stderr, "child:", err)
		return 1
	}
	defer s.Close()
	switch mode {
	case "import":
		tag := os.Getenv("TIDESIFT_TAG")
		n, _ := strconv.Atoi(os.Getenv("TIDESIFT_COUNT"))
		for k := 0; k < n; k++ {
			file := fmt.Sprintf("%s-%d", tag, k)
			res, err := s.Import(ctx, ImportRequest{File: file, SHA256: sum(file), Records: crashRecords(file), OmitChanges: true})
			if err != nil {
				fmt.Fprintln(os.Stderr, "child import:", err)
				return 1
			}
			// The parent reads this after a kill: everything reported
			// committed must survive.
			fmt.Printf("committed %s %d\n", file, res.Revision.ID)
		}
		return 0
	case "snapshot":
		stop := os.Getenv("TIDESIFT_STOP")
		snaps := 0
		for {
			c, err := s.Snapshot(ctx, 0)
			if err != nil {
				fmt.Fprintln(os.Stderr, "child snapshot:", err)
				return 1
			}
			if err := wholeSnapshot(c); err != nil {
				fmt.Fprintln(os.Stderr, "child snapshot:", err)
				return 1
			}
			snaps++
			if _, err := os.Stat(stop); err == nil {
				fmt.Printf("snapshots %d\n", snaps)
				return 0
			}
		}
	}
	fmt.Fprintln(os.Stderr, "child: unknown mode", mode)
	return 2
}

// wholeSnapshot checks that a snapshot holds whole imports only: every
// import's moons all there with all their values, and as many imports as
// its revision number says.
func wholeSnapshot(c *schema.Catalog) error {
	perImport := map[string]int{}
	for _, m := range c.Moons {
		if len(m.Params) != crashParams {
			return fmt.Errorf("revision %d: moon %s has %d values, want %d", c.Revision.ID, m.Name, len(m.Params), crashParams)
		}
		f := strings.Fields(m.Name)
		perImport[f[1]]++
	}
	for tag, n := range perImport {
		if n != crashMoons {
			return fmt.Errorf("revision %d: import %s has %d moons, want %d", c.Revision.ID, tag, n, crashMoons)
		}
	}
	if int64(len(perImport)) != c.Revision.ID {
		return fmt.Errorf("revision %d holds %d imports", c.Revision.ID, len(perImport))
	}
	return nil
}

func childCmd(tb testing.TB, mode, path string, env ...string) *exec.Cmd {
	tb.Helper()
	exe, err := os.Executable()
	if err != nil {
		tb.Fatal(err)
	}
	cmd := exec.Command(exe, "-test.run=^$")
	cmd.Env = append(os.Environ(), append([]string{childEnv + "=" + mode, "TIDESIFT_DB=" + path}, env...)...)
	return cmd
}

// revisionsWhole checks every revision of a crash-test catalog holds exactly
// one whole import, and returns the files of the revisions present.
func revisionsWhole(tb testing.TB, s *Store) map[string]bool {
	tb.Helper()
	held := valuesPerRevision(tb, s)
	rows, err := s.db.Query(`SELECT r.id, r.file, r.changes, ifnull(b.n, 0)
		FROM revision r
		LEFT JOIN (SELECT created_rev, count(*) AS n FROM body WHERE kind = 'moon' GROUP BY created_rev) b ON b.created_rev = r.id
		ORDER BY r.id`)
	if err != nil {
		tb.Fatal(err)
	}
	defer rows.Close()
	files := map[string]bool{}
	for rows.Next() {
		var id int64
		var file string
		var changes, moons int
		if err := rows.Scan(&id, &file, &changes, &moons); err != nil {
			tb.Fatal(err)
		}
		values := held[id]
		if changes != crashMoons*crashParams || values != changes || moons != crashMoons {
			tb.Errorf("revision %d (%s): %d changes, %d values, %d moons; want %d, %d, %d",
				id, file, changes, values, moons, crashMoons*crashParams, crashMoons*crashParams, crashMoons)
		}
		files[file] = true
	}
	if err := rows.Err(); err != nil {
		tb.Fatal(err)
	}
	var stray int
	if err := s.db.QueryRow(`SELECT (SELECT count(*) FROM state WHERE set_rev NOT IN (SELECT id FROM revision))
		+ (SELECT count(*) FROM body WHERE created_rev NOT IN (SELECT id FROM revision))`).Scan(&stray); err != nil {
		tb.Fatal(err)
	}
	if stray != 0 {
		tb.Errorf("%d rows belong to no revision", stray)
	}
	return files
}

func integrityOK(tb testing.TB, s *Store) {
	tb.Helper()
	var msg string
	if err := s.db.QueryRow("PRAGMA integrity_check").Scan(&msg); err != nil {
		tb.Fatal(err)
	}
	if msg != "ok" {
		tb.Fatalf("integrity_check: %s", msg)
	}
}

// TestCrashSafety kills an importing child process at random moments and
// checks after each kill that the catalog opens, passes integrity_check, and
// holds every revision either whole or not at all, including every revision
// the child reported committed.
func TestCrashSafety(t *testing.T) {
	if runtime.GOOS == "windows" {
		t.Skip("uses SIGKILL")
	}
	kills := 20
	if testing.Short() {
		kills = 5
	}
	path := filepath.Join(t.TempDir(), "crash.db")
	s := mustOpen(t, path)
	s.Close()
	rng := rand.New(rand.NewPCG(20261201, 7)) // fixed seed: the same kill moments every run
	committed := map[string]bool{}
	// Calibrate: how long a child takes to start and commit one import on
	// this machine (much longer under -race or on a loaded machine). Kill
	// moments are drawn from 0.3 to 3 times that, so kills land during
	// start-up, during a first import and during later ones.
	start := time.Now()
	if out, err := childCmd(t, "import", path, "TIDESIFT_TAG=calibrate", "TIDESIFT_COUNT=1").CombinedOutput(); err != nil {
		t.Fatalf("calibration child: %v\n%s", err, out)
	}
	unit := time.Since(start)
	committed["calibrate-0"] = true
	var verify time.Duration
	afterCommit := 0
	for i := 0; i < kills; i++ {
		cmd := childCmd(t, "import", path, fmt.Sprintf("TIDESIFT_TAG=k%d", i), "TIDESIFT_COUNT=50")
		var stderr bytes.Buffer
		cmd.Stderr = &stderr
		out, err := cmd.StdoutPipe()
		if err != nil {
			t.Fatal(err)
		}
		if err := cmd.Start(); err != nil {
			t.Fatal(err)
		}
		var lines []string
		done := make(chan struct{})
		go func() {
			sc := bufio.NewScanner(out)
			for sc.Scan() {
				lines = append(lines, sc.Text())
			}
			close(done)
		}()
		delay := time.Duration((0.3 + 2.7*rng.Float64()) * float64(unit))
		time.Sleep(delay)
		cmd.Process.Signal(syscall.SIGKILL)
		<-done
		err = cmd.Wait()
		var ee *exec.ExitError
		if !errors.As(err, &ee) || ee.Sys().(syscall.WaitStatus).Signal() != syscall.SIGKILL {
			t.Fatalf("kill %d: child ended with %v, stderr: %s", i, err, stderr.String())
		}
		for _, l := range lines {
			if f := strings.Fields(l); len(f) == 3 && f[0] == "committed" {
				committed[f[1]] = true
			}
		}
		if len(lines) > 0 {
			afterCommit++ // the child had committed at least once, so it was killed in a later import
		}

		t0 := time.Now()
		s, err := Open(context.Background(), path, Options{})
		if err != nil {
			t.Fatalf("after kill %d (%v): Open: %v", i, delay, err)
		}
		integrityOK(t, s)
		present := revisionsWhole(t, s)
		for f := range committed {
			if !present[f] {
				t.Errorf("after kill %d: revision %s was reported committed but is missing", i, f)
			}
		}
		s.Close()
		verify += time.Since(t0)
	}
	t.Logf("reopening and verifying took %v in all", verify)
	s = mustOpen(t, path)
	rep, err := s.Check(context.Background())
	if err != nil {
		t.Fatal(err)
	}
	if !rep.OK() {
		t.Errorf("Check after %d kills:\n%s", kills, rep)
	}
	t.Logf("%d kills at 0.3–3 × %v (%d after the child had committed an import), %d revisions committed and all present whole",
		kills, unit.Round(time.Millisecond), afterCommit, len(committed))
	if afterCommit == 0 {
		t.Error("no child committed before its kill: the kill moments test only start-up")
	}
}

// TestConcurrentProcesses runs two importing processes and one snapshotting
// process on one catalog at once.
func TestConcurrentProcesses(t *testing.T) {
	path := filepath.Join(t.TempDir(), "shared.db")
	s := mustOpen(t, path)
	s.Close()
	stop := filepath.Join(t.TempDir(), "stop")
	type child struct {
		cmd            *exec.Cmd
		stdout, stderr bytes.Buffer
	}
	var children []*child
	for _, tag := range []string{"a", "b"} {
		c := &child{cmd: childCmd(t, "import", path, "TIDESIFT_TAG="+tag, "TIDESIFT_COUNT=3")}
		children = append(children, c)
	}
	reader := &child{cmd: childCmd(t, "snapshot", path, "TIDESIFT_STOP="+stop)}
	children = append(children, reader)
	for _, c := range children {
		c.cmd.Stdout, c.cmd.Stderr = &c.stdout, &c.stderr
		if err := c.cmd.Start(); err != nil {
			t.Fatal(err)
		}
	}
	var wg sync.WaitGroup
	errs := make([]error, len(children))
	for i, c := range children[:2] {
		wg.Add(1)
		go func() { defer wg.Done(); errs[i] = c.cmd.Wait() }()
	}
	wg.Wait()
	os.WriteFile(stop, nil, 0o644)
	errs[2] = reader.cmd.Wait()
	for i, c := range children {
		if errs[i] != nil {
			t.Errorf("child %d: %v\nstderr: %s", i, errs[i], c.stderr.String())
		}
		if strings.Contains(c.stderr.String(), "locked") {
			t.Errorf("child %d saw a lock error: %s", i, c.stderr.String())
		}
	}
	s = mustOpen(t, path)
	present := revisionsWhole(t, s)
	if len(present) != 6 {
		t.Errorf("%d revisions, want 6 (3 from each importer): %v", len(present), present)
	}
	integrityOK(t, s)
	t.Logf("reader: %s", strings.TrimSpace(reader.stdout.String()))
}

// TestFullDisk limits the catalog's size with PRAGMA max_page_count (a
// stand-in for a full disk: SQLite returns the same SQLITE_FULL) and checks
// that a large import fails clearly and leaves the catalog as it was.
func TestFullDisk(t *testing.T) {
	ctx := context.Background()
	path := filepath.Join(t.TempDir(), "full.db")
	s := mustOpen(t, path)
	mustImport(t, s, firstFile())
	before := mustSnapshot(t, s, 0).ContentHash
	s.db.SetMaxOpenConns(1) // so the pragma below holds for the import's connection
	var pages int
	if err := s.db.QueryRow("PRAGMA page_count").Scan(&pages); err != nil {
		t.Fatal(err)
	}
	if _, err := s.db.Exec(fmt.Sprintf("PRAGMA max_page_count = %d", pages+20)); err != nil {
		t.Fatal(err)
	}
	_, err := s.Import(ctx, ImportRequest{File: "big.csv", SHA256: sum("big"), Records: synthRecords(5000, 3, 0)})
	if err == nil || !strings.Contains(err.Error(), "disk is full") || !strings.Contains(err.Error(), "catalog is unchanged") {
		t.Fatalf("Import on a full catalog = %v, want a clear 'disk is full' error", err)
	}
	t.Log(err)
	if got := mustSnapshot(t, s, 0).ContentHash; got != before {
		t.Error("catalog changed after a failed import")
	}
	if revs, _ := s.Revisions(ctx); len(revs) != 1 {
		t.Errorf("%d revisions after a failed import, want 1", len(revs))
	}
	rep, err := s.Check(ctx)
	if err != nil || !rep.OK() {
		t.Errorf("Check = %v, %v", rep, err)
	}
	// With room again, the same import succeeds.
	if _, err := s.db.Exec("PRAGMA max_page_count = 1073741823"); err != nil {
		t.Fatal(err)
	}
	if res := mustImport(t, s, ImportRequest{File: "big.csv", SHA256: sum("big"), Records: synthRecords(5000, 3, 0)}); res.Revision == nil {
		t.Error("import after freeing space made no revision")
	}
}
