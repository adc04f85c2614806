package importers_test

import (
	"fmt"
	"strings"

	"tidesift/importers"
)

// An invented moon in the canonical layout, read into SI.
func ExampleRead() {
	in := "name,planet,mass [earthMass],mass_err,radius [km],obliquity [deg]\n" +
		"Nerith,Vorlan,0.0136,0.0003,1790,0.02\n"
	res, err := importers.Read("moons.csv", strings.NewReader(in), importers.Options{})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, p := range res.Records[0].Params {
		fmt.Printf("%s = %.4g (%v σ %.3g)\n", p.Key, p.Value, p.Unc.Kind, p.Unc.Sigma)
	}
	// Output:
	// mass = 8.122e+22 (symmetric σ 1.79e+21)
	// obliquity = 0.0003491 (none σ 0)
	// radius = 1.79e+06 (none σ 0)
}

// A bad file is refused with every problem, each naming row and column.
func ExampleErrorList() {
	in := "name,planet,mass [kg],eccentricity\n" +
		"Nerith,Vorlan,heavy,0.01\n" +
		"Caldra,Vorlan,4.6e22,1.3\n"
	_, err := importers.Read("moons.csv", strings.NewReader(in), importers.Options{})
	fmt.Println(err)
	// Output:
	// moons.csv: 2 problems; nothing was imported:
	//   moons.csv: row 2, column "mass [kg]": value "heavy": not a number; expected a decimal number such as 4.8e22 or 0.0094, or an empty cell when unknown
	//   moons.csv: row 3, column "eccentricity": value "1.3": value outside its physical domain: eccentricity = 1.3, expected [0, 1)
}
