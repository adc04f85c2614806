package profile

import (
	"errors"
	"io/fs"
	"math"
	"reflect"
	"strings"
	"testing"

	"tidesift/rank/physics"
)

func TestBuiltins(t *testing.T) {
	names := BuiltinNames()
	if len(names) < 3 {
		t.Fatalf("built-ins %v: want at least three", names)
	}
	for _, n := range names {
		p, err := Builtin(n)
		if err != nil {
			t.Fatalf("%s: %v", n, err)
		}
		if p.Name != n {
			t.Errorf("%s: name %q", n, p.Name)
		}
		if !strings.Contains(p.header, "triage aid") {
			t.Errorf("%s: header comment does not say the score is a triage aid", n)
		}
		if len(p.Criteria) == 0 || p.TopK < 1 {
			t.Errorf("%s: %d criteria, top_k %d", n, len(p.Criteria), p.TopK)
		}
		if _, ok := p.Prior(RockDensityKey); !ok {
			t.Errorf("%s: no rock_density prior", n)
		}
	}
}

func TestModelDefaults(t *testing.T) {
	p, err := Parse("min.toml", []byte("[[criterion]]\nmetric = \"ocean\"\ntransfer = \"ramp\"\nlo = 0\nhi = 1\n"))
	if err != nil {
		t.Fatal(err)
	}
	if p.Model != physics.DefaultOptions() {
		t.Errorf("model %+v, want the physics defaults", p.Model)
	}
	if p.Name != "min" || p.TopK != DefaultTopK || p.Criteria[0].Weight != 1 {
		t.Errorf("defaults: name %q top_k %d weight %g", p.Name, p.TopK, p.Criteria[0].Weight)
	}
	q, err := Builtin("ocean")
	if err != nil {
		t.Fatal(err)
	}
	if q.Model.MinOceanThickness != 1000 || q.Model.MeltingTemperature != physics.DefaultOptions().MeltingTemperature {
		t.Errorf("ocean model %+v", q.Model)
	}
}

// TestRoundTrip: TOML() parses back to the same profile and renders identically.
func TestRoundTrip(t *testing.T) {
	for _, n := range BuiltinNames() {
		p, _ := Builtin(n)
		checkRoundTrip(t, p)
	}
}

func checkRoundTrip(tb testing.TB, p *Profile) {
	tb.Helper()
	text := p.TOML()
	q, err := Parse(p.Name, []byte(text))
	if err != nil {
		tb.Fatalf("re-parse of TOML(): %v\n%s", err, text)
	}
	if q.TOML() != text {
		tb.Fatalf("TOML() not stable:\n%s\n---\n%s", text, q.TOML())
	}
	if p.Name != q.Name || p.Description != q.Description || p.TopK != q.TopK || p.Model != q.Model ||
		!reflect.DeepEqual(p.Criteria, q.Criteria) || len(p.Priors) != len(q.Priors) {
		tb.Fatalf("round trip changed the profile:\n%+v\n%+v", p, q)
	}
	for i := range p.Priors {
		if p.Priors[i].Key != q.Priors[i].Key || p.Priors[i].Spec != q.Priors[i].Spec {
			tb.Fatalf("prior %d: %+v vs %+v", i, p.Priors[i], q.Priors[i])
		}
	}
}

const good = `name = "t"
top_k = 3

[[criterion]]
metric = "heat_flux_w_m2"
transfer = "log_ramp"
lo = 1e-3
hi = 1
`

func TestErrors(t *testing.T) {
	cases := []struct {
		name, doc  string
		line       int
		wantSubstr []string
	}{
		{"unknown metric", good + "\n[[criterion]]\nmetric = \"tidal_pwr\"\ntransfer = \"ramp\"\nlo = 0\nhi = 1\n", 11,
			[]string{`criterion[2].metric`, `unknown metric "tidal_pwr"`, "valid: tidal_power_w, radiogenic_power_w, heat_flux_w_m2"}},
		{"unknown transfer", strings.Replace(good, `"log_ramp"`, `"ramps"`, 1), 6,
			[]string{`unknown transfer "ramps" (valid: ramp, log_ramp, window)`}},
		{"unknown gas", strings.Replace(good, `"heat_flux_w_m2"`, `"retains:Xe"`, 1), 5,
			[]string{`unknown gas`, "valid gases: H2, He, H2O"}},
		{"unknown key", good + "wieght = 2\n", 9,
			[]string{`unknown key "wieght" in [[criterion]] (valid: metric, transfer, lo, hi, soft, weight)`}},
		{"unknown top-level key", "nme = \"x\"\n" + good, 1, []string{`unknown key "nme"`}},
		{"unknown model key", good + "[model]\nmelt_k = 3\n", 10, []string{`unknown key "melt_k" in [model]`, "melting_temperature_k"}},
		{"syntax", good + "lo = = 3\n", 9, []string{"bad.toml:9:"}},
		{"type", "top_k = \"three\"\n", 1, []string{"top_k", "want a whole number"}},
		{"bad top_k", strings.Replace(good, "top_k = 3", "top_k = 0", 1), 2, []string{"top_k = 0"}},
		{"no criteria", "name = \"x\"\n", 0, []string{"no [[criterion]]"}},
		{"log ramp from zero", strings.Replace(good, "lo = 1e-3", "lo = 0", 1), 7, []string{"log_ramp needs lo, hi > 0"}},
		{"soft on ramp", good + "soft = 2\n", 9, []string{"soft applies only to"}},
		{"negative weight", good + "weight = -1\n", 9, []string{"weight = -1"}},
		{"missing hi", strings.Replace(good, "hi = 1\n", "", 1), 4, []string{"missing hi"}},
		{"unknown prior key", good + "[priors]\nk2q = { dist = \"fixed\", value = 1 }\n", 10, []string{`unknown prior key "k2q"`, "k2_q"}},
		{"unknown dist", good + "[priors]\nk2_q = { dist = \"loguniform\", min = 1, max = 2 }\n", 10,
			[]string{`unknown distribution "loguniform" (valid: fixed, normal, split-normal, uniform, log-normal, log-uniform)`}},
		{"missing dist field", good + "[priors]\nk2_q = { dist = \"normal\", value = 1 }\n", 10, []string{"normal needs value, sigma"}},
		{"extra dist field", good + "[priors]\nk2_q = { dist = \"uniform\", min = 1, max = 2, sigma = 1 }\n", 10,
			[]string{"priors.k2_q.sigma", "sigma is not a parameter of uniform"}},
		{"prior outside domain", good + "[priors]\neccentricity = { dist = \"fixed\", value = 1.5 }\n", 10, []string{"outside the domain [0, 1)"}},
		{"prior table form", good + "[priors.bond_albedo]\ndist = \"uniform\"\nmin = 0.5\nmax = 0.1\n", 9, []string{"priors.bond_albedo", "min ≤ max"}},
		{"bad densities", good + "[model]\ncore_density_kg_m3 = 900\n", 9, []string{"want water < mantle < core"}},
		{"negative model value", good + "[model]\nmelting_temperature_k = -3\n", 10, []string{"model.melting_temperature_k", "want a positive number"}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			_, err := Parse("bad.toml", []byte(c.doc))
			if err == nil {
				t.Fatal("no error")
			}
			msg := err.Error()
			for _, s := range c.wantSubstr {
				if !strings.Contains(msg, s) {
					t.Errorf("error %q lacks %q", msg, s)
				}
			}
			var pe *Error
			if !errors.As(err, &pe) {
				t.Fatalf("%T is not a *profile.Error", err)
			}
			if pe.Line != c.line {
				t.Errorf("line %d, want %d (%v)", pe.Line, c.line, err)
			}
		})
	}
}

func TestLoad(t *testing.T) {
	files := map[string]string{"mine.toml": good}
	read := func(name string) ([]byte, error) {
		if s, ok := files[name]; ok {
			return []byte(s), nil
		}
		return nil, fs.ErrNotExist
	}
	if p, err := Load("tidal", read); err != nil || p.Name != "tidal" {
		t.Errorf("built-in: %v %v", p, err)
	}
	if p, err := Load("mine.toml", read); err != nil || p.Name != "t" {
		t.Errorf("file: %v %v", p, err)
	}
	_, err := Load("oceans", read)
	if !errors.Is(err, ErrUnknownProfile) || !strings.Contains(err.Error(), "ocean, tidal, volatiles") {
		t.Errorf("unknown: %v", err)
	}
	if _, err := Load("mine.toml", nil); !errors.Is(err, ErrUnknownProfile) {
		t.Errorf("nil reader: %v", err)
	}
}

func TestTransfer(t *testing.T) {
	mk := func(doc string) *Criterion {
		t.Helper()
		p, err := Parse("t", []byte("[[criterion]]\nmetric = \"heat_flux_w_m2\"\n"+doc))
		if err != nil {
			t.Fatal(err)
		}
		return &p.Criteria[0]
	}
	ramp := mk("transfer = \"ramp\"\nlo = 10\nhi = 20\n")
	down := mk("transfer = \"ramp\"\nlo = 20\nhi = 10\n")
	lr := mk("transfer = \"log_ramp\"\nlo = 1e-3\nhi = 1e-1\n")
	win := mk("transfer = \"window\"\nlo = 100\nhi = 200\nsoft = 50\n")
	hard := mk("transfer = \"window\"\nlo = 100\nhi = 200\n")
	inf, nan := math.Inf(1), math.NaN()
	cases := []struct {
		c    *Criterion
		x    float64
		want float64
	}{
		{ramp, 5, 0}, {ramp, 10, 0}, {ramp, 12.5, 0.25}, {ramp, 20, 1}, {ramp, 1e9, 1}, {ramp, inf, 1}, {ramp, -inf, 0}, {ramp, nan, 0},
		{down, 5, 1}, {down, 12.5, 0.75}, {down, 25, 0}, {down, nan, 0},
		{lr, 1e-2, 0.5}, {lr, 1e-4, 0}, {lr, 0, 0}, {lr, -1, 0}, {lr, 1, 1}, {lr, inf, 1}, {lr, nan, 0},
		{win, 150, 1}, {win, 100, 1}, {win, 75, 0.5}, {win, 225, 0.5}, {win, 40, 0}, {win, 300, 0}, {win, nan, 0},
		{hard, 99.9, 0}, {hard, 100, 1}, {hard, 200.1, 0},
	}
	for _, c := range cases {
		if got := c.c.Apply(c.x); math.Abs(got-c.want) > 1e-12 {
			t.Errorf("%s %g..%g at %g: %g, want %g", c.c.Transfer, c.c.Lo, c.c.Hi, c.x, got, c.want)
		}
	}
}

func TestValueAndScore(t *testing.T) {
	p, err := Parse("t", []byte(`
[[criterion]]
metric = "ocean"
transfer = "ramp"
lo = 0
hi = 1
weight = 3
[[criterion]]
metric = "retains:N2"
transfer = "ramp"
lo = 0
hi = 1
[[criterion]]
metric = "jeans:N2"
transfer = "ramp"
lo = 0
hi = 100
`))
	if err != nil {
		t.Fatal(err)
	}
	var d physics.Derived
	d.OceanThickness, d.OceanQualifies = 5e3, true
	n2 := -1
	for i, v := range physics.Volatiles {
		if v.Formula == "N2" {
			n2 = i
		}
	}
	d.JeansParameter[n2], d.Retained[n2] = 50, true
	// (3·1 + 1·1 + 1·0.5) / 5
	if got := p.Score(&d); math.Abs(got-0.9) > 1e-12 {
		t.Errorf("score %g, want 0.9", got)
	}
	shell, err := Parse("s", []byte("[[criterion]]\nmetric = \"ocean_shell_thickness_m\"\ntransfer = \"log_ramp\"\nlo = 1e5\nhi = 1e3\n"))
	if err != nil {
		t.Fatal(err)
	}
	d.IceShellThickness = 1e4
	if got := shell.Score(&d); math.Abs(got-0.5) > 1e-12 {
		t.Errorf("10 km shell over an ocean: %g, want 0.5", got)
	}
	d.OceanQualifies, d.IceShellThickness = false, 0 // no ice: a 0 m "shell" must not score
	if got := shell.Score(&d); got != 0 {
		t.Errorf("no ocean: shell score %g, want 0", got)
	}
	d.OceanQualifies = true
	d.OceanThickness = math.NaN() // not computable: the indicator is unknown and scores 0
	if v := p.Criteria[0].Value(&d); !math.IsNaN(v) {
		t.Errorf("ocean with NaN thickness: %g, want NaN", v)
	}
	if got := p.Score(&d); math.Abs(got-0.3) > 1e-12 {
		t.Errorf("score %g, want 0.3", got)
	}
}

func FuzzParseProfile(f *testing.F) {
	for _, n := range BuiltinNames() {
		p, _ := Builtin(n)
		f.Add(string(p.Source()))
	}
	f.Add(good)
	f.Add(good + "[priors]\nk2_q = { dist = \"split-normal\", value = 1e-2, plus = 1e-2, minus = 5e-3 }\n")
	f.Add("name = \"\\u0001\\\"q\"\n" + good[9:])
	f.Fuzz(func(t *testing.T, doc string) {
		p, err := Parse("fuzz.toml", []byte(doc))
		if err != nil {
			var pe *Error
			if !errors.As(err, &pe) {
				t.Fatalf("error %T is not a *profile.Error: %v", err, err)
			}
			return
		}
		checkRoundTrip(t, p)
	})
}
