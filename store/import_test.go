package store

import (
	"context"
	"errors"
	"fmt"
	"strings"
	"testing"

	"tidesift/schema"
)

// firstFile is an invented two-planet system: a star with one planet and two
// moons, and a star-less planet with one moon.
func firstFile() ImportRequest {
	return ImportRequest{File: "first.csv", SHA256: sum("first"), Note: "initial", Records: []schema.Record{
		rec("Aster", "Test Giant", "Test Star",
			pSym("mass", 1.0e22, 1e20), p("radius", 1.5e6), p("eccentricity", 0.004),
			p("planet_mass", 1.9e27), p("star_luminosity", 3.8e26)),
		rec("Beryl", "Test Giant", "Test Star",
			p("mass", 4.8e22), p("radius", 1.56e6),
			p("planet_mass", 1.9e27), p("star_luminosity", 3.8e26)),
		rec("Cinder", "Lone World", "", p("mass", 2e21)),
	}}
}

func TestImportHappyPath(t *testing.T) {
	s := memStore(t)
	res := mustImport(t, s, firstFile())
	if res.Revision == nil || res.Revision.ID != 1 {
		t.Fatalf("Revision = %+v, want revision 1", res.Revision)
	}
	// 3 + 2 + 1 moon values, 1 planet_mass (twice on rows, once stored), 1 star_luminosity.
	if res.Added != 8 || res.Changed != 0 || res.Unchanged != 0 || res.NewBodies != 6 {
		t.Errorf("counts = added %d changed %d unchanged %d new bodies %d; want 8 0 0 6",
			res.Added, res.Changed, res.Unchanged, res.NewBodies)
	}
	if len(res.Changes) != 8 || res.Revision.Changes != 8 {
		t.Errorf("len(Changes) = %d, Revision.Changes = %d; want 8", len(res.Changes), res.Revision.Changes)
	}
	c := mustSnapshot(t, s, 0)
	if len(c.Stars) != 1 || len(c.Planets) != 2 || len(c.Moons) != 3 {
		t.Fatalf("snapshot has %d stars, %d planets, %d moons; want 1, 2, 3", len(c.Stars), len(c.Planets), len(c.Moons))
	}
	// Moons sorted by (planet key, name key): "lone world" < "test giant".
	var order []string
	for _, m := range c.Moons {
		order = append(order, m.Name+"/"+m.Parent)
	}
	if got := strings.Join(order, ","); got != "Cinder/Lone World,Aster/Test Giant,Beryl/Test Giant" {
		t.Errorf("moon order = %s", got)
	}
	a := moonOf(t, c, "aster", "TEST  GIANT")
	m := a.Params["mass"]
	if !near(m.Value, 1e22, 0) || m.Unc.Kind != schema.UncSymmetric || m.Unc.Sigma != 1e20 || m.Source != "invented test row" ||
		m.Status != schema.StatusMeasured || m.Revision != 1 {
		t.Errorf("Aster mass = %+v", m)
	}
	if _, ok := a.Params["planet_mass"]; ok {
		t.Error("planet_mass was filed on the moon, want on the planet")
	}
	if pl := c.Planet("test giant"); pl == nil || pl.Parent != "Test Star" || pl.Params["planet_mass"].Value != 1.9e27 {
		t.Errorf("planet = %+v", pl)
	}
	if st := c.Star("Test Star"); st == nil || st.Params["star_luminosity"].Value != 3.8e26 {
		t.Errorf("star = %+v", st)
	}
	if pl := c.Planet("Lone World"); pl == nil || pl.Parent != "" {
		t.Errorf("star-less planet = %+v", pl)
	}
	if in := c.Inputs(a); in["star_luminosity"].Value != 3.8e26 || in["planet_mass"].Value != 1.9e27 || in["mass"].Value != 1e22 {
		t.Errorf("Inputs(Aster) = %v", in)
	}
}

func TestImportDuplicateAndUnchanged(t *testing.T) {
	s := memStore(t)
	mustImport(t, s, firstFile())
	before := countRows(t, s, "state")

	dup := mustImport(t, s, firstFile())
	if dup.Duplicate == nil || dup.Duplicate.ID != 1 || dup.Revision != nil {
		t.Errorf("re-import = %+v, want Duplicate revision 1 and no revision", dup)
	}
	// Same content under another digest: no revision either.
	same := firstFile()
	same.SHA256 = sum("first, saved again")
	res := mustImport(t, s, same)
	if res.Revision != nil || res.Duplicate != nil || res.Unchanged != 8 || res.Added+res.Changed != 0 || len(res.Changes) != 0 {
		t.Errorf("unchanged import = %+v, want no revision and 8 unchanged", res)
	}
	if n := countRows(t, s, "revision"); n != 1 {
		t.Errorf("%d revisions, want 1", n)
	}
	if n := countRows(t, s, "state"); n != before {
		t.Errorf("%d value rows, want %d", n, before)
	}
}

func TestImportChangeMakesHistory(t *testing.T) {
	s := memStore(t)
	ctx := context.Background()
	mustImport(t, s, firstFile())
	res := mustImport(t, s, ImportRequest{File: "second.csv", SHA256: sum("second"), Records: []schema.Record{
		rec("Aster", "Test Giant", "", pSym("mass", 1.1e22, 5e19), p("radius", 1.5e6)),
	}})
	if res.Revision == nil || res.Revision.ID != 2 || res.Changed != 1 || res.Unchanged != 1 || res.Added != 0 {
		t.Fatalf("second import = %+v", res)
	}
	if len(res.Changes) != 1 || res.Changes[0].Old.Value != 1e22 || res.Changes[0].New.Value != 1.1e22 ||
		res.Changes[0].Body != "Aster" || res.Changes[0].Parent != "Test Giant" || res.Changes[0].Kind != schema.KindMoon {
		t.Errorf("Changes = %+v", res.Changes)
	}
	hist, err := s.History(ctx, "Aster", "", "mass")
	if err != nil {
		t.Fatal(err)
	}
	if len(hist) != 2 || hist[0].Param.Value != 1e22 || hist[0].SupersededBy != 2 || hist[0].Param.Revision != 1 ||
		hist[1].Param.Value != 1.1e22 || hist[1].SupersededBy != 0 || hist[1].Param.Revision != 2 {
		t.Errorf("history = %+v", hist)
	}
	old := moonOf(t, mustSnapshot(t, s, 1), "Aster", "Test Giant").Params["mass"]
	cur := moonOf(t, mustSnapshot(t, s, 2), "Aster", "Test Giant").Params["mass"]
	if old.Value != 1e22 || old.Revision != 1 || cur.Value != 1.1e22 || cur.Revision != 2 {
		t.Errorf("mass at rev 1 = %+v, at rev 2 = %+v", old, cur)
	}
	all, err := s.History(ctx, "aster", "test giant", "")
	if err != nil {
		t.Fatal(err)
	}
	keys := map[string]int{}
	for _, e := range all {
		keys[e.Key]++
	}
	if keys["mass"] != 2 || keys["radius"] != 1 || keys["planet_mass"] != 1 || keys["star_luminosity"] != 1 {
		t.Errorf("full history keys = %v", keys)
	}
}

func TestImportAllOrNothing(t *testing.T) {
	tests := []struct {
		name string
		bad  schema.Record
		want string
	}{
		{"unknown key", rec("Dune", "Test Giant", "", p("mass", 1e20), p("colour", 3)), `unknown key "colour"`},
		{"out of domain", rec("Dune", "Test Giant", "", p("eccentricity", 1.2)), "eccentricity = 1.2"},
		{"bad uncertainty", rec("Dune", "Test Giant", "", pSym("mass", 1e20, -1)), "negative uncertainty"},
		{"star value without star", rec("Dune", "Test Giant", "", p("star_mass", 2e30)), "names no star"},
		{"no planet", rec("Dune", " ", "", p("mass", 1e20)), "has no planet"},
		{"no name", rec("", "Test Giant", "", p("mass", 1e20)), "no name"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			s := memStore(t)
			mustImport(t, s, firstFile())
			want := mustSnapshot(t, s, 0).ContentHash
			counts := [3]int{countRows(t, s, "revision"), countRows(t, s, "body"), countRows(t, s, "state")}
			tt.bad.Row = 3
			req := ImportRequest{File: "bad.csv", SHA256: sum("bad"), Records: []schema.Record{
				rec("Aster", "Test Giant", "", p("mass", 9e21)),            // a change…
				rec("Newt", "Fresh Planet", "Fresh Star", p("mass", 1e20)), // …new bodies…
				tt.bad, // …then the failure
			}}
			_, err := s.Import(context.Background(), req)
			if err == nil || !strings.Contains(err.Error(), tt.want) || !strings.Contains(err.Error(), "bad.csv row 3") {
				t.Fatalf("Import = %v, want an error naming bad.csv row 3 and containing %q", err, tt.want)
			}
			if got := mustSnapshot(t, s, 0).ContentHash; got != want {
				t.Error("catalog content changed after a failed import")
			}
			if got := [3]int{countRows(t, s, "revision"), countRows(t, s, "body"), countRows(t, s, "state")}; got != counts {
				t.Errorf("rows (revision, body, state) = %v after failed import, want %v", got, counts)
			}
			// The file was not recorded, so it can be imported once fixed.
			req.Records = req.Records[:2]
			if res := mustImport(t, s, req); res.Revision == nil || res.Duplicate != nil {
				t.Errorf("fixed import = %+v, want a new revision", res)
			}
		})
	}
}

func TestImportDryRunWritesNothing(t *testing.T) {
	s := memStore(t)
	mustImport(t, s, firstFile())
	want := mustSnapshot(t, s, 0).ContentHash
	req := ImportRequest{File: "second.csv", SHA256: sum("second"), DryRun: true, Records: []schema.Record{
		rec("Aster", "Test Giant", "", p("mass", 1.1e22)),
		rec("Dune", "Test Giant", "", p("mass", 3e20)),
	}}
	res := mustImport(t, s, req)
	if res.Revision == nil || res.Changed != 1 || res.Added != 1 || res.NewBodies != 1 || len(res.Changes) != 2 {
		t.Errorf("dry run = %+v", res)
	}
	if got := mustSnapshot(t, s, 0).ContentHash; got != want || countRows(t, s, "revision") != 1 {
		t.Error("dry run wrote to the catalog")
	}
	req.DryRun = false
	if res := mustImport(t, s, req); res.Duplicate != nil || res.Revision == nil || res.Revision.ID != 2 {
		t.Errorf("real import after dry run = %+v", res)
	}
}

func TestImportPlanetValueRepeatedInRequest(t *testing.T) {
	tests := []struct {
		name        string
		values      []float64 // planet_mass on successive rows; the catalog holds 1.9e27 before
		wantValue   float64
		wantChanged int
		wantChanges int
	}{
		{"same on every row", []float64{1.9e27, 1.9e27, 1.9e27}, 1.9e27, 0, 0},
		{"changed once, repeated", []float64{2e27, 2e27, 2e27}, 2e27, 1, 1},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			s := memStore(t)
			mustImport(t, s, firstFile())
			var recs []schema.Record
			for i, v := range tt.values {
				recs = append(recs, rec([]string{"Aster", "Beryl", "Dune"}[i], "Test Giant", "Test Star", p("planet_mass", v)))
			}
			res := mustImport(t, s, ImportRequest{File: "planet.csv", SHA256: sum(tt.name), Records: recs})
			if res.Changed != tt.wantChanged || len(res.Changes) != tt.wantChanges {
				t.Errorf("changed %d, %d changes listed; want %d, %d (%+v)", res.Changed, len(res.Changes), tt.wantChanged, tt.wantChanges, res.Changes)
			}
			if tt.wantChanges == 1 && res.Changes[0].New.Value != tt.wantValue {
				t.Errorf("listed new value %g, want %g", res.Changes[0].New.Value, tt.wantValue)
			}
			c := mustSnapshot(t, s, 0)
			if got := c.Planet("Test Giant").Params["planet_mass"].Value; got != tt.wantValue {
				t.Errorf("planet_mass = %g, want %g", got, tt.wantValue)
			}
			var n int
			s.db.QueryRow("SELECT count(*) FROM state s JOIN body b ON b.id = s.body_id WHERE b.kind = 'planet' AND s.superseded_rev IS NULL").Scan(&n)
			if n != 1 {
				t.Errorf("%d current planet states, want 1", n)
			}
		})
	}
}

// TestImportPlanetValueConflict: records of one request that give a planet
// different values are refused, naming the first row when it is known.
func TestImportPlanetValueConflict(t *testing.T) {
	tests := []struct {
		name   string
		values []float64
	}{
		{"changed twice", []float64{2e27, 2.1e27}},
		{"changed then put back", []float64{2e27, 1.9e27}},
		{"later row differs", []float64{1.9e27, 1.9e27, 2e27}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			s := memStore(t)
			mustImport(t, s, firstFile())
			before := mustSnapshot(t, s, 0).ContentHash
			var recs []schema.Record
			for i, v := range tt.values {
				r := rec([]string{"Aster", "Beryl", "Dune"}[i], "Test Giant", "Test Star", p("planet_mass", v))
				r.Row = i + 2
				recs = append(recs, r)
			}
			_, err := s.Import(context.Background(), ImportRequest{File: "planet.csv", SHA256: sum(tt.name), Records: recs})
			if !errors.Is(err, ErrConflict) || !strings.Contains(err.Error(), "planet_mass") {
				t.Fatalf("err = %v, want a planet_mass conflict", err)
			}
			if hostCacheLimit > 0 && !strings.Contains(err.Error(), "on row ") {
				t.Errorf("err = %v, want the earlier row named", err)
			}
			if got := mustSnapshot(t, s, 0).ContentHash; got != before {
				t.Error("a refused import changed the catalog")
			}
		})
	}
}

func TestImportAliases(t *testing.T) {
	s := memStore(t)
	ctx := context.Background()
	first := rec("Aster", "Test Giant", "", p("mass", 1e22))
	first.Aliases = []string{"TG I", "  tg   i "}
	mustImport(t, s, ImportRequest{File: "a.csv", Records: []schema.Record{first}})

	// A second source calls it by its alias: it lands on Aster.
	res := mustImport(t, s, ImportRequest{File: "b.csv", Records: []schema.Record{rec("tg i", "TEST GIANT", "", p("radius", 1.5e6))}})
	if res.NewBodies != 0 || res.Added != 1 {
		t.Errorf("alias import = %+v, want one value added to the existing moon", res)
	}
	// A third calls it by a new name and gives the old one as an alias:
	// the new name becomes an alias too.
	third := rec("Aster Major", "Test Giant", "", p("eccentricity", 0.01))
	third.Aliases = []string{"Aster"}
	res = mustImport(t, s, ImportRequest{File: "c.csv", Records: []schema.Record{third}})
	if res.NewBodies != 0 || res.NewAliases != 1 {
		t.Errorf("third import = %+v, want one new alias and no new body", res)
	}
	c := mustSnapshot(t, s, 0)
	if len(c.Moons) != 1 {
		t.Fatalf("%d moons, want 1: %+v", len(c.Moons), c.Moons)
	}
	m := c.Moons[0]
	if m.Name != "Aster" || strings.Join(m.Aliases, "|") != "Aster Major|TG I" || len(m.Params) != 3 {
		t.Errorf("moon = %+v", m)
	}
	// Aliases are part of the snapshot's revision.
	if old := mustSnapshot(t, s, 1).Moons[0]; strings.Join(old.Aliases, "|") != "TG I" {
		t.Errorf("aliases at revision 1 = %v", old.Aliases)
	}
	// The same alias under another planet is another moon.
	res = mustImport(t, s, ImportRequest{File: "d.csv", Records: []schema.Record{rec("TG I", "Other Giant", "", p("mass", 1e20))}})
	if res.NewBodies != 2 {
		t.Errorf("alias under another planet = %+v, want a new planet and moon", res)
	}
	if h, err := s.History(ctx, "aster major", "", "mass"); err != nil || len(h) != 1 {
		t.Errorf("History by alias = %v, %v", h, err)
	}
}

func TestImportAmbiguous(t *testing.T) {
	s := memStore(t)
	ctx := context.Background()
	a := rec("Aster", "Test Giant", "", p("mass", 1e22))
	b := rec("Beryl", "Test Giant", "", p("mass", 2e22))
	b.Aliases = []string{"The Twin"}
	mustImport(t, s, ImportRequest{File: "a.csv", Records: []schema.Record{a, b, rec("Aster", "Second Giant", "", p("mass", 3e22))}})
	before := mustSnapshot(t, s, 0).ContentHash

	// Named "Aster" with alias "The Twin": two moons answer.
	bad := rec("Aster", "Test Giant", "", p("mass", 5e22))
	bad.Aliases = []string{"The Twin"}
	_, err := s.Import(ctx, ImportRequest{File: "x.csv", Records: []schema.Record{bad}})
	if !errors.Is(err, ErrAmbiguous) || !strings.Contains(err.Error(), `"Aster", "Beryl"`) {
		t.Errorf("Import = %v, want ErrAmbiguous listing Aster and Beryl", err)
	}
	if mustSnapshot(t, s, 0).ContentHash != before {
		t.Error("ambiguous import wrote")
	}
	// History without a planet: two moons named Aster.
	_, err = s.History(ctx, "Aster", "", "")
	if !errors.Is(err, ErrAmbiguous) || !strings.Contains(err.Error(), "Aster (planet Second Giant), Aster (planet Test Giant)") {
		t.Errorf("History = %v, want ErrAmbiguous listing both planets", err)
	}
	if _, err := s.History(ctx, "Nobody", "", ""); !errors.Is(err, ErrNotFound) {
		t.Errorf("History of a missing moon = %v, want ErrNotFound", err)
	}
	// A planet given without its star, when two stars have one of that name.
	mustImport(t, s, ImportRequest{File: "b.csv", Records: []schema.Record{
		rec("Ember", "Twin World", "Star A", p("mass", 1e20)),
		rec("Flint", "Twin World", "Star B", p("mass", 1e20)),
	}})
	_, err = s.Import(ctx, ImportRequest{File: "c.csv", Records: []schema.Record{rec("Ember", "Twin World", "", p("mass", 2e20))}})
	if !errors.Is(err, ErrAmbiguous) || !strings.Contains(err.Error(), "Twin World (star Star A), Twin World (star Star B)") {
		t.Errorf("Import = %v, want ErrAmbiguous listing both stars", err)
	}
}

func TestImportMoonTwiceInRequest(t *testing.T) {
	for _, existing := range []bool{false, true} {
		t.Run(fmt.Sprintf("existing=%v", existing), func(t *testing.T) {
			s := memStore(t)
			revs := 0
			if existing {
				mustImport(t, s, ImportRequest{File: "first.csv", Records: []schema.Record{rec("Aster", "Test Giant", "", p("mass", 1e22))}})
				revs = 1
			}
			r1 := rec("Aster", "Test Giant", "", p("mass", 1.5e22))
			r1.Row = 1
			r2 := rec(" aster ", "Test Giant", "", p("mass", 2e22))
			r2.Row = 2
			_, err := s.Import(context.Background(), ImportRequest{File: "twice.csv", Records: []schema.Record{r1, r2}})
			if !errors.Is(err, ErrDuplicate) || !strings.Contains(err.Error(), "twice.csv row 2") {
				t.Errorf("Import = %v, want an ErrDuplicate naming row 2", err)
			}
			// With the cache dropped before every record, a new moon's first
			// row is forgotten ("an earlier row"); otherwise it is named.
			if (existing || hostCacheLimit > 0) && !strings.Contains(fmt.Sprint(err), "first at row 1") {
				t.Errorf("Import = %v, want the first row named", err)
			}
			if n := countRows(t, s, "revision"); n != revs {
				t.Errorf("%d revisions, want %d", n, revs)
			}
		})
	}
}

func TestImportStarlessPlanetFound(t *testing.T) {
	s := memStore(t)
	mustImport(t, s, ImportRequest{File: "a.csv", Records: []schema.Record{rec("Aster", "Test Giant", "Test Star", p("mass", 1e22))}})
	// Naming the planet without its star reaches the one planet of that name.
	res := mustImport(t, s, ImportRequest{File: "b.csv", Records: []schema.Record{rec("Aster", "Test Giant", "", p("mass", 1.2e22), p("planet_mass", 1e27))}})
	if res.NewBodies != 0 || res.Changed != 1 || res.Added != 1 {
		t.Errorf("import = %+v", res)
	}
}

func TestContentHashIgnoresHowTheCatalogWasBuilt(t *testing.T) {
	// One catalog in one import; the other in three imports, in another order,
	// with an intermediate value that was later changed back.
	a := memStore(t)
	mustImport(t, a, firstFile())

	b := memStore(t)
	f := firstFile()
	mustImport(t, b, ImportRequest{File: "x", Records: []schema.Record{f.Records[2]}})
	tmp := f.Records[0]
	tmp.Params = []schema.Param{p("mass", 7e21)}
	mustImport(t, b, ImportRequest{File: "y", Records: []schema.Record{f.Records[1], tmp}})
	mustImport(t, b, ImportRequest{File: "z", Records: []schema.Record{f.Records[0]}})

	ha, hb := mustSnapshot(t, a, 0).ContentHash, mustSnapshot(t, b, 0).ContentHash
	if ha != hb {
		t.Errorf("equal content, different hashes: %s vs %s", ha, hb)
	}
	if len(ha) != 64 {
		t.Errorf("hash %q is not hex SHA-256", ha)
	}
	if h2 := mustSnapshot(t, b, 2).ContentHash; h2 == hb {
		t.Error("different content (revision 2) has the same hash")
	}
}

func TestImportOmitOptions(t *testing.T) {
	recs := []schema.Record{rec("Aster", "Test Giant", "", p("mass", 2e22), p("period", 1e5))} // mass changes, period is new
	tests := []struct {
		name      string
		omitAll   bool
		omitAdded bool
		max       int
		want      []string // keys listed in Changes
	}{
		{"everything", false, false, 0, []string{"mass", "period"}},
		{"changed only", false, true, 0, []string{"mass"}},
		{"nothing", true, false, 0, nil},
		{"at most one", false, false, 1, []string{"mass"}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			s := memStore(t)
			mustImport(t, s, firstFile())
			res := mustImport(t, s, ImportRequest{File: "b.csv", Records: recs, OmitChanges: tt.omitAll, OmitAdded: tt.omitAdded, MaxChanges: tt.max})
			var keys []string
			for _, c := range res.Changes {
				keys = append(keys, c.Key)
			}
			if strings.Join(keys, ",") != strings.Join(tt.want, ",") || res.Added != 1 || res.Changed != 1 || res.Revision.Changes != 2 {
				t.Errorf("Changes keys %v, added %d, changed %d; want %v, 1, 1", keys, res.Added, res.Changed, tt.want)
			}
		})
	}
}

// TestBloomFilter: no member is ever missed, and the false-positive rate for
// 200,000 members stays near the design's (1 − e^(−kn/m))^k ≈ 3·10⁻⁴
// (k = 3 probes, m = 2²³ bits; the formula is common practice).
func TestBloomFilter(t *testing.T) {
	f := new(bloom)
	const n = 200000
	for i := range n {
		f.add(hostHash(schema.KindPlanet, fmt.Sprintf("planet %d", i)))
	}
	for i := range n {
		if !f.has(hostHash(schema.KindPlanet, fmt.Sprintf("planet %d", i))) {
			t.Fatalf("member %d missed", i)
		}
	}
	fp := 0
	const tries = 100000
	for i := range tries {
		if f.has(hostHash(schema.KindStar, fmt.Sprintf("planet %d", i))) {
			fp++
		}
	}
	if rate := float64(fp) / tries; rate > 2e-3 {
		t.Errorf("false-positive rate %g, want about 3e-4", rate)
	}
}

// TestImportExistingHostChangedBesideNewBodies: a star from an earlier
// import gets a new value on a record that also creates a planet and a
// moon, before any queued row is written. (A host read from the catalog
// once took the first queued body's slot for its new state.)
func TestImportExistingHostChangedBesideNewBodies(t *testing.T) {
	s := memStore(t)
	mustImport(t, s, ImportRequest{File: "a.csv", Records: []schema.Record{
		rec("Aster", "Test Giant", "Test Star", p("mass", 1e22), p("star_luminosity", 3.8e26))}})
	res := mustImport(t, s, ImportRequest{File: "b.csv", Records: []schema.Record{
		rec("Beryl", "Second Giant", "Test Star", p("mass", 2e22), p("star_luminosity", 4e26))}})
	if res.NewBodies != 2 || res.Changed != 1 || res.Added != 1 {
		t.Errorf("import = %+v", res)
	}
	c := mustSnapshot(t, s, 0)
	if got := c.Star("Test Star").Params["star_luminosity"].Value; got != 4e26 {
		t.Errorf("star_luminosity = %g, want 4e26", got)
	}
	if got := moonOf(t, c, "Beryl", "Second Giant").Params["mass"].Value; got != 2e22 {
		t.Errorf("Beryl mass = %g", got)
	}
	if rep, err := s.Check(context.Background()); err != nil || !rep.OK() {
		t.Errorf("check: %v %v", rep, err)
	}
}
