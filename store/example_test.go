package store_test

import (
	"context"
	"fmt"

	"tidesift/schema"
	"tidesift/store"
)

// Two imports of an invented moon, then the catalog read as of each revision
// and the difference between them.
func ExampleStore_Import() {
	ctx := context.Background()
	st, err := store.Open(ctx, store.MemoryPath, store.Options{})
	if err != nil {
		panic(err)
	}
	defer st.Close()
	moon := func(mass float64) []schema.Record {
		return []schema.Record{{Name: "Example Moon", Planet: "Example Giant", Source: "invented",
			Params: []schema.Param{
				{Key: "mass", Value: mass, Unc: schema.Uncertainty{Kind: schema.UncSymmetric, Sigma: 1e20}},
				{Key: "planet_mass", Value: 1.9e27},
			}}}
	}
	res, _ := st.Import(ctx, store.ImportRequest{File: "first.csv", Records: moon(1.0e22)})
	fmt.Printf("revision %d: %d added\n", res.Revision.ID, res.Added)
	res, _ = st.Import(ctx, store.ImportRequest{File: "second.csv", Records: moon(1.1e22)})
	fmt.Printf("revision %d: %d changed, %d unchanged\n", res.Revision.ID, res.Changed, res.Unchanged)

	for _, rev := range []int64{1, 2} {
		cat, _ := st.Snapshot(ctx, rev)
		m := cat.Moons[0]
		fmt.Printf("as of revision %d: %s (%s) mass %g ± %g kg\n", rev, m.Name, m.Parent, m.Params["mass"].Value, m.Params["mass"].Unc.Sigma)
	}
	changes, _ := st.Diff(ctx, 1, 2)
	for _, c := range changes {
		fmt.Printf("diff 1→2: %s %s: %g → %g\n", c.Body, c.Key, c.Old.Value, c.New.Value)
	}
	// Output:
	// revision 1: 2 added
	// revision 2: 1 changed, 1 unchanged
	// as of revision 1: Example Moon (Example Giant) mass 1e+22 ± 1e+20 kg
	// as of revision 2: Example Moon (Example Giant) mass 1.1e+22 ± 1e+20 kg
	// diff 1→2: Example Moon mass: 1e+22 → 1.1e+22
}
