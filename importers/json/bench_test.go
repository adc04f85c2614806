package json

import (
	"bytes"
	"fmt"
	"io"
	"testing"
	"time"
)

// benchDoc is n invented rows of 12 columns, as an array or as NDJSON.
func benchDoc(n int, ndjson bool) []byte {
	var b bytes.Buffer
	if !ndjson {
		b.WriteString("[\n")
	}
	for i := range n {
		fmt.Fprintf(&b, `{"name":"Invented moon %d","planet":"Vasha b"`, i)
		for k := range 10 {
			fmt.Fprintf(&b, `,"v%d [kg]":%g`, k, float64(i*k)*1.37e19)
		}
		b.WriteByte('}')
		if !ndjson && i < n-1 {
			b.WriteByte(',')
		}
		b.WriteByte('\n')
	}
	if !ndjson {
		b.WriteString("]\n")
	}
	return b.Bytes()
}

func benchJSON(b *testing.B, ndjson bool, opt Options) {
	const n = 20000
	doc := benchDoc(n, ndjson)
	b.SetBytes(int64(len(doc)))
	b.ReportAllocs()
	start := time.Now()
	for b.Loop() {
		rd, err := NewReader(noSeek{bytes.NewReader(doc)}, opt)
		if err != nil {
			b.Fatal(err)
		}
		rows := 0
		for {
			_, _, err := rd.Next()
			if err == io.EOF {
				break
			}
			if err != nil {
				b.Fatal(err)
			}
			rows++
		}
		if rows != n {
			b.Fatalf("%d rows", rows)
		}
	}
	b.ReportMetric(float64(n*b.N)/time.Since(start).Seconds(), "rows/s")
}

// BenchmarkArray reads 20k rows of 12 columns from a JSON array, in one pass.
func BenchmarkArray(b *testing.B) { benchJSON(b, false, Options{}) }

// BenchmarkNDJSON reads the same rows as NDJSON.
func BenchmarkNDJSON(b *testing.B) { benchJSON(b, true, Options{}) }
