package votable

import (
	"bytes"
	"fmt"
	"io"
	"math/rand/v2"
	"strconv"
	"testing"
	"time"
)

// benchFields is a canonical-like moon table of 12 columns: a name and eleven
// doubles.
func benchFields() []wfield {
	fs := []wfield{{name: "name", datatype: "char", arraysize: "*"}}
	for i := range 11 {
		fs = append(fs, wfield{name: "v" + strconv.Itoa(i), datatype: "double", unit: "kg"})
	}
	return fs
}

func benchRows(n int) [][]any {
	r := rand.New(rand.NewPCG(1, 1))
	rows := make([][]any, n)
	for i := range rows {
		row := []any{fmt.Sprintf("Invented moon %d", i)}
		for range 11 {
			if r.IntN(20) == 0 {
				row = append(row, nil)
			} else {
				row = append(row, r.Float64()*1e22)
			}
		}
		rows[i] = row
	}
	return rows
}

func tabledataDoc(fields []wfield, rows [][]any) []byte {
	var b bytes.Buffer
	b.WriteString(`<?xml version="1.0"?>` + "\n" + `<VOTABLE version="1.4" xmlns="http://www.ivoa.net/xml/VOTable/v1.3"><RESOURCE><TABLE>` + "\n")
	for _, f := range fields {
		fmt.Fprintf(&b, "<FIELD name=%q datatype=%q unit=%q/>\n", f.name, f.datatype, f.unit)
	}
	b.WriteString("<DATA><TABLEDATA>\n")
	for _, row := range rows {
		b.WriteString("<TR>")
		for _, v := range row {
			b.WriteString("<TD>")
			switch x := v.(type) {
			case string:
				b.WriteString(x)
			case float64:
				b.WriteString(strconv.FormatFloat(x, 'g', -1, 64))
			}
			b.WriteString("</TD>")
		}
		b.WriteString("</TR>\n")
	}
	b.WriteString("</TABLEDATA></DATA></TABLE></RESOURCE></VOTABLE>\n")
	return b.Bytes()
}

func benchRead(b *testing.B, doc []byte, nrows int) {
	b.SetBytes(int64(len(doc)))
	b.ReportAllocs()
	start := time.Now()
	for b.Loop() {
		rd, err := NewReader(bytes.NewReader(doc), Options{})
		if err != nil {
			b.Fatal(err)
		}
		n := 0
		for {
			_, _, err := rd.Next()
			if err == io.EOF {
				break
			}
			if err != nil {
				b.Fatal(err)
			}
			n++
		}
		if n != nrows {
			b.Fatalf("read %d rows, want %d", n, nrows)
		}
	}
	b.ReportMetric(float64(nrows*b.N)/time.Since(start).Seconds(), "rows/s")
}

// BenchmarkTableData reads 20k rows of 12 columns from TABLEDATA; the goal is
// at least 45k rows/s.
func BenchmarkTableData(b *testing.B) {
	const n = 20000
	benchRead(b, tabledataDoc(benchFields(), benchRows(n)), n)
}

// BenchmarkBinary2 reads the same rows from BINARY2; the goal is at least
// 150k rows/s.
func BenchmarkBinary2(b *testing.B) {
	const n = 20000
	benchRead(b, binaryDoc(b, benchFields(), benchRows(n), true), n)
}
