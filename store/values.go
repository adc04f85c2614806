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

// scanParam reads valueColumns, preceded by the extra destinations.
func scanParam(sc scanner, extra ...any) (schema.Param, error) {
	var (
		p                                  schema.Param
		kind, status                       string
		sigma, plus, minus, lo, hi, factor sql.NullFloat64
	)
	dest := append(extra, &p.Key, &p.Value, &kind, &sigma, &plus, &minus, &lo, &hi, &factor, &p.Source, &status, &p.Revision)
	if err := sc.Scan(dest...); err != nil {
		return p, err
	}
	k, err := schema.ParseUncKind(kind)
	if err != nil {
		return p, fmt.Errorf("stored value %s: %w", p.Key, err)
	}
	p.Unc = schema.Uncertainty{Kind: k, Sigma: sigma.Float64, Plus: plus.Float64, Minus: minus.Float64,
		Min: lo.Float64, Max: hi.Float64, Factor: factor.Float64}
	p.Status = schema.Status(status)
	return p, nil
}
