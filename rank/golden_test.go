package rank

import (
	"encoding/json"
	"flag"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"testing"
)

var update = flag.Bool("update", false, "rewrite the golden files in testdata/")

// TestGolden pins the whole JSON document for the invented test catalog, seed
// 1, 500 samples, so any change of method or generator shows up. Numbers are
// compared with a relative tolerance of 1e-9 (last-bit differences of math
// functions between architectures); everything else exactly.
func TestGolden(t *testing.T) {
	res := mustRun(t, testCatalog(), mustProfile(t, "ocean"), Options{Samples: 500, Seed: 1})
	res.GOARCH = "any" // recorded separately; the golden holds for every architecture
	got, err := json.MarshalIndent(res, "", "  ")
	if err != nil {
		t.Fatal(err)
	}
	path := filepath.Join("testdata", "ocean-seed1.golden.json")
	if *update {
		if err := os.MkdirAll("testdata", 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(path, append(got, '\n'), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	want, err := os.ReadFile(path)
	if err != nil {
		t.Fatalf("%v (run go test -run TestGolden -update to create it)", err)
	}
	var g, w any
	if err := json.Unmarshal(got, &g); err != nil {
		t.Fatal(err)
	}
	if err := json.Unmarshal(want, &w); err != nil {
		t.Fatal(err)
	}
	if diff := jsonDiff("", g, w); diff != "" {
		t.Errorf("result differs from %s (go test -run TestGolden -update rewrites it): %s", path, diff)
	}
}

func jsonDiff(at string, got, want any) string {
	switch w := want.(type) {
	case map[string]any:
		g, ok := got.(map[string]any)
		if !ok || len(g) != len(w) {
			return fmt.Sprintf("%s: got %v, want %v", at, got, want)
		}
		for k := range w {
			if d := jsonDiff(at+"."+k, g[k], w[k]); d != "" {
				return d
			}
		}
	case []any:
		g, ok := got.([]any)
		if !ok || len(g) != len(w) {
			return fmt.Sprintf("%s: got %v, want %v", at, got, want)
		}
		for i := range w {
			if d := jsonDiff(fmt.Sprintf("%s[%d]", at, i), g[i], w[i]); d != "" {
				return d
			}
		}
	case float64:
		g, ok := got.(float64)
		if !ok || math.Abs(g-w) > 1e-9*math.Abs(w) {
			return fmt.Sprintf("%s: got %v, want %v", at, got, want)
		}
	default:
		if got != want {
			return fmt.Sprintf("%s: got %v, want %v", at, got, want)
		}
	}
	return ""
}
