package profile_test

import (
	"fmt"

	"tidesift/rank/profile"
)

func ExampleParse() {
	_, err := profile.Parse("mine.toml", []byte(`name = "mine"

[[criterion]]
metric = "tidal_pwr"
transfer = "ramp"
lo = 0
hi = 1
`))
	fmt.Println(err)
	// Output: mine.toml:4:1: criterion[1].metric: unknown metric "tidal_pwr" (valid: tidal_power_w, radiogenic_power_w, heat_flux_w_m2, tidal_force_n, surface_temperature_k, escape_velocity_m_s, water_layer_thickness_m, ice_shell_thickness_m, ocean, ocean_thickness_m, tidal_acceleration_m_s2, equilibrium_temperature_k, rock_fraction, surface_gravity_m_s2, bulk_density_kg_m3, ocean_shell_thickness_m, retains:GAS, jeans:GAS)
}

func ExampleLoad() {
	p, err := profile.Load("tidal", nil) // a built-in; pass os.ReadFile to allow files
	if err != nil {
		panic(err)
	}
	fmt.Println(p.Name, "—", p.Description)
	for _, c := range p.Criteria {
		fmt.Printf("  %-16s %-8s %g…%g  weight %g\n", c.Metric, c.Transfer, c.Lo, c.Hi, c.Weight)
	}
	// Output:
	// tidal — Tidal activity: dissipation, heat flux and tidal stress
	//   tidal_power_w    log_ramp 1e+09…1e+14  weight 3
	//   heat_flux_w_m2   log_ramp 0.001…1  weight 2
	//   tidal_force_n    log_ramp 1e+18…1e+21  weight 1
}
