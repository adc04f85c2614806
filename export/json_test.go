package export

import (
	"bytes"
	"encoding/json"
	"math"
	"reflect"
	"strings"
	"testing"

	"tidesift/rank"
)

// With finite numbers WriteJSON must give exactly what encoding/json gives for
// the contract's struct tags: this catches any field the encoder mishandles,
// including fields added to rank.Result later.
func TestWriteJSONMatchesEncodingJSON(t *testing.T) {
	r := sampleResult()
	r.Targets[1].Metrics.IceShellThickness.P95 = 1.5e5 // finite everywhere
	r.Targets[2].Metrics.IceShellThickness = q(1, 2, 3)
	r.Targets[2].Drivers = nil // a nil slice is null in both
	want, err := json.MarshalIndent(r, "", "  ")
	if err != nil {
		t.Fatal(err)
	}
	var got bytes.Buffer
	if err := WriteJSON(&got, r); err != nil {
		t.Fatal(err)
	}
	if got.String() != string(want)+"\n" {
		t.Errorf("WriteJSON differs from json.MarshalIndent:\n got: %s\nwant: %s", got.String(), want)
	}
}

// The encoder's corners against encoding/json: 'e' notation, negative
// numbers, HTML-escaped and non-ASCII strings, empty and nil slices and maps.
func TestWriteJSONMatchesEncodingJSONCorners(t *testing.T) {
	r := syntheticResult(40)
	tg := &r.Targets[0]
	tg.Name = "Velra <b> & \"I\" \u2028 é \x7f"
	tg.Score = q(-1e-7, 1.5e-300, 1e22)
	tg.Metrics.TidalForce = q(5e20, 9.99e20, 1e21)
	tg.AssumedInputs = []string{}
	tg.Drivers = []rank.Driver{}
	tg.Metrics.Retention = map[string]float64{}
	tg.Flags = map[string]float64{"no_ice": 1}
	tg.Notes = []string{"a note"}
	r.Targets[1].AssumedInputs = nil
	r.Targets[1].Metrics.Retention = nil
	r.Excluded = []rank.Excluded{{Name: "Osk c IX", Missing: nil}}
	r.Warnings = []string{}
	r.Seed = 1<<64 - 1
	want, err := json.MarshalIndent(r, "", "  ")
	if err != nil {
		t.Fatal(err)
	}
	var got bytes.Buffer
	if err := WriteJSON(&got, r); err != nil {
		t.Fatal(err)
	}
	if got.String() != string(want)+"\n" {
		g, w := got.String(), string(want)+"\n"
		i := 0
		for i < len(g) && i < len(w) && g[i] == w[i] {
			i++
		}
		t.Errorf("WriteJSON differs from json.MarshalIndent at byte %d:\n got …%.80q\nwant …%.80q", i, g[max(0, i-40):], w[max(0, i-40):])
	}
}

func TestWriteJSONNonFiniteIsNull(t *testing.T) {
	r := sampleResult() // Targets[1] has +Inf, Targets[2] NaN
	if _, err := json.Marshal(r); err == nil {
		t.Fatal("precondition: encoding/json should refuse NaN/Inf")
	}
	var buf bytes.Buffer
	if err := WriteJSON(&buf, r); err != nil {
		t.Fatal(err)
	}
	var doc struct {
		Targets []struct {
			Metrics map[string]json.RawMessage `json:"metrics"`
		} `json:"targets"`
	}
	if err := json.Unmarshal(buf.Bytes(), &doc); err != nil {
		t.Fatalf("output is not JSON: %v\n%s", err, buf.String())
	}
	shell := func(i int) map[string]*float64 {
		var m map[string]*float64
		if err := json.Unmarshal(doc.Targets[i].Metrics["ice_shell_thickness_m"], &m); err != nil {
			t.Fatal(err)
		}
		return m
	}
	if m := shell(1); m["p95"] != nil || m["p50"] == nil || *m["p50"] != 70e3 {
		t.Errorf("target 2 ice shell = %v, want p95 null and p50 70000", m)
	}
	if m := shell(2); m["p05"] != nil || m["p50"] != nil || m["p95"] != nil {
		t.Errorf("target 3 ice shell = %v, want all null", m)
	}
}

// TestWriteJSONRoundTrip parses the document back into a rank.Result and
// compares every contract field (null reads back as 0, so NaN/Inf cells are
// compared as such).
func TestWriteJSONRoundTrip(t *testing.T) {
	r := sampleResult()
	var buf bytes.Buffer
	if err := WriteJSON(&buf, r); err != nil {
		t.Fatal(err)
	}
	var back rank.Result
	if err := json.Unmarshal(buf.Bytes(), &back); err != nil {
		t.Fatal(err)
	}
	want := *r
	want.ProfileTOML, want.Revision = "", back.Revision // not part of the document
	want.Targets = append([]rank.Target(nil), r.Targets...)
	for i := range want.Targets {
		tg := &want.Targets[i]
		tg.Inputs, tg.Priors = nil, nil
		zeroNonFinite(&tg.Metrics.IceShellThickness)
	}
	if !reflect.DeepEqual(back, want) {
		t.Errorf("round trip differs:\n got %+v\nwant %+v", back, want)
	}
	for _, name := range []string{`"format_version": 2`, `"catalog_revision": 7`, `"seed": 42`, `"tidal_power_w"`, `"retention"`} {
		if !strings.Contains(buf.String(), name) {
			t.Errorf("document lacks %s", name)
		}
	}
}

func zeroNonFinite(q *rank.Quantiles) {
	for _, p := range []*float64{&q.P05, &q.P50, &q.P95} {
		if math.IsNaN(*p) || math.IsInf(*p, 0) {
			*p = 0
		}
	}
}

func TestWriteJSONStable(t *testing.T) {
	var a, b bytes.Buffer
	if err := WriteJSON(&a, sampleResult()); err != nil {
		t.Fatal(err)
	}
	if err := WriteJSON(&b, sampleResult()); err != nil {
		t.Fatal(err)
	}
	if a.String() != b.String() {
		t.Error("two writes of equal results differ")
	}
	checkGolden(t, "ranking.json.golden", a.Bytes())
}

func TestWriteNil(t *testing.T) {
	var buf bytes.Buffer
	for name, err := range map[string]error{
		"json":  WriteJSON(&buf, nil),
		"csv":   WriteCSV(&buf, nil),
		"table": WriteTable(&buf, nil, TableOptions{}),
	} {
		if err == nil {
			t.Errorf("%s: nil result accepted", name)
		}
	}
}
