package store

import (
	"database/sql"
	"fmt"

	"tidesift/schema"
)

// valueColumns are the columns scanParam reads, in order.
const valueColumns = "key, value, unc_kind, sigma, plus, minus, min, max, factor, source, status, set_rev"

// normUnc keeps only the fields of the uncertainty's kind, so that equal
// uncertainties compare equal and stored rows satisfy the table's CHECKs.
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

// uncArgs returns the sigma, plus, minus, min, max and factor columns: the
// kind's fields, NULL for the others.
func uncArgs(u schema.Uncertainty) [6]any {
	var a [6]any
	switch u.Kind {
	case schema.UncSymmetric:
		a[0] = u.Sigma
	case schema.UncAsymmetric:
		a[1], a[2] = u.Plus, u.Minus
	case schema.UncRange:
		a[3], a[4] = u.Min, u.Max
	case schema.UncFactor:
		a[5] = u.Factor
	}
	return a
}

// sameValue reports whether two parameters say the same thing: value,
// uncertainty, source and status. The revision does not count.
func sameValue(a, b schema.Param) bool {
	return a.Value == b.Value && normUnc(a.Unc) == normUnc(b.Unc) && a.Source == b.Source && a.Status == b.Status
}

// scanner is a *sql.Row or *sql.Rows.
type scanner interface{ Scan(dest ...any) error }

// interner shares one string per distinct key, source, status and
// uncertainty kind among the rows of a scan: a snapshot of a million values
// holds a few dozen distinct keys and usually few sources.
type interner map[string]string

func (in interner) get(b []byte) string {
	if s, ok := in[string(b)]; ok { // no allocation for the lookup
		return s
	}
	s := string(b)
	in[s] = s
	return s
}

// scanParam reads valueColumns, preceded by the extra destinations.
func scanParam(sc scanner, extra ...any) (schema.Param, error) {
	return newParamScanner(extra...).scan(sc)
}

// paramScanner reads valueColumns row after row, reusing its buffers and
// sharing strings through an interner.
type paramScanner struct {
	in                                 interner
	key, kind, source, status          sql.RawBytes
	value                              float64
	rev                                int64
	sigma, plus, minus, lo, hi, factor sql.NullFloat64
	dest                               []any
}

// newParamScanner scans into extra (the columns before valueColumns) and then
// into its own fields.
func newParamScanner(extra ...any) *paramScanner {
	ps := &paramScanner{in: interner{}}
	ps.dest = append(extra, &ps.key, &ps.value, &ps.kind, &ps.sigma, &ps.plus, &ps.minus, &ps.lo, &ps.hi, &ps.factor,
		&ps.source, &ps.status, &ps.rev)
	return ps
}

func (ps *paramScanner) scan(sc scanner) (schema.Param, error) {
	if err := sc.Scan(ps.dest...); err != nil {
		return schema.Param{}, err
	}
	p := schema.Param{Key: ps.in.get(ps.key), Value: ps.value, Revision: ps.rev,
		Source: ps.in.get(ps.source), Status: schema.Status(ps.in.get(ps.status))}
	k, err := schema.ParseUncKind(ps.in.get(ps.kind))
	if err != nil {
		return p, fmt.Errorf("stored value %s: %w", p.Key, err)
	}
	p.Unc = schema.Uncertainty{Kind: k, Sigma: ps.sigma.Float64, Plus: ps.plus.Float64, Minus: ps.minus.Float64,
		Min: ps.lo.Float64, Max: ps.hi.Float64, Factor: ps.factor.Float64}
	return p, nil
}
