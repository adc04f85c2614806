package sampledata_test

import (
	"bytes"
	"testing"

	"tidesift/importers"
	"tidesift/sampledata"
)

// TestDemoImportsCleanly reads the demo through the real importers: every row
// valid, every value converted, nothing rejected.
func TestDemoImportsCleanly(t *testing.T) {
	res, err := importers.Read(sampledata.DemoFileName, bytes.NewReader(sampledata.DemoCatalog()), importers.Options{})
	if err != nil {
		t.Fatalf("demo catalog refused:\n%v", err)
	}
	if len(res.Records) != 12 || len(res.Rejects) != 0 {
		t.Fatalf("%d records, %d rejects; want 12 and 0", len(res.Records), len(res.Rejects))
	}
	byName := map[string]int{}
	for i, r := range res.Records {
		byName[r.Name] = i
	}
	// Spot checks of unit conversion (IAU 2012 au; 1 d = 86400 s).
	for _, c := range []struct {
		moon, key string
		want      float64
	}{
		{"Varkesh", "radius", 1.75e6},
		{"Varkesh", "star_distance", 5.60 * 149_597_870_700},
		{"Ilmeth", "period", 2.9013 * 86400},
		{"Otharo", "obliquity", 14 * 3.141592653589793 / 180},
	} {
		i, ok := byName[c.moon]
		if !ok {
			t.Fatalf("no record for %s", c.moon)
		}
		found := false
		for _, p := range res.Records[i].Params {
			if p.Key == c.key {
				found = true
				if d := p.Value/c.want - 1; d > 1e-12 || d < -1e-12 {
					t.Errorf("%s %s = %g, want %g", c.moon, c.key, p.Value, c.want)
				}
			}
		}
		if !found {
			t.Errorf("%s has no %s", c.moon, c.key)
		}
	}
}
