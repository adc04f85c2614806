package store

import (
	"cmp"
	"context"
	"fmt"
	"slices"

	"tidesift/schema"
)

// normUnc keeps only the fields of the uncertainty's kind, so that equal
// uncertainties compare equal and encode alike.
func normUnc(u schema.Uncertainty) schema.Uncertainty {
	switch u.Kind {
	case schema.UncSymmetric:
		return schema.Uncertainty{Kind: u.Kind, Sigma: u.Sigma}
	case schema.UncAsymmetric:
		return schema.Uncertainty{Kind: u.Kind, Plus: u.Plus, Minus: u.Minus}
	case schema.UncRange:
		return schema.Uncertainty{Kind: u.Kind, Min: u.Min, Max: u.Max}
	case schema.UncFactor:
		return schema.Uncertainty{Kind: u.Kind, Factor: u.Factor}
	}
	return schema.Uncertainty{Kind: u.Kind}
}

// sameValue reports whether two parameters say the same thing: value,
// uncertainty, source and status. The revision does not count.
func sameValue(a, b schema.Param) bool {
	return a.Value == b.Value && normUnc(a.Unc) == normUnc(b.Unc) && a.Source == b.Source && a.Status == b.Status
}

// scanner is a *sql.Row or *sql.Rows.
type scanner interface{ Scan(dest ...any) error }

// interner shares one string per distinct source among the values of a
// scan: a snapshot of a million values usually holds few sources.
type interner map[string]string

func (in interner) get(b []byte) string {
	if s, ok := in[string(b)]; ok { // no allocation for the lookup
		return s
	}
	s := string(b)
	in[s] = s
	return s
}

// keyCodes is a catalog's key_name table: the codes that encoded states use
// for keys.
type keyCodes struct {
	byCode map[uint64]string
	byKey  map[string]uint64
	next   uint64 // the next free code
}

func loadKeyCodes(ctx context.Context, q queryer) (*keyCodes, error) {
	kc := &keyCodes{byCode: map[uint64]string{}, byKey: map[string]uint64{}, next: 1}
	rows, err := q.QueryContext(ctx, "SELECT code, key FROM key_name")
	if err != nil {
		return nil, fmt.Errorf("read key codes: %w", err)
	}
	defer rows.Close()
	for rows.Next() {
		var c uint64
		var k string
		if err := rows.Scan(&c, &k); err != nil {
			return nil, err
		}
		kc.byCode[c], kc.byKey[k] = k, c
		kc.next = max(kc.next, c+1)
	}
	return kc, rows.Err()
}

// entry is one value of a body's state, with its key's code.
type entry struct {
	code uint64
	p    schema.Param
}

// decode appends the values of an encoded state to dst, naming their keys.
func (kc *keyCodes) decode(dst []entry, data []byte, in interner) ([]entry, error) {
	err := schema.DecodeState(data, in.get, func(code uint64, p schema.Param) error {
		k, ok := kc.byCode[code]
		if !ok {
			return fmt.Errorf("%w: key code %d is not in key_name", schema.ErrBadState, code)
		}
		p.Key = k
		dst = append(dst, entry{code, p})
		return nil
	})
	return dst, err
}

// encodeEntries appends the encoding of a state's entries, in code order,
// using scratch for the sorted values. es is not reordered.
func encodeEntries(dst []byte, es []entry, scratch []schema.StateValue) ([]byte, []schema.StateValue) {
	scratch = scratch[:0]
	// Codes are small (the registry's keys): place each entry at its code
	// instead of sorting, in the common case.
	var at [64]uint8 // index+1 of the entry with that code; 0: none
	small := len(es) < 256
	for i, e := range es {
		if !small || e.code >= uint64(len(at)) {
			small = false
			break
		}
		at[e.code] = uint8(i + 1)
	}
	if small {
		for _, i := range at {
			if i != 0 {
				e := es[i-1]
				scratch = append(scratch, schema.StateValue{Code: e.code, Param: e.p})
			}
		}
	} else {
		for _, e := range es {
			scratch = append(scratch, schema.StateValue{Code: e.code, Param: e.p})
		}
		slices.SortFunc(scratch, func(a, b schema.StateValue) int { return cmp.Compare(a.Code, b.Code) })
	}
	return schema.AppendState(dst, scratch), scratch
}

// find returns the index of the entry of key code c, or -1.
func find(es []entry, c uint64) int {
	for i := range es {
		if es[i].code == c {
			return i
		}
	}
	return -1
}
