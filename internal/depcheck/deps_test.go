package depcheck

import (
	"bytes"
	"encoding/json"
	"io"
	"os/exec"
	"path/filepath"
	"runtime"
	"strings"
	"testing"
)

// pkg is the part of `go list -json` output the rules need.
type pkg struct {
	ImportPath string
	Standard   bool
	Imports    []string // direct, non-test imports
	Deps       []string // transitive, non-test dependencies
}

// listPackages runs `go list -e -json ./...` at the module root.
func listPackages(tb testing.TB) map[string]pkg {
	tb.Helper()
	goBin := filepath.Join(runtime.GOROOT(), "bin", "go")
	cmd := exec.Command(goBin, "list", "-e", "-json", "./...")
	cmd.Dir = filepath.Join("..", "..")
	var stderr bytes.Buffer
	cmd.Stderr = &stderr
	out, err := cmd.Output()
	if err != nil {
		tb.Fatalf("go list: %v\n%s", err, stderr.String())
	}
	pkgs := map[string]pkg{}
	dec := json.NewDecoder(bytes.NewReader(out))
	for {
		var p pkg
		if err := dec.Decode(&p); err == io.EOF {
			break
		} else if err != nil {
			tb.Fatalf("go list output: %v", err)
		}
		pkgs[p.ImportPath] = p
	}
	if _, ok := pkgs["tidesift/schema"]; !ok {
		tb.Fatalf("go list found no tidesift/schema; is the test run inside the module?")
	}
	return pkgs
}

// under reports whether path is root or a package below it.
func under(path, root string) bool {
	return path == root || strings.HasPrefix(path, root+"/")
}

// rule forbids packages at or below from some imports.
type rule struct {
	from      string   // the rule covers this package and those below it
	noDirect  []string // may not import these directly
	noDepends []string // may not depend on these (or below them), directly or not
}

// rules are tidesift's import rules (see doc.go).
var rules = []rule{
	// database/sql is a direct-import rule only: schema applies its own
	// migrations through database/sql, so every package that uses the data
	// model links it. The driver and the store stay out entirely.
	{from: "tidesift/rank", noDirect: []string{"database/sql", "os"},
		noDepends: []string{"tidesift/store", "tidesift/importers", "tidesift/export", "modernc.org/sqlite"}},
	{from: "tidesift/store", noDepends: []string{"tidesift/rank", "tidesift/export"}},
	{from: "tidesift/export", noDirect: []string{"database/sql"},
		noDepends: []string{"tidesift/store", "modernc.org/sqlite"}},
	{from: "tidesift/importers", noDepends: []string{"tidesift/store", "tidesift/rank", "tidesift/export"}},
}

// violations lists every breach of rules in pkgs, and how many packages the
// rules covered.
func violations(pkgs map[string]pkg, rules []rule) (out []string, covered int) {
	for path, p := range pkgs {
		for _, r := range rules {
			if !under(path, r.from) {
				continue
			}
			covered++
			for _, imp := range p.Imports {
				for _, bad := range r.noDirect {
					if imp == bad {
						out = append(out, path+" imports "+imp+"; the rule for "+r.from+" forbids it")
					}
				}
			}
			for _, dep := range p.Deps {
				for _, bad := range r.noDepends {
					if under(dep, bad) {
						out = append(out, path+" depends on "+dep+"; the rule for "+r.from+" forbids it")
					}
				}
			}
		}
	}
	return out, covered
}

func TestImportRules(t *testing.T) {
	bad, covered := violations(listPackages(t), rules)
	for _, b := range bad {
		t.Error(b)
	}
	if covered == 0 {
		t.Fatal("no package matched any rule")
	}
}

// TestRulesCatchBreaches feeds the checker invented packages that break each
// rule, so a checker that cannot fail is noticed.
func TestRulesCatchBreaches(t *testing.T) {
	pkgs := map[string]pkg{
		"tidesift/rank/mc":       {ImportPath: "tidesift/rank/mc", Imports: []string{"os"}, Deps: []string{"os"}},
		"tidesift/rank":          {ImportPath: "tidesift/rank", Deps: []string{"tidesift/store", "modernc.org/sqlite/lib"}},
		"tidesift/store":         {ImportPath: "tidesift/store", Deps: []string{"tidesift/rank/physics"}},
		"tidesift/export":        {ImportPath: "tidesift/export", Imports: []string{"database/sql"}, Deps: []string{"tidesift/store"}},
		"tidesift/importers/csv": {ImportPath: "tidesift/importers/csv", Deps: []string{"tidesift/schema"}},
		"tidesift/ranking":       {ImportPath: "tidesift/ranking", Imports: []string{"os"}}, // not under tidesift/rank
	}
	bad, _ := violations(pkgs, rules)
	if len(bad) != 6 {
		t.Errorf("found %d breaches, want 6 (os; store; sqlite; rank/physics; database/sql; store):\n%s", len(bad), strings.Join(bad, "\n"))
	}
}

func TestSchemaUsesOnlyTheStandardLibrary(t *testing.T) {
	pkgs := listPackages(t)
	for _, dep := range pkgs["tidesift/schema"].Deps {
		if d, ok := pkgs[dep]; ok && !d.Standard {
			t.Errorf("tidesift/schema depends on %s, outside the standard library", dep)
		}
		if under(dep, "tidesift") {
			t.Errorf("tidesift/schema depends on %s; it is the root of the data flow", dep)
		}
	}
}
