package export

import (
	"fmt"
	"math"
	"testing"

	"tidesift/rank"
)

func TestFormatRange(t *testing.T) {
	nan, inf := math.NaN(), math.Inf(1)
	tests := []struct {
		name string
		q    rank.Quantiles
		unit string
		want string
	}{
		{"terawatts", q(75e12, 93e12, 112e12), "W", "93 (75–112) TW"},
		{"kilowatts", q(1.2e3, 1.5e3, 1.9e3), "W", "1.5 (1.2–1.9) kW"},
		{"gigawatts, third figure needed", q(1.51e9, 1.53e9, 1.56e9), "W", "1.53 (1.51–1.56) GW"},
		{"plain watts", q(300, 450, 600), "W", "450 (300–600) W"},
		{"heat flux in mW/m²", q(0.021, 0.035, 0.052), "W/m2", "35 (21–52) mW/m²"},
		{"large heat flux stays W/m²", q(2.1, 2.4, 3.0), "W/m2", "2.4 (2.1–3.0) W/m²"},
		{"thickness in km", q(8e3, 20e3, 45e3), "m", "20 (8–45) km"},
		{"thin shell in m", q(400, 650, 900), "m", "650 (400–900) m"},
		{"speed in km/s needs three figures", q(2010, 2025, 2040), "m/s", "2.02 (2.01–2.04) km/s"},
		{"slow speed in m/s", q(120, 125, 130), "m/s", "125 (120–130) m/s"},
		{"kelvin as is", q(98.2, 101.5, 104.9), "K", "102 (98–105) K"},
		{"kelvin, narrow", q(101.2, 101.5, 101.9), "K", "101.5 (101.2–101.9) K"},
		{"score", q(0.48, 0.62, 0.71), "", "0.62 (0.48–0.71)"},
		{"zero width", q(0.5, 0.5, 0.5), "", "0.50"},
		{"invisible width", q(0.5, 0.50001, 0.50002), "", "0.50"},
		{"one side flat", q(0.5, 0.5, 0.51), "", "0.50 (0.50–0.51)"},
		{"force with power of ten", q(1.1e20, 1.26e20, 1.41e20), "N", "1.3 (1.1–1.4) ×10²⁰ N"},
		{"tiny dimensionless", q(4e-7, 5e-7, 6e-7), "", "5.0 (4.0–6.0) ×10⁻⁷"},
		{"density unit prettified", q(900, 1900, 3000), "kg/m3", "1900 (900–3000) kg/m³"},
		{"median zero uses the bound", q(0, 0, 1200), "m", "0.0 (0.0–1.2) km"},
		{"all zero", q(0, 0, 0), "m", "0 m"},
		{"negative values", q(-3, -1, 2), "", "-1.0 (-3.0–2.0)"},
		{"unbounded above", q(1e3, 2e3, inf), "m", "2.0 (1.0–∞) km"},
		{"all NaN", q(nan, nan, nan), "K", "n/a"},
		{"NaN bound", q(nan, 150, 160), "K", "150 (n/a–160) K"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			if got := FormatRange(tt.q, tt.unit); got != tt.want {
				t.Errorf("FormatRange(%v, %q) = %q, want %q", tt.q, tt.unit, got, tt.want)
			}
		})
	}
}

func ExampleFormatRange() {
	// An invented moon's tidal power, 5th/50th/95th percentiles in W.
	fmt.Println(FormatRange(rank.Quantiles{P05: 75e12, P50: 93e12, P95: 112e12}, "W"))
	// Output: 93 (75–112) TW
}
