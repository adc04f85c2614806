package importers

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"tidesift/schema"
)

// FuzzRead checks that Read and SuggestMap never panic on arbitrary bytes,
// that whatever Read accepts is a well-formed record set (every record
// named, its parameters sorted, unique and inside their domains), and that
// every suggested map loads.
func FuzzRead(f *testing.F) {
	for _, name := range []string{"canonical.csv", "foreign.csv"} {
		b, err := os.ReadFile(filepath.Join("testdata", name))
		if err != nil {
			f.Fatal(err)
		}
		f.Add(b, uint8(0))
	}
	f.Add([]byte("name,planet,mass [kg],mass_err\nA,P,1e20,1e19\nB,P,-1,x\n"), uint8(1))
	f.Add([]byte("name\tplanet\tradius [km]\r\nA\tP\t10\r"), uint8(2))
	f.Add([]byte("\xef\xbb\xbfname,planet,star,planet_mass [Mjup]\nA,P,S,1\nB,P,T,2\n"), uint8(3))
	names := []string{"f.csv", "f.tsv", "f", "f.txt"}
	f.Fuzz(func(t *testing.T, data []byte, mode uint8) {
		opt := Options{SkipInvalid: mode&1 == 1, MaxErrors: int(mode>>4) + 1, MaxRecordBytes: 4096}
		name := names[int(mode>>1)%len(names)]
		// A suggested map, whatever the file, loads as written.
		if s, err := SuggestMap(name, bytes.NewReader(data), opt); err == nil {
			if _, err := LoadMap(strings.NewReader(s)); err != nil {
				t.Fatalf("the suggested map does not load: %v\n%s", err, s)
			}
		}
		res, err := Read(name, bytes.NewReader(data), opt)
		if err != nil {
			if res != nil {
				t.Fatalf("error with a result: %v", err)
			}
			if err.Error() == "" {
				t.Fatal("empty error message")
			}
			return
		}
		for _, r := range res.Records {
			if r.Name == "" || r.Planet == "" {
				t.Fatalf("record without a name or planet: %+v", r)
			}
			for i, p := range r.Params {
				if i > 0 && r.Params[i-1].Key >= p.Key {
					t.Fatalf("params not sorted and unique: %+v", r.Params)
				}
				if err := schema.CheckParam(p); err != nil {
					t.Fatalf("accepted an invalid parameter %+v: %v", p, err)
				}
			}
		}
		if !opt.SkipInvalid && len(res.Rejects) > 0 {
			t.Fatal("rejects outside SkipInvalid")
		}
	})
}
