package store

import (
	"context"
	"errors"
	"fmt"
	"math/rand/v2"
	"reflect"
	"strings"
	"testing"
	"time"

	"tidesift/schema"
)

// threeRevisions builds: r1 Aster (mass, radius) + planet mass; r2 changes
// Aster's mass and adds Beryl; r3 changes the planet mass and Aster's radius
// source.
func threeRevisions(tb testing.TB) *Store {
	tb.Helper()
	s := memStore(tb)
	mustImport(tb, s, ImportRequest{File: "r1.csv", SHA256: sum("r1"), Records: []schema.Record{
		rec("Aster", "Test Giant", "", p("mass", 1e22), p("planet_mass", 1.9e27), p("radius", 1.5e6)),
	}})
	mustImport(tb, s, ImportRequest{File: "r2.csv", SHA256: sum("r2"), Records: []schema.Record{
		rec("Aster", "Test Giant", "", p("mass", 1.1e22)),
		rec("Beryl", "Test Giant", "", p("mass", 4e22)),
	}})
	r3 := rec("Aster", "Test Giant", "", p("planet_mass", 2e27), p("radius", 1.5e6))
	r3.Source = "a later invented source"
	mustImport(tb, s, ImportRequest{File: "r3.csv", SHA256: sum("r3"), Records: []schema.Record{r3}})
	return s
}

func describeChanges(cs []ValueChange) string {
	var out []string
	for _, c := range cs {
		f := func(p *schema.Param) string {
			if p == nil {
				return "-"
			}
			return fmt.Sprintf("%g@%d", p.Value, p.Revision)
		}
		out = append(out, fmt.Sprintf("%s %s/%s %s %s→%s", c.Kind, c.Body, c.Parent, c.Key, f(c.Old), f(c.New)))
	}
	return strings.Join(out, "; ")
}

func TestDiffAcrossThreeRevisions(t *testing.T) {
	s := threeRevisions(t)
	tests := []struct {
		a, b int64
		want string
	}{
		{1, 2, "moon Aster/Test Giant mass 1e+22@1→1.1e+22@2; moon Beryl/Test Giant mass -→4e+22@2"},
		{2, 3, "planet Test Giant/ planet_mass 1.9e+27@1→2e+27@3; moon Aster/Test Giant radius 1.5e+06@1→1.5e+06@3"},
		{1, 3, "planet Test Giant/ planet_mass 1.9e+27@1→2e+27@3; moon Aster/Test Giant mass 1e+22@1→1.1e+22@2; " +
			"moon Aster/Test Giant radius 1.5e+06@1→1.5e+06@3; moon Beryl/Test Giant mass -→4e+22@2"},
		{1, 0, "planet Test Giant/ planet_mass 1.9e+27@1→2e+27@3; moon Aster/Test Giant mass 1e+22@1→1.1e+22@2; " +
			"moon Aster/Test Giant radius 1.5e+06@1→1.5e+06@3; moon Beryl/Test Giant mass -→4e+22@2"},
		// Backwards: how to return from 2 to 1.
		{2, 1, "moon Aster/Test Giant mass 1.1e+22@2→1e+22@1; moon Beryl/Test Giant mass 4e+22@2→-"},
		{2, 2, ""},
	}
	for _, tt := range tests {
		t.Run(fmt.Sprintf("%d-%d", tt.a, tt.b), func(t *testing.T) {
			cs, err := s.Diff(context.Background(), tt.a, tt.b)
			if err != nil {
				t.Fatal(err)
			}
			if got := describeChanges(cs); got != tt.want {
				t.Errorf("Diff(%d, %d) =\n%s\nwant\n%s", tt.a, tt.b, got, tt.want)
			}
		})
	}
	if _, err := s.Diff(context.Background(), 1, 9); !errors.Is(err, ErrNotFound) || !strings.Contains(err.Error(), "valid revisions are 1 to 3") {
		t.Errorf("Diff(1, 9) = %v, want an error naming the range 1 to 3", err)
	}
}

func TestSnapshotRevisions(t *testing.T) {
	s := threeRevisions(t)
	ctx := context.Background()
	tests := []struct {
		rev       int64
		wantRev   int64
		wantMoons int
		wantMass  float64
		wantPM    float64
	}{
		{1, 1, 1, 1e22, 1.9e27},
		{2, 2, 2, 1.1e22, 1.9e27},
		{3, 3, 2, 1.1e22, 2e27},
		{0, 3, 2, 1.1e22, 2e27},
	}
	for _, tt := range tests {
		c := mustSnapshot(t, s, tt.rev)
		if c.Revision.ID != tt.wantRev || len(c.Moons) != tt.wantMoons {
			t.Errorf("Snapshot(%d): revision %d with %d moons, want %d with %d", tt.rev, c.Revision.ID, len(c.Moons), tt.wantRev, tt.wantMoons)
			continue
		}
		if m := moonOf(t, c, "Aster", "Test Giant").Params["mass"].Value; m != tt.wantMass {
			t.Errorf("Snapshot(%d): Aster mass %g, want %g", tt.rev, m, tt.wantMass)
		}
		if pm := c.Planet("Test Giant").Params["planet_mass"].Value; pm != tt.wantPM {
			t.Errorf("Snapshot(%d): planet_mass %g, want %g", tt.rev, pm, tt.wantPM)
		}
	}
	for _, bad := range []int64{4, -1} {
		if _, err := s.Snapshot(ctx, bad); !errors.Is(err, ErrNotFound) || !strings.Contains(err.Error(), "valid revisions are 1 to 3") {
			t.Errorf("Snapshot(%d) = %v, want an error naming 1 to 3", bad, err)
		}
	}
	if _, err := memStore(t).Snapshot(ctx, 1); err == nil || !strings.Contains(err.Error(), "no revisions yet") {
		t.Errorf("Snapshot(1) of an empty catalog = %v", err)
	}
	revs, err := s.Revisions(ctx)
	if err != nil {
		t.Fatal(err)
	}
	if len(revs) != 3 {
		t.Fatalf("%d revisions, want 3", len(revs))
	}
	want := []struct {
		file    string
		changes int
	}{{"r1.csv", 3}, {"r2.csv", 2}, {"r3.csv", 2}}
	for i, r := range revs {
		if r.ID != int64(i+1) || r.File != want[i].file || r.Changes != want[i].changes || r.SHA256 != sum(strings.TrimSuffix(r.File, ".csv")) {
			t.Errorf("revision %d = %+v, want file %s with %d changes", i+1, r, want[i].file, want[i].changes)
		}
		if i > 0 && !r.Time.After(revs[i-1].Time) {
			t.Errorf("revision %d time %v not after %v", r.ID, r.Time, revs[i-1].Time)
		}
		if r.Time.Location() != time.UTC {
			t.Errorf("revision %d time %v not in UTC", r.ID, r.Time)
		}
	}
}

// naiveDiff compares two whole snapshots; Diff must agree with it.
func naiveDiff(tb testing.TB, s *Store, a, b int64) map[string]string {
	tb.Helper()
	flat := func(c *schema.Catalog) map[string]schema.Param {
		m := map[string]schema.Param{}
		for _, list := range [][]schema.Body{c.Stars, c.Planets, c.Moons} {
			for _, body := range list {
				for k, p := range body.Params {
					m[fmt.Sprintf("%s %s/%s %s", body.Kind, body.Name, body.Parent, k)] = p
				}
			}
		}
		return m
	}
	ma, mb := flat(mustSnapshot(tb, s, a)), flat(mustSnapshot(tb, s, b))
	out := map[string]string{}
	for k, pb := range mb {
		if pa, ok := ma[k]; !ok {
			out[k] = fmt.Sprintf("-→%g", pb.Value)
		} else if !sameValue(pa, pb) {
			out[k] = fmt.Sprintf("%g→%g", pa.Value, pb.Value)
		}
	}
	for k, pa := range ma {
		if _, ok := mb[k]; !ok {
			out[k] = fmt.Sprintf("%g→-", pa.Value)
		}
	}
	return out
}

func TestDiffAgreesWithSnapshots(t *testing.T) {
	s := memStore(t)
	rng := rand.New(rand.NewPCG(5, 5)) // fixed seed
	moons := []string{"Aster", "Beryl", "Cinder", "Dune"}
	for r := 0; r < 8; r++ {
		var recs []schema.Record
		planetMass := float64(1+rng.IntN(2)) * 1e27 // one per request: its rows must agree
		for _, m := range moons {
			if rng.IntN(2) == 0 {
				continue
			}
			// Few distinct values, so values often change back.
			recs = append(recs, rec(m, "Test Giant", "Test Star",
				p("mass", float64(1+rng.IntN(3))*1e21), p("radius", float64(1+rng.IntN(2))*1e6),
				p("planet_mass", planetMass)))
		}
		if len(recs) == 0 {
			continue
		}
		mustImport(t, s, ImportRequest{File: fmt.Sprintf("r%d", r), Records: recs})
	}
	revs, _ := s.Revisions(context.Background())
	if len(revs) < 4 {
		t.Fatalf("only %d revisions made", len(revs))
	}
	for _, ra := range revs {
		for _, rb := range revs {
			cs, err := s.Diff(context.Background(), ra.ID, rb.ID)
			if err != nil {
				t.Fatal(err)
			}
			got := map[string]string{}
			for _, c := range cs {
				f := func(p *schema.Param) string {
					if p == nil {
						return "-"
					}
					return fmt.Sprintf("%g", p.Value)
				}
				got[fmt.Sprintf("%s %s/%s %s", c.Kind, c.Body, c.Parent, c.Key)] = f(c.Old) + "→" + f(c.New)
			}
			want := naiveDiff(t, s, ra.ID, rb.ID)
			if fmt.Sprint(got) != fmt.Sprint(want) {
				t.Errorf("Diff(%d, %d) = %v\nsnapshots say %v", ra.ID, rb.ID, got, want)
			}
		}
	}
}

func TestRevisionTimesNeverGoBackwards(t *testing.T) {
	s := memStore(t)
	times := []time.Time{
		time.Date(2026, 5, 1, 0, 0, 0, 0, time.UTC),
		time.Date(2026, 4, 1, 0, 0, 0, 0, time.UTC), // the clock was set back
	}
	i := 0
	s.Now = func() time.Time { t := times[i]; i++; return t }
	mustImport(t, s, ImportRequest{File: "a", Records: []schema.Record{rec("Aster", "Test Giant", "", p("mass", 1e22))}})
	mustImport(t, s, ImportRequest{File: "b", Records: []schema.Record{rec("Beryl", "Test Giant", "", p("mass", 1e22))}})
	revs, _ := s.Revisions(context.Background())
	if len(revs) != 2 || !revs[1].Time.Equal(times[0]) {
		t.Errorf("revision times %v, want the second clamped to %v", revs, times[0])
	}
	if rep, err := s.Check(context.Background()); err != nil || !rep.OK() {
		t.Errorf("Check = %v, %v", rep, err)
	}
}

// TestSnapshotOfMatchesSnapshot: the cut-down snapshot of one name holds
// exactly the matching moons of the full snapshot, with their planets and
// stars, at every revision (aliases and a name shared by two planets'
// moons included).
func TestSnapshotOfMatchesSnapshot(t *testing.T) {
	s := threeRevisions(t)
	twin := rec("Aster", "Other Giant", "Other Star", p("mass", 3e22), p("star_luminosity", 1e26))
	twin.Aliases = []string{"OG I"}
	mustImport(t, s, ImportRequest{File: "r4.csv", SHA256: sum("r4"), Records: []schema.Record{twin}})
	ctx := context.Background()
	for rev := int64(0); rev <= 4; rev++ {
		full := mustSnapshot(t, s, rev)
		for _, name := range []string{"Aster", " aster ", "Beryl", "OG I", "Nobody"} {
			got, err := s.SnapshotOf(ctx, rev, name)
			if err != nil {
				t.Fatalf("SnapshotOf(%d, %q): %v", rev, name, err)
			}
			want := &schema.Catalog{Revision: full.Revision, Stars: []schema.Body{}, Planets: []schema.Body{}, Moons: []schema.Body{}}
			parents := map[string]bool{}
			for _, m := range full.Moons {
				match := schema.NameKey(m.Name) == schema.NameKey(name)
				for _, a := range m.Aliases {
					match = match || schema.NameKey(a) == schema.NameKey(name)
				}
				if match {
					want.Moons = append(want.Moons, m)
					parents[m.Parent] = true
				}
			}
			stars := map[string]bool{}
			for _, pl := range full.Planets {
				if parents[pl.Name] {
					want.Planets = append(want.Planets, pl)
					stars[pl.Parent] = true
				}
			}
			for _, st := range full.Stars {
				if stars[st.Name] {
					want.Stars = append(want.Stars, st)
				}
			}
			if !reflect.DeepEqual(got, want) {
				t.Errorf("SnapshotOf(%d, %q):\n got %+v\nwant %+v", rev, name, got, want)
			}
		}
	}
}
