package sampledata

import (
	"bytes"
	"encoding/csv"
	"math"
	"strconv"
	"strings"
	"testing"
)

// readDemo parses the demo catalog as plain CSV, so these checks hold whatever
// the importers do with it.
func readDemo(tb testing.TB) (header []string, rows []map[string]string) {
	tb.Helper()
	recs, err := csv.NewReader(bytes.NewReader(DemoCatalog())).ReadAll()
	if err != nil {
		tb.Fatalf("demo catalog is not valid CSV: %v", err)
	}
	if len(recs) < 2 {
		tb.Fatalf("demo catalog has %d records, want a header and rows", len(recs))
	}
	header = recs[0]
	for _, r := range recs[1:] {
		m := make(map[string]string, len(header))
		for i, h := range header {
			m[h] = r[i]
		}
		rows = append(rows, m)
	}
	return header, rows
}

func TestDemoIsMarkedInvented(t *testing.T) {
	_, rows := readDemo(t)
	for _, r := range rows {
		if !strings.Contains(r["source"], "invented") {
			t.Errorf("row %q: source %q does not say the value is invented", r["name"], r["source"])
		}
	}
}

func TestDemoScenario(t *testing.T) {
	_, rows := readDemo(t)
	perPlanet := map[string]int{}
	seen := map[string]bool{}
	for _, r := range rows {
		perPlanet[r["planet"]]++
		k := strings.ToLower(r["planet"] + "/" + r["name"])
		if seen[k] {
			t.Errorf("duplicate moon %q of %q", r["name"], r["planet"])
		}
		seen[k] = true
	}
	if perPlanet["Velmira b"] < 8 {
		t.Errorf("Velmira b has %d moons, want at least 8", perPlanet["Velmira b"])
	}
	if perPlanet["Teodra b"] != 4 {
		t.Errorf("Teodra b has %d moons, want 4 exomoon candidates", perPlanet["Teodra b"])
	}
}

func TestDemoHasGapsAndWideUncertainties(t *testing.T) {
	_, rows := readDemo(t)
	var missingK2Q, missingAlbedo, asym, ranges, factors int
	for _, r := range rows {
		if r["planet"] != "Teodra b" {
			continue
		}
		if r["k2_q"] == "" && r["k2"] == "" {
			missingK2Q++
		}
		if r["bond_albedo"] == "" {
			missingAlbedo++
		}
		for k, v := range r {
			if v == "" {
				continue
			}
			switch {
			case strings.HasSuffix(k, "_err_plus"):
				asym++
			case strings.HasSuffix(k, "_min"):
				ranges++
			case strings.HasSuffix(k, "_factor"):
				factors++
			}
		}
	}
	if missingK2Q == 0 || missingAlbedo == 0 || asym == 0 || ranges == 0 || factors == 0 {
		t.Errorf("exomoon candidates: %d without k2/Q, %d without albedo, %d asymmetric, %d ranges, %d factors; want each ≥ 1",
			missingK2Q, missingAlbedo, asym, ranges, factors)
	}
}

// TestDemoPeriodsFollowKepler keeps the invented orbits self-consistent: where a
// period is given it matches Kepler's third law from the semi-major axis and the
// planet's mass within 1 %. Constants: CODATA 2018 G; IAU 2015 Resolution B3
// nominal (GM)J = 1.2668653e17 m³ s⁻²; 1 d = 86400 s.
func TestDemoPeriodsFollowKepler(t *testing.T) {
	const (
		gmJupiter = 1.2668653e17 // m³/s², IAU 2015 Resolution B3 nominal
		G         = 6.67430e-11  // m³ kg⁻¹ s⁻², CODATA 2018
	)
	_, rows := readDemo(t)
	num := func(r map[string]string, k string) float64 {
		t.Helper()
		v, err := strconv.ParseFloat(r[k], 64)
		if err != nil {
			t.Fatalf("row %q column %q: %v", r["name"], k, err)
		}
		return v
	}
	checked := 0
	for _, r := range rows {
		if r["period [d]"] == "" {
			continue
		}
		gm := num(r, "planet_mass [jupiterMass]")*gmJupiter + G*num(r, "mass [kg]")
		a := num(r, "semi_major_axis [km]") * 1e3
		want := 2 * math.Pi * math.Sqrt(a*a*a/gm) / 86400
		got := num(r, "period [d]")
		if math.Abs(got-want) > 0.01*want {
			t.Errorf("%s: period %g d, Kepler gives %.4f d", r["name"], got, want)
		}
		checked++
	}
	if checked < 8 {
		t.Errorf("checked %d periods, want the eight Velmira b moons", checked)
	}
}

// TestDemoObliquityGaps keeps the demo's assumed-input mark meaningful: most
// Velmira b moons give an obliquity, each with an uncertainty, and some give
// none, so a ranking assumes the prior for those moons only.
func TestDemoObliquityGaps(t *testing.T) {
	_, rows := readDemo(t)
	var given, missing []string
	for _, r := range rows {
		if r["planet"] != "Velmira b" {
			continue
		}
		if r["obliquity [deg]"] == "" {
			missing = append(missing, r["name"])
			continue
		}
		given = append(given, r["name"])
		if r["obliquity_err"] == "" {
			t.Errorf("%s: obliquity %s without an uncertainty", r["name"], r["obliquity [deg]"])
		}
	}
	if len(given) <= len(missing) || len(missing) == 0 {
		t.Errorf("Velmira b moons with an obliquity %v, without %v; want most with and at least one without", given, missing)
	}
}
