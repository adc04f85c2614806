package physics_test

import (
	"encoding/json"
	"fmt"
	"math"

	"tidesift/rank/physics"
)

// The bodies in these examples are invented; their numbers illustrate the
// formulas and describe no real moon.

func ExampleTidalPower() {
	// An invented moon of radius 1500 km on a 2-day orbit, e = 0.005, k2/Q = 0.01.
	n := physics.MeanMotionFromPeriod(2 * 86400)
	p := physics.TidalPower(0.01, n, 1.5e6, 0.005, 0)
	fmt.Printf("n = %.4e rad/s, tidal power = %.3g TW\n", n, p/1e12)
	// Output: n = 3.6361e-05 rad/s, tidal power = 19 TW
}

func ExampleTidalForce() {
	// The same invented moon (5e22 kg, radius 1500 km) 5e8 m from a 1.5e27 kg planet.
	f := physics.TidalForce(1.5e27, 5e22, 1.5e6, 5e8)
	fmt.Printf("ΔF = %.3e N, Δg = %.3e m/s²\n", f, physics.TidalAcceleration(1.5e27, 1.5e6, 5e8))
	// Output: ΔF = 2.403e+20 N, Δg = 4.805e-03 m/s²
}

func ExampleEquilibriumTemperature() {
	// A star of 3.828e26 W (one nominal solar luminosity), a planet at 1 au,
	// Bond albedo 0.3; then an internal heat flux of 0.1 W/m² on top.
	teq := physics.EquilibriumTemperature(3.828e26, 0.3, 1.495978707e11)
	fmt.Printf("T_eq = %.1f K, T_s = %.1f K\n", teq, physics.SurfaceTemperature(teq, 0.1))
	// Output: T_eq = 254.6 K, T_s = 254.6 K
}

func ExampleMeanThermalSpeed() {
	// Nitrogen at 300 K, and whether an invented 5e22 kg, 1500 km moon keeps it.
	n2 := physics.Volatiles[physics.VolatileN2]
	v := physics.MeanThermalSpeed(300, n2.MolarMass)
	vesc := physics.EscapeVelocity(5e22, 1.5e6)
	fmt.Printf("v̄ = %.1f m/s, v_rms = %.1f m/s, v_esc = %.0f m/s, λ = %.1f, retained: %v\n",
		v, physics.RMSThermalSpeed(300, n2.MolarMass), vesc,
		physics.JeansParameter(5e22, 1.5e6, 300, n2.MolarMass), physics.Retained(vesc, v))
	// Output: v̄ = 476.2 m/s, v_rms = 516.8 m/s, v_esc = 2109 m/s, λ = 25.0, retained: false
}

func ExampleShellThickness() {
	// 50 mW/m² through ice from a 100 K surface to a 273.15 K base, then to a
	// 176 K ammonia–water base.
	fmt.Printf("%.2f km\n", physics.ShellThickness(0.05, 100, physics.WaterMeltingTemperature)/1e3)
	fmt.Printf("%.2f km\n", physics.ShellThickness(0.05, 100, physics.AmmoniaWaterEutectic)/1e3)
	// Output:
	// 13.08 km
	// 7.36 km
}

func ExampleRockFraction() {
	// An invented body of bulk density 2000 kg/m³ mixing rock of 3000 with ice of 930.
	f, flag := physics.RockFraction(2000, 3000, 930)
	d := physics.TwoComponentWaterLayer(2e6, 2000, f, 3000)
	fmt.Printf("rock fraction %.4f (flags: %v), H2O layer %.0f km of a 2000 km radius\n", f, flag, d/1e3)
	// Output: rock fraction 0.7754 (flags: none), H2O layer 395 km of a 2000 km radius
}

func ExampleSolveThreeLayer() {
	// Build a synthetic body (core 600 km, rock to 1800 km, H₂O to 2500 km),
	// then recover its layers from bulk density and C/MR² alone.
	rho, moi := physics.ThreeLayerForward(2.5e6, 0.6e6, 1.8e6, 5150, 3250, 1000)
	sol, ok := physics.SolveThreeLayer(2.5e6, rho, moi, 5150, 3250, 1000)
	fmt.Printf("ρ = %.1f kg/m³, C/MR² = %.4f → core %.1f km, mantle to %.1f km, H2O %.1f km (ok %v)\n",
		rho, moi, sol.CoreRadius/1e3, sol.MantleRadius/1e3, sol.WaterThickness/1e3, ok)
	// Output: ρ = 1866.1 kg/m³, C/MR² = 0.3080 → core 600.0 km, mantle to 1800.0 km, H2O 700.0 km (ok true)
}

// exampleInputs is an invented icy moon of an invented giant planet.
func exampleInputs() physics.Inputs {
	return physics.Inputs{
		Mass: 6.0e22, Radius: 1.65e6, SemiMajorAxis: 6.0e8, Eccentricity: 0.01,
		Obliquity: 0, Period: math.NaN(), K2Q: 0.003, BondAlbedo: 0.6,
		SurfaceTemperature: math.NaN(), MomentOfInertia: 0.34,
		AtmosphereColumn: math.NaN(), PlanetMass: 1.6e27,
		StarDistance: 7.0e11, StarLuminosity: 3.0e26, RockDensity: 3200,
	}
}

// ExampleEvaluate runs the whole model on an invented moon. The printed values
// were checked against an independent re-implementation of the method.
func ExampleEvaluate() {
	var d physics.Derived
	physics.Evaluate(exampleInputs(), physics.DefaultOptions(), &d)
	fmt.Printf("tidal %.3g W, radiogenic %.3g W, flux %.4f W/m²\n", d.TidalPower, d.RadiogenicPower, d.HeatFlux)
	fmt.Printf("T_eq %.1f K, T_s %.1f K, v_esc %.0f m/s\n", d.EquilibriumTemperature, d.SurfaceTemperature, d.EscapeVelocity)
	fmt.Printf("%v interior: H2O %.0f km, shell %.1f km, ocean %.0f km (exists %v)\n",
		d.Interior, d.WaterLayerThickness/1e3, d.IceShellThickness/1e3, d.OceanThickness/1e3, d.Ocean)
	fmt.Println("flags:", d.Flags)
	// Output:
	// tidal 3.14e+12 W, radiogenic 1.97e+11 W, flux 0.0975 W/m²
	// T_eq 96.3 K, T_s 96.8 K, v_esc 2203 m/s
	// three_layer interior: H2O 110 km, shell 6.9 km, ocean 104 km (exists true)
	// flags: mean_motion_from_kepler
}

func ExampleDerived_Named() {
	var d physics.Derived
	in := exampleInputs()
	in.K2Q = math.NaN() // unknown: the heat budget and everything after it are null
	physics.Evaluate(in, physics.DefaultOptions(), &d)
	c := d.Named()
	b, _ := json.Marshal(struct {
		Tidal physics.Number `json:"tidal_power_w"`
		Vesc  physics.Number `json:"escape_velocity_m_s"`
		Ocean physics.Number `json:"ocean_probability"`
		Water physics.Number `json:"H2O_retained"`
		Model string         `json:"interior_model"`
		Flags []string       `json:"flags"`
	}{c.TidalPower, c.EscapeVelocity, c.OceanProbability, c.Retention["H2O"], c.Interior, c.Flags})
	fmt.Println(string(b))
	// Output: {"tidal_power_w":null,"escape_velocity_m_s":2203.1877731224736,"ocean_probability":null,"H2O_retained":null,"interior_model":"three_layer","flags":["mean_motion_from_kepler"]}
}
