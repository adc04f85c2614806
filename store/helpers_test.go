package store

import (
	"context"
	"crypto/sha256"
	"encoding/hex"
	"fmt"
	"math"
	"testing"
	"time"

	"tidesift/schema"
)

// Every body and value in these tests is invented.

func mustOpen(tb testing.TB, path string) *Store {
	tb.Helper()
	s, err := Open(context.Background(), path, Options{})
	if err != nil {
		tb.Fatalf("Open(%s): %v", path, err)
	}
	tb.Cleanup(func() { s.Close() })
	s.Now = fixedClock()
	return s
}

func memStore(tb testing.TB) *Store {
	tb.Helper()
	return mustOpen(tb, MemoryPath)
}

// fixedClock ticks one minute per call from a fixed instant.
func fixedClock() func() time.Time {
	t := time.Date(2026, 3, 1, 12, 0, 0, 0, time.UTC)
	return func() time.Time {
		t = t.Add(time.Minute)
		return t
	}
}

func sum(s string) string {
	h := sha256.Sum256([]byte(s))
	return hex.EncodeToString(h[:])
}

func p(key string, v float64) schema.Param { return schema.Param{Key: key, Value: v} }

func pSym(key string, v, sigma float64) schema.Param {
	return schema.Param{Key: key, Value: v, Unc: schema.Uncertainty{Kind: schema.UncSymmetric, Sigma: sigma}}
}

func rec(name, planet, star string, params ...schema.Param) schema.Record {
	return schema.Record{Name: name, Planet: planet, Star: star, Source: "invented test row", Params: params}
}

func mustImport(tb testing.TB, s *Store, req ImportRequest) *ImportResult {
	tb.Helper()
	res, err := s.Import(context.Background(), req)
	if err != nil {
		tb.Fatalf("Import(%s): %v", req.File, err)
	}
	return res
}

func mustSnapshot(tb testing.TB, s *Store, rev int64) *schema.Catalog {
	tb.Helper()
	c, err := s.Snapshot(context.Background(), rev)
	if err != nil {
		tb.Fatalf("Snapshot(%d): %v", rev, err)
	}
	return c
}

func moonOf(tb testing.TB, c *schema.Catalog, name, planet string) *schema.Body {
	tb.Helper()
	for i := range c.Moons {
		m := &c.Moons[i]
		if schema.NameKey(m.Name) == schema.NameKey(name) && schema.NameKey(m.Parent) == schema.NameKey(planet) {
			return m
		}
	}
	tb.Fatalf("snapshot at revision %d has no moon %q of %q", c.Revision.ID, name, planet)
	return nil
}

func countRows(tb testing.TB, s *Store, table string) int {
	tb.Helper()
	var n int
	if err := s.db.QueryRow("SELECT count(*) FROM " + table).Scan(&n); err != nil {
		tb.Fatal(err)
	}
	return n
}

// near compares floats with a relative tolerance.
func near(a, b, rel float64) bool {
	if a == b {
		return true
	}
	return math.Abs(a-b) <= rel*math.Max(math.Abs(a), math.Abs(b))
}

// synthRecords builds n invented moons of planets named "Test Giant k",
// each with nParams moon values, plus a planet mass on every row. Values vary
// with seed so that two calls with different seeds change every value.
func synthRecords(n, planets int, seed float64) []schema.Record {
	out := make([]schema.Record, n)
	for i := range out {
		f := float64(i+1) + seed
		params := []schema.Param{
			pSym("mass", 1e20*f, 1e18*f),
			p("radius", 1e5*f),
			p("semi_major_axis", 1e8*f),
			p("eccentricity", 0.5/(f+1)),
			p("period", 1e5*f),
			{Key: "k2_q", Value: 0.01, Unc: schema.Uncertainty{Kind: schema.UncFactor, Factor: 3}},
			{Key: "bond_albedo", Value: 0.5, Unc: schema.Uncertainty{Kind: schema.UncRange, Min: 0.3, Max: 0.7 + seed/1e6}},
			{Key: "obliquity", Value: 0.01, Unc: schema.Uncertainty{Kind: schema.UncAsymmetric, Plus: 0.01, Minus: 0.005}},
			p("density", 1000+f),
		}
		pl := fmt.Sprintf("Test Giant %d", i%planets)
		params = append(params, p("planet_mass", 1e27*(1+float64(i%planets))))
		out[i] = schema.Record{File: "synthetic.csv", Row: i + 1, Name: fmt.Sprintf("Test Moon %d", i), Planet: pl,
			Star: "Test Star", Source: "synthetic", Params: sortParams(params)}
	}
	return out
}

func sortParams(ps []schema.Param) []schema.Param {
	for i := 1; i < len(ps); i++ {
		for j := i; j > 0 && ps[j].Key < ps[j-1].Key; j-- {
			ps[j], ps[j-1] = ps[j-1], ps[j]
		}
	}
	return ps
}

// valuesPerRevision counts the values each revision set, from the encoded
// states (a value carried into a later state counts once, for the revision
// that set it).
func valuesPerRevision(tb testing.TB, s *Store) map[int64]int {
	tb.Helper()
	kc, err := loadKeyCodes(context.Background(), s.db)
	if err != nil {
		tb.Fatal(err)
	}
	rows, err := s.db.Query("SELECT set_rev, data FROM state")
	if err != nil {
		tb.Fatal(err)
	}
	defer rows.Close()
	held := map[int64]int{}
	for rows.Next() {
		var set int64
		var data []byte
		if err := rows.Scan(&set, &data); err != nil {
			tb.Fatal(err)
		}
		es, err := kc.decode(nil, data, interner{})
		if err != nil {
			tb.Fatal(err)
		}
		for _, e := range es {
			if e.p.Revision == set {
				held[set]++
			}
		}
	}
	if err := rows.Err(); err != nil {
		tb.Fatal(err)
	}
	return held
}
