package store

import (
	"context"
	"errors"
	"fmt"
	"reflect"
	"strings"
	"testing"

	"tidesift/schema"
)

// Every body and value in these tests is invented.

// sliceSource yields recs one by one through a reused Record, as
// importers.ReadStream does, and fails with failAt after that many records
// (never when failAt < 0).
func sliceSource(recs []schema.Record, failAt int, failErr error) RecordSource {
	return func(yield func(*schema.Record) error) error {
		var r schema.Record
		for i := range recs {
			if i == failAt {
				return failErr
			}
			r = recs[i]
			if err := yield(&r); err != nil {
				return err
			}
			r = schema.Record{Name: "reused record"} // a source may overwrite it
		}
		if failAt == len(recs) {
			return failErr
		}
		return nil
	}
}

func mustStream(tb testing.TB, s *Store, req ImportRequest, src RecordSource) *ImportResult {
	tb.Helper()
	res, err := s.ImportStream(context.Background(), req, src)
	if err != nil {
		tb.Fatalf("ImportStream(%s): %v", req.File, err)
	}
	return res
}

func TestImportStreamMatchesImport(t *testing.T) {
	// More records than a few batches, so that batches are reused.
	first := synthRecords(3*streamBatch+17, 40, 0)
	second := synthRecords(3*streamBatch+17, 40, 1) // every value changes
	a, b := memStore(t), memStore(t)
	for i, recs := range [][]schema.Record{first, second} {
		req := ImportRequest{File: "synthetic.csv", SHA256: sum(string(rune('a' + i)))}
		ra := mustImport(t, a, ImportRequest{File: req.File, SHA256: req.SHA256, Records: recs})
		rb := mustStream(t, b, req, sliceSource(recs, -1, nil))
		if ra.Added != rb.Added || ra.Changed != rb.Changed || ra.Unchanged != rb.Unchanged ||
			ra.NewBodies != rb.NewBodies || len(ra.Changes) != len(rb.Changes) {
			t.Errorf("import %d: Import %+v, ImportStream %+v", i+1, counts(ra), counts(rb))
		}
		if ra.Revision == nil || rb.Revision == nil || ra.Revision.Changes != rb.Revision.Changes {
			t.Fatalf("import %d: revisions %+v and %+v", i+1, ra.Revision, rb.Revision)
		}
	}
	if ha, hb := mustSnapshot(t, a, 0).ContentHash, mustSnapshot(t, b, 0).ContentHash; ha != hb {
		t.Errorf("streamed catalog differs from the imported one: %s vs %s", ha, hb)
	}
	if ha, hb := mustSnapshot(t, a, 1).ContentHash, mustSnapshot(t, b, 1).ContentHash; ha != hb {
		t.Errorf("revision 1 differs: %s vs %s", ha, hb)
	}
}

func counts(r *ImportResult) [5]int {
	return [5]int{r.Added, r.Changed, r.Unchanged, r.NewBodies, len(r.Changes)}
}

func TestImportStreamSourceFailureWritesNothing(t *testing.T) {
	recs := synthRecords(2*streamBatch+5, 10, 0)
	bad := errors.New("row 9999: invented late problem")
	for _, at := range []int{0, streamBatch + 3, len(recs)} { // before, amid and after the records
		s := memStore(t)
		mustImport(t, s, firstFile())
		before := countRows(t, s, "state")
		_, err := s.ImportStream(context.Background(), ImportRequest{File: "late.csv", SHA256: sum("late")}, sliceSource(recs, at, bad))
		var se *SourceError
		if !errors.Is(err, bad) || !errors.As(err, &se) {
			t.Errorf("fail at %d: error %v, want the source's error as a *SourceError", at, err)
		}
		if n := countRows(t, s, "state"); n != before {
			t.Errorf("fail at %d: %d value rows after a failed import, want %d", at, n, before)
		}
		if n := countRows(t, s, "revision"); n != 1 {
			t.Errorf("fail at %d: %d revisions, want 1", at, n)
		}
	}
}

func TestImportStreamRecordErrorStopsSource(t *testing.T) {
	s := memStore(t)
	recs := synthRecords(20*streamBatch, 10, 0)
	recs[streamBatch+1].Params = append(recs[streamBatch+1].Params, p("colour", 1))
	yielded := 0
	src := func(yield func(*schema.Record) error) error {
		for i := range recs {
			yielded++
			if err := yield(&recs[i]); err != nil {
				return err
			}
		}
		return nil
	}
	_, err := s.ImportStream(context.Background(), ImportRequest{File: "synthetic.csv"}, src)
	if !errors.Is(err, schema.ErrUnknownKey) || !strings.Contains(err.Error(), "row 514") {
		t.Fatalf("error %v, want the unknown key at row 514", err)
	}
	// A few batches may be in flight, not the whole input.
	if yielded >= len(recs) {
		t.Errorf("the source produced all %d records after the writer failed", yielded)
	}
	if n := countRows(t, s, "state"); n != 0 {
		t.Errorf("%d value rows after a failed import, want 0", n)
	}
}

func TestImportStreamDuplicateFile(t *testing.T) {
	s := memStore(t)
	recs := synthRecords(10, 2, 0)
	mustStream(t, s, ImportRequest{File: "a.csv", SHA256: sum("a")}, sliceSource(recs, -1, nil))
	called := false
	res := mustStream(t, s, ImportRequest{File: "copy.csv", SHA256: sum("a")}, func(func(*schema.Record) error) error {
		called = true
		return nil
	})
	if res.Duplicate == nil || res.Duplicate.ID != 1 || res.Revision != nil {
		t.Errorf("second import of the same file: %+v, want Duplicate revision 1", res)
	}
	if called {
		t.Error("the source was read for a duplicate file")
	}
}

func TestImportStreamDryRunAndRejectsRecords(t *testing.T) {
	s := memStore(t)
	res := mustStream(t, s, ImportRequest{File: "a.csv", DryRun: true}, sliceSource(synthRecords(20, 2, 0), -1, nil))
	if res.Revision == nil || res.Added == 0 {
		t.Errorf("dry run result %+v, want a revision that would be made", res)
	}
	if n := countRows(t, s, "state"); n != 0 {
		t.Errorf("dry run wrote %d values", n)
	}
	if _, err := s.ImportStream(context.Background(), ImportRequest{File: "b.csv", Records: synthRecords(1, 1, 0)},
		sliceSource(nil, -1, nil)); err == nil {
		t.Error("ImportStream accepted req.Records")
	}
}

// withHostCache runs f with the star and planet cache bounded to limit.
func withHostCache(t *testing.T, limit int, f func(t *testing.T)) {
	t.Helper()
	old := hostCacheLimit
	hostCacheLimit = limit
	defer func() { hostCacheLimit = old }()
	f(t)
}

func TestImportWithDroppedHostCache(t *testing.T) {
	// The import tests again, with the cache of stars and planets dropped
	// before every record: values, counts, changes put back and aliases
	// must come out the same when bodies are read back from the transaction,
	// and conflicts between records must still be found.
	for name, f := range map[string]func(*testing.T){
		"HappyPath": TestImportHappyPath, "DuplicateAndUnchanged": TestImportDuplicateAndUnchanged,
		"ChangeMakesHistory": TestImportChangeMakesHistory, "AllOrNothing": TestImportAllOrNothing,
		"PlanetValueRepeated": TestImportPlanetValueRepeatedInRequest, "PlanetValueConflict": TestImportPlanetValueConflict,
		"Aliases":   TestImportAliases,
		"Ambiguous": TestImportAmbiguous, "MoonTwice": TestImportMoonTwiceInRequest,
		"StarlessPlanet": TestImportStarlessPlanetFound, "OmitOptions": TestImportOmitOptions,
	} {
		t.Run(name, func(t *testing.T) { withHostCache(t, 0, f) })
	}
}

func TestImportDroppedHostCacheMatchesCached(t *testing.T) {
	// Planets recur far apart (row i has planet i mod 7), and the second
	// import changes every value: the same outcome with and without a cache.
	run := func(limit int) ([][5]int, string) {
		var got [][5]int
		var hash string
		withHostCache(t, limit, func(t *testing.T) {
			s := memStore(t)
			for i, seed := range []float64{0, 1, 1, 0} {
				recs := synthRecords(200, 7, seed)
				if i == 3 { // three planets' values changed, on every row that names them
					for j := range recs {
						if j%7 >= 3 {
							continue
						}
						for k := range recs[j].Params {
							if recs[j].Params[k].Key == "planet_mass" {
								recs[j].Params[k].Value *= 2
							}
						}
					}
				}
				res := mustImport(t, s, ImportRequest{File: "synthetic.csv", SHA256: sum(fmt.Sprint(i)), Records: recs})
				got = append(got, counts(res))
			}
			hash = mustSnapshot(t, s, 0).ContentHash
			for rev := int64(1); rev <= 3; rev++ {
				hash += mustSnapshot(t, s, rev).ContentHash
			}
		})
		return got, hash
	}
	a, ha := run(1 << 20)
	b, hb := run(0)
	if a[3][1] == 0 || a[3][2] == 0 {
		t.Errorf("the fourth import changed %d and kept %d values; the test needs both", a[3][1], a[3][2])
	}
	if fmt.Sprint(a) != fmt.Sprint(b) || ha != hb {
		t.Errorf("cached: %v %s\ndropped: %v %s", a, ha[:16], b, hb[:16])
	}
}

// TestFreshStatesMatchImporter: the states prepared on the reading
// goroutine for new moons (when added values need no listing) are the bytes
// the importer itself would write.
func TestFreshStatesMatchImporter(t *testing.T) {
	recs := synthRecords(300, 7, 0)
	recs[5].Params = append(recs[5].Params[:0:0], recs[5].Params...)
	recs[5].Params[0].Source = "a value's own invented source"
	dump := func(omitAdded bool) []string {
		s := memStore(t)
		mustImport(t, s, ImportRequest{File: "a.csv", Records: recs, OmitAdded: omitAdded})
		rows, err := s.db.Query("SELECT id, body_id, set_rev, ifnull(prev_id, 0), hex(data) FROM state ORDER BY id")
		if err != nil {
			t.Fatal(err)
		}
		defer rows.Close()
		var out []string
		for rows.Next() {
			var id, body, set, prev int64
			var data string
			if err := rows.Scan(&id, &body, &set, &prev, &data); err != nil {
				t.Fatal(err)
			}
			out = append(out, fmt.Sprint(id, body, set, prev, data))
		}
		return out
	}
	plain, fresh := dump(false), dump(true)
	if len(plain) != 300+7 { // the moons and the planets; the star has no values
		t.Fatalf("%d states, want %d", len(plain), 300+7)
	}
	if !reflect.DeepEqual(plain, fresh) {
		for i := range min(len(plain), len(fresh)) {
			if plain[i] != fresh[i] {
				t.Fatalf("state %d differs:\n importer %s\n prepared %s", i, plain[i], fresh[i])
			}
		}
		t.Fatalf("%d states against %d", len(plain), len(fresh))
	}
}
