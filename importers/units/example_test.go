package units_test

import (
	"fmt"

	"tidesift/importers/units"
)

func ExampleParse() {
	for _, s := range []string{"km", "g/cm3", "mW/m**2", "earthMass", "1.898E27kg", "AU"} {
		u, err := units.Parse(s)
		if err != nil {
			fmt.Println(err)
			continue
		}
		fmt.Printf("%-11s × %.6g → SI (%v)\n", s, u.Factor, u.Dim)
	}
	_, err := units.Parse("kms")
	fmt.Println(err)
	// Output:
	// km          × 1000 → SI (length)
	// g/cm3       × 1000 → SI (density)
	// mW/m**2     × 0.001 → SI (heat flux)
	// earthMass   × 5.97217e+24 → SI (mass)
	// 1.898E27kg  × 1.898e+27 → SI (mass)
	// AU          × 1.49598e+11 → SI (length)
	// unknown unit "kms" (close spellings: km, ms, cm, kW)
}

func ExampleExpect() {
	km, _ := units.Parse("km")
	fmt.Println(units.Expect("mass", "km", km, units.Mass))
	// Output:
	// unit km is a length; mass wants a mass unit such as kg, earthMass
}
