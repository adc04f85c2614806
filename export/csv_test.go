package export

import (
	"bytes"
	"encoding/csv"
	"math"
	"strconv"
	"strings"
	"testing"

	"tidesift/rank"
)

func readCSV(tb testing.TB, b []byte) (header []string, rows []map[string]string) {
	tb.Helper()
	recs, err := csv.NewReader(bytes.NewReader(b)).ReadAll()
	if err != nil {
		tb.Fatalf("parse csv: %v", err)
	}
	if len(recs) == 0 {
		tb.Fatal("empty csv")
	}
	header = recs[0]
	for _, rec := range recs[1:] {
		m := map[string]string{}
		for i, h := range header {
			m[h] = rec[i]
		}
		rows = append(rows, m)
	}
	return header, rows
}

func TestWriteCSVRoundTrip(t *testing.T) {
	r := sampleResult()
	var buf bytes.Buffer
	if err := WriteCSV(&buf, r); err != nil {
		t.Fatal(err)
	}
	header, rows := readCSV(t, buf.Bytes())
	wantHeader := "rank,rank_p05,rank_p95,name,planet,star,score_p05,score_p50,score_p95,score_p50_se,p_top_k,p_top,ocean_probability,ocean_probability_se," +
		"tidal_power_w_p05,tidal_power_w_p50,tidal_power_w_p95,radiogenic_power_w_p05,radiogenic_power_w_p50,radiogenic_power_w_p95," +
		"heat_flux_w_m2_p05,heat_flux_w_m2_p50,heat_flux_w_m2_p95,tidal_force_n_p05,tidal_force_n_p50,tidal_force_n_p95," +
		"surface_temperature_k_p05,surface_temperature_k_p50,surface_temperature_k_p95,escape_velocity_m_s_p05,escape_velocity_m_s_p50,escape_velocity_m_s_p95," +
		"water_layer_thickness_m_p05,water_layer_thickness_m_p50,water_layer_thickness_m_p95,ice_shell_thickness_m_p05,ice_shell_thickness_m_p50,ice_shell_thickness_m_p95," +
		"retention_H2O,retention_CH4,retention_N2,retention_CO,main_driver,main_driver_share,assumed_inputs"
	if got := strings.Join(header, ","); got != wantHeader {
		t.Errorf("header\n got %s\nwant %s", got, wantHeader)
	}
	if len(rows) != len(r.Targets) {
		t.Fatalf("%d rows, want %d", len(rows), len(r.Targets))
	}
	for i, row := range rows {
		tg := &r.Targets[i]
		checkNum := func(col string, want float64) {
			t.Helper()
			cell := row[col]
			if !isFinite(want) {
				if cell != "" {
					t.Errorf("row %d %s = %q, want empty for %v", i+1, col, cell, want)
				}
				return
			}
			got, err := strconv.ParseFloat(cell, 64)
			if err != nil || got != want { // shortest round-trip form: exact
				t.Errorf("row %d %s = %q, want %v", i+1, col, cell, want)
			}
		}
		checkNum("rank", tg.Rank)
		checkNum("rank_p05", tg.RankP05)
		checkNum("rank_p95", tg.RankP95)
		checkNum("score_p05", tg.Score.P05)
		checkNum("score_p50", tg.Score.P50)
		checkNum("score_p95", tg.Score.P95)
		checkNum("p_top", tg.PTop.P)
		checkNum("ocean_probability", tg.Metrics.OceanProbability)
		for _, m := range metrics {
			qq := m.get(&tg.Metrics)
			checkNum(m.key+"_p05", qq.P05)
			checkNum(m.key+"_p50", qq.P50)
			checkNum(m.key+"_p95", qq.P95)
		}
		for v, p := range tg.Metrics.Retention {
			checkNum("retention_"+v, p)
		}
		if row["p_top_k"] != strconv.Itoa(tg.PTop.K) {
			t.Errorf("row %d p_top_k = %q", i+1, row["p_top_k"])
		}
		for col, want := range map[string]string{"name": tg.Name, "planet": tg.Planet, "star": tg.Star, "assumed_inputs": strings.Join(tg.AssumedInputs, ";")} {
			if row[col] != want {
				t.Errorf("row %d %s = %q, want %q", i+1, col, row[col], want)
			}
		}
		if d, ok := mainDriver(tg); ok {
			if row["main_driver"] != d.Input {
				t.Errorf("row %d main_driver = %q, want %q", i+1, row["main_driver"], d.Input)
			}
			checkNum("main_driver_share", d.Share)
		} else if row["main_driver"] != "" || row["main_driver_share"] != "" {
			t.Errorf("row %d has a driver, want none", i+1)
		}
	}
	if rows[2]["retention_CH4"] != "" {
		t.Errorf("absent retention entry written as %q, want empty", rows[2]["retention_CH4"])
	}
	if !math.IsNaN(r.Targets[2].Metrics.IceShellThickness.P50) {
		t.Fatal("fixture changed: target 3 should have a NaN shell")
	}
}

func TestWriteCSVNeutralisesFormulas(t *testing.T) {
	r := hostileResult()
	r.Targets[0].Drivers = []rank.Driver{{Input: "=cmd|' /C calc'!A0", Share: 0.9}}
	r.Targets[0].Score.P05 = -0.25 // a negative number stays a number
	var buf bytes.Buffer
	if err := WriteCSV(&buf, r); err != nil {
		t.Fatal(err)
	}
	_, rows := readCSV(t, buf.Bytes())
	for i, row := range rows {
		tg := &r.Targets[i]
		for col, want := range map[string]string{"name": tg.Name, "planet": tg.Planet, "star": tg.Star} {
			cell := row[col]
			if cell != "" && formulaLead(cell[0]) {
				t.Errorf("row %d %s = %q begins with a formula character", i+1, col, cell)
			}
			if UnsafeText(cell) != want {
				t.Errorf("row %d %s = %q, want %q behind the apostrophe", i+1, col, cell, want)
			}
		}
	}
	if got := rows[0]["name"]; got != "'=1+1" {
		t.Errorf("name =1+1 written as %q, want '=1+1", got)
	}
	if got := rows[1]["name"]; got != "'@SUM(A1)" {
		t.Errorf("name @SUM(A1) written as %q", got)
	}
	if got := rows[0]["main_driver"]; got != "'=cmd|' /C calc'!A0" {
		t.Errorf("driver written as %q", got)
	}
	if got := rows[0]["score_p05"]; got != "-0.25" {
		t.Errorf("negative number written as %q, want -0.25 unaltered", got)
	}
}

func TestSafeText(t *testing.T) {
	tests := []struct{ in, want string }{
		{"Velra b I", "Velra b I"},
		{"=1+1", "'=1+1"},
		{"@SUM(A1)", "'@SUM(A1)"},
		{"+x", "'+x"},
		{"-x", "'-x"},
		{"\tx", "'\tx"},
		{"\rx", "'\rx"},
		{"\x00x", "'\x00x"},
		{"", ""},
		{"a=b", "a=b"},
		{"'quoted", "'quoted"},
		{"bad\xffutf8", "bad\uFFFDutf8"},
	}
	for _, tt := range tests {
		if got := SafeText(tt.in); got != tt.want {
			t.Errorf("SafeText(%q) = %q, want %q", tt.in, got, tt.want)
		}
		if got := UnsafeText(SafeText(tt.in)); got != strings.ToValidUTF8(tt.in, "\uFFFD") {
			t.Errorf("UnsafeText(SafeText(%q)) = %q", tt.in, got)
		}
	}
}
