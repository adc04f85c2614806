package method

import (
	"fmt"
	"strings"
	"testing"

	"tidesift/rank/physics"
)

func TestTextMentions(t *testing.T) {
	txt := Text()
	// Every formula and constant the model uses, and the cautions.
	for _, want := range []string{
		"triage aids", "never replace",
		"(3/2) (k2/Q) (n^5 R^5 / G) (7 e^2 + sin^2 theta)", "Peale, Cassen & Reynolds 1979", "Segatz et al. 1988", "Wisdom 2004",
		"2 G M_p m D / a^3", "D = 2R", "f_rock * m * H", "(E_tide + E_rad) / (4 pi R^2)",
		"16 pi sigma d^2", "(T_eq^4 + q / sigma)^(1/4)", "sqrt(2 G m / R)", "sqrt(8 k_B T / (pi mu))",
		"sqrt(3 k_B T / mu)", "G m mu / (k_B T R)", "six times", "(1 + lambda) exp(-lambda)",
		"C/MR^2", "Anderson et al. 1998", "651 / T", "(651 / q) ln(T_m / T_s)", "D_w - d", "176 K",
		"no self-compression", "conduction only", "present-day heating only", "small-eccentricity",
		"synchronous rotation", "exobase is taken to be the surface",
		"Uncertainty and ranking", "seeded", "first-order sensitivity index", "assumed",
		"common practice", "CODATA 2018", "IUPAC",
	} {
		if !strings.Contains(strings.ToLower(txt), strings.ToLower(want)) {
			t.Errorf("method text lacks %q", want)
		}
	}
	// Constants printed in the text agree with the code.
	for _, c := range []struct {
		name string
		v    float64
		f    string
	}{
		{"G", physics.G, "%.5e"},
		{"sigma", physics.StefanBoltzmann, "%.9e"},
		{"k_B", physics.Boltzmann, "%.6e"},
		{"N_A", physics.Avogadro, "%.8e"},
		{"H", physics.ChondriticHeatProduction, "%.2e"},
	} {
		s := fmt.Sprintf(c.f, c.v)
		s = strings.NewReplacer("e-0", "e-", "e+", "e").Replace(s)
		if !strings.Contains(txt, s) {
			t.Errorf("method text lacks %s = %s", c.name, s)
		}
	}
	o := physics.DefaultOptions()
	for _, want := range []string{
		fmt.Sprintf("core %g kg/m^3", o.CoreDensity), fmt.Sprintf("mantle %g kg/m^3", o.MantleDensity),
		fmt.Sprintf("H2O %g kg/m^3", o.WaterDensity), fmt.Sprintf("end member %g kg/m^3", o.IceDensity),
		fmt.Sprintf("default %g K", o.IceStabilityTemperature), fmt.Sprintf("T_m = %g K", o.MeltingTemperature),
	} {
		if !strings.Contains(strings.Join(strings.Fields(txt), " "), want) {
			t.Errorf("method text lacks default %q", want)
		}
	}
	for _, v := range physics.Volatiles {
		if !strings.Contains(txt, fmt.Sprintf("%s %.*f", v.Formula, decimals(v.MolarMass*1e3), v.MolarMass*1e3)) {
			t.Errorf("method text lacks molar mass of %s (%.4f)", v.Formula, v.MolarMass*1e3)
		}
	}
	for _, name := range physics.Flag(^uint32(0)).Names() {
		if !strings.Contains(txt, name) {
			t.Errorf("method text does not explain flag %s", name)
		}
	}
}

// decimals is the number of decimals the text prints for a molar mass.
func decimals(gmol float64) int {
	if gmol < 5 && gmol > 4 {
		return 4 // He 4.0026
	}
	return 3
}

func TestTextHygiene(t *testing.T) {
	txt := Text()
	// The method text cites publications, never a machine path.
	for _, bad := range []string{"/tmp/", "/home/", "/root/"} {
		if strings.Contains(strings.ToLower(txt), bad) {
			t.Errorf("method text contains the machine path fragment %q", bad)
		}
	}
	if !strings.HasSuffix(txt, "\n") {
		t.Error("text does not end in a newline")
	}
}

func TestSections(t *testing.T) {
	s := Sections()
	if len(s) < 10 {
		t.Fatalf("%d sections", len(s))
	}
	if s[0].Title != "What this is" || Title() != "TIDESIFT METHOD" {
		t.Errorf("first section %q, title %q", s[0].Title, Title())
	}
	titles := map[string]bool{}
	total := 0
	for _, x := range s {
		titles[x.Title] = true
		if x.Body == "" {
			t.Errorf("section %q is empty", x.Title)
		}
		if strings.HasPrefix(x.Body, "---") {
			t.Errorf("section %q body starts with its rule", x.Title)
		}
		total += len(x.Body)
	}
	for _, want := range []string{"What this is", "Constants", "2. Tidal heating", "7. Ice shell and ocean", "Uncertainty and ranking", "Sources"} {
		if !titles[want] {
			t.Errorf("missing section %q", want)
		}
	}
	if total < len(Text())*9/10 {
		t.Errorf("sections hold %d of %d bytes", total, len(Text()))
	}
}

func TestWithUncertainty(t *testing.T) {
	sec := "Uncertainty and ranking\n-----------------------\nEngine text A.\n\nEngine text B.\n"
	got := WithUncertainty(sec)
	if !strings.Contains(got, "Engine text A.\n\nEngine text B.\n\n\nSources\n-------\n") {
		t.Errorf("section not spliced before Sources:\n%s", got[strings.Index(got, "Engine")-200:])
	}
	if strings.Contains(got, "Sampling is seeded and reproducible") {
		t.Error("old section text survived")
	}
	if strings.Count(got, "Uncertainty and ranking\n---") != 1 {
		t.Error("heading duplicated or lost")
	}
	// Everything outside the section is unchanged.
	before, _, _ := strings.Cut(Text(), "Uncertainty and ranking\n---")
	if !strings.HasPrefix(got, before) {
		t.Error("text before the section changed")
	}
	_, after, _ := strings.Cut(Text(), "\nSources\n-------\n")
	if !strings.HasSuffix(got, after) {
		t.Error("text after the section changed")
	}
	var titles []string
	for _, s := range SectionsOf(got) {
		titles = append(titles, s.Title)
		if s.Title == UncertaintyHeading && s.Body != "Engine text A.\n\nEngine text B." {
			t.Errorf("spliced body %q", s.Body)
		}
	}
	if titles[len(titles)-1] != "Sources" || titles[len(titles)-2] != UncertaintyHeading {
		t.Errorf("titles %v", titles)
	}
	if WithUncertainty("") != Text() {
		t.Error("empty section changed the text")
	}
}
