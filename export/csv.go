package export

import (
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"strconv"
	"strings"

	"tidesift/rank"
)

// CSVHeader returns the columns WriteCSV writes for r, in order: rank,
// rank_p05, rank_p95, name, planet, star, score_p05, score_p50, score_p95,
// score_p50_se, p_top_k, p_top, ocean_probability, ocean_probability_se, then
// METRIC_p05/_p50/_p95 for each quantile metric of the JSON contract (in SI
// units, e.g. tidal_power_w_p50), retention_VOLATILE for each volatile any
// target carries, main_driver, main_driver_share and assumed_inputs (keys
// joined by ';').
func CSVHeader(r *rank.Result) []string {
	h := []string{"rank", "rank_p05", "rank_p95", "name", "planet", "star",
		"score_p05", "score_p50", "score_p95", "score_p50_se",
		"p_top_k", "p_top", "ocean_probability", "ocean_probability_se"}
	for _, m := range metrics {
		h = append(h, m.key+"_p05", m.key+"_p50", m.key+"_p95")
	}
	for _, v := range volatiles(r) {
		h = append(h, "retention_"+v)
	}
	return append(h, "main_driver", "main_driver_share", "assumed_inputs")
}

// WriteCSV writes one row per target, best first, under the CSVHeader
// columns. Numbers are written in the shortest form that reads back to the
// same float64; a non-finite number, an absent retention entry or an absent
// driver is an empty cell. Text cells are neutralised with SafeText; numeric
// cells are never altered.
func WriteCSV(w io.Writer, r *rank.Result) error {
	if r == nil {
		return errors.New("write csv: no ranking result")
	}
	cw := csv.NewWriter(w)
	header := CSVHeader(r)
	vols := volatiles(r)
	safeHeader := make([]string, len(header))
	for i, h := range header {
		safeHeader[i] = SafeText(h)
	}
	if err := cw.Write(safeHeader); err != nil {
		return fmt.Errorf("write csv: header: %w", err)
	}
	row := make([]string, 0, len(header))
	for i := range r.Targets {
		t := &r.Targets[i]
		row = append(row[:0],
			num(t.Rank), num(t.RankP05), num(t.RankP95),
			SafeText(t.Name), SafeText(t.Planet), SafeText(t.Star),
			num(t.Score.P05), num(t.Score.P50), num(t.Score.P95), num(t.ScoreMedianSE),
			strconv.Itoa(t.PTop.K), num(t.PTop.P),
			num(t.Metrics.OceanProbability), num(t.Metrics.OceanProbabilitySE))
		for _, m := range metrics {
			q := m.get(&t.Metrics)
			row = append(row, num(q.P05), num(q.P50), num(q.P95))
		}
		for _, v := range vols {
			p, ok := t.Metrics.Retention[v]
			if !ok {
				row = append(row, "")
				continue
			}
			row = append(row, num(p))
		}
		if d, ok := mainDriver(t); ok {
			row = append(row, SafeText(d.Input), num(d.Share))
		} else {
			row = append(row, "", "")
		}
		row = append(row, SafeText(strings.Join(t.AssumedInputs, ";")))
		if err := cw.Write(row); err != nil {
			return fmt.Errorf("write csv: target %d (%s): %w", i+1, t.Name, err)
		}
	}
	cw.Flush()
	if err := cw.Error(); err != nil {
		return fmt.Errorf("write csv: %w", err)
	}
	return nil
}

// num writes a number so that strconv.ParseFloat gives it back exactly;
// NaN and ±Inf become an empty cell.
func num(x float64) string {
	if !isFinite(x) {
		return ""
	}
	return strconv.FormatFloat(x, 'g', -1, 64)
}
