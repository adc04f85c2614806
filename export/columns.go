package export

import (
	"math"
	"sort"
	"strconv"
	"strings"

	"tidesift/rank"
)

// metric describes one quantile-valued derived quantity of rank.Metrics: its
// JSON name (the contract), a label for people, its SI unit and the number
// format the workbook shows it in.
type metric struct {
	key    string // JSON name in rank.Metrics, also the CSV column stem
	label  string
	unit   string // SI unit as FormatRange takes it
	header string // unit as written in a column header
	numFmt string // workbook number format
	get    func(*rank.Metrics) rank.Quantiles
}

// metrics lists rank.Metrics' quantile fields in contract order.
var metrics = []metric{
	{"tidal_power_w", "Tidal power", "W", "W", fmtPower, func(m *rank.Metrics) rank.Quantiles { return m.TidalPower }},
	{"radiogenic_power_w", "Radiogenic power", "W", "W", fmtPower, func(m *rank.Metrics) rank.Quantiles { return m.RadiogenicPower }},
	{"heat_flux_w_m2", "Surface heat flux", "W/m2", "W/m²", fmtPower, func(m *rank.Metrics) rank.Quantiles { return m.HeatFlux }},
	{"tidal_force_n", "Differential tidal force", "N", "N", fmtPower, func(m *rank.Metrics) rank.Quantiles { return m.TidalForce }},
	{"surface_temperature_k", "Surface temperature", "K", "K", fmtKelvin, func(m *rank.Metrics) rank.Quantiles { return m.SurfaceTemperature }},
	{"escape_velocity_m_s", "Escape velocity", "m/s", "m/s", fmtWhole, func(m *rank.Metrics) rank.Quantiles { return m.EscapeVelocity }},
	{"water_layer_thickness_m", "H2O layer thickness", "m", "m", fmtWhole, func(m *rank.Metrics) rank.Quantiles { return m.WaterLayerThickness }},
	{"ice_shell_thickness_m", "Ice shell thickness", "m", "m", fmtWhole, func(m *rank.Metrics) rank.Quantiles { return m.IceShellThickness }},
}

// Workbook number formats per kind of quantity.
const (
	fmtPower  = "0.00E+00" // powers, forces, fluxes: many orders of magnitude
	fmtKelvin = "0.0"
	fmtWhole  = "#,##0" // metres, m/s
	fmtProb   = "0.000" // probabilities and scores
	fmtShare  = "0.0%"
	fmtRank   = "General" // a median rank is whole or half
)

// retainedThreshold is the probability from which a volatile counts as "key
// volatile retained" on the Ranking sheet and in the table.
const retainedThreshold = 0.5

// volatileOrder is the display order of the volatiles the design names;
// others follow alphabetically.
var volatileOrder = []string{"H2O", "CH4", "NH3", "N2", "CO", "CO2", "SO2"}

// volatiles returns every volatile that appears in any target's retention map,
// in display order.
func volatiles(r *rank.Result) []string {
	seen := map[string]bool{}
	for i := range r.Targets {
		for v := range r.Targets[i].Metrics.Retention {
			seen[v] = true
		}
	}
	return orderVolatiles(seen)
}

func orderVolatiles(seen map[string]bool) []string {
	out := make([]string, 0, len(seen))
	for _, v := range volatileOrder {
		if seen[v] {
			out = append(out, v)
			delete(seen, v)
		}
	}
	rest := make([]string, 0, len(seen))
	for v := range seen {
		rest = append(rest, v)
	}
	sort.Strings(rest)
	return append(out, rest...)
}

// retainedList lists the volatiles a target keeps with probability ≥ 0.5, in
// display order, e.g. "N2, CH4".
func retainedList(t *rank.Target) string {
	seen := map[string]bool{}
	for v, p := range t.Metrics.Retention {
		if p >= retainedThreshold {
			seen[v] = true
		}
	}
	return strings.Join(orderVolatiles(seen), ", ")
}

// mainDriver returns the input with the largest share of the score variance.
// Drivers are largest first by contract; the scan guards against an unsorted
// list anyway.
func mainDriver(t *rank.Target) (rank.Driver, bool) {
	best, ok := rank.Driver{}, false
	for _, d := range t.Drivers {
		if !isFinite(d.Share) {
			continue
		}
		if !ok || d.Share > best.Share {
			best, ok = d, true
		}
	}
	return best, ok
}

// formatRankRange renders a median rank with its interval: "3 (2–5)", or "3"
// when the interval has no width.
func formatRankRange(t *rank.Target) string {
	m, lo, hi := formatRank(t.Rank), formatRank(t.RankP05), formatRank(t.RankP95)
	if lo == m && hi == m {
		return m
	}
	return m + " (" + lo + "–" + hi + ")"
}

func formatRankInterval(t *rank.Target) string {
	lo, hi := formatRank(t.RankP05), formatRank(t.RankP95)
	if lo == hi {
		return lo
	}
	return lo + "–" + hi
}

// formatRank shows a rank with at most one decimal (a median of an even
// number of samples can fall between two ranks).
func formatRank(x float64) string {
	if !isFinite(x) {
		return formatFixed(x, 0)
	}
	return strconv.FormatFloat(math.Round(x*10)/10, 'f', -1, 64)
}

// formatProb shows a probability with two decimals.
func formatProb(p float64) string { return formatFixed(p, 2) }

// formatShare shows a share as a whole percentage.
func formatShare(s float64) string {
	if !isFinite(s) {
		return formatFixed(s, 0)
	}
	return strconv.FormatFloat(math.Round(s*100), 'f', 0, 64) + "%"
}
