package export

import (
	"bytes"
	"strings"
	"testing"
)

func TestWriteTable(t *testing.T) {
	tests := []struct {
		name   string
		opt    TableOptions
		golden string
	}{
		{"all", TableOptions{}, "table.golden"},
		{"top 2", TableOptions{Top: 2}, "table_top2.golden"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			var buf bytes.Buffer
			if err := WriteTable(&buf, sampleResult(), tt.opt); err != nil {
				t.Fatal(err)
			}
			out := buf.String()
			for _, want := range []string{"Velra b I*", "0.62 (0.48–0.71)", "P(top 2)", "k2_q (62%)", "seed 42", "4000 Monte Carlo samples", "profile ocean-worlds", "catalog revision 7", "not a substitute for expert review", "* marks a target with inputs assumed"} {
				if !strings.Contains(out, want) {
					t.Errorf("table lacks %q:\n%s", want, out)
				}
			}
			if strings.Contains(out, "\x1b") {
				t.Error("table holds terminal escapes")
			}
			checkGolden(t, tt.golden, buf.Bytes())
		})
	}
}

func TestWriteTableHostileNamesStayOnOneLine(t *testing.T) {
	var buf bytes.Buffer
	if err := WriteTable(&buf, hostileResult(), TableOptions{}); err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(buf.String(), "\n")
	if got := len(lines); got < 8 {
		t.Fatalf("%d lines", got)
	}
	for i, l := range lines[1:8] {
		if strings.ContainsAny(l, "\t\r") {
			t.Errorf("line %d holds a tab or CR: %q", i+2, l)
		}
	}
}
