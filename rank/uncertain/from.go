package uncertain

import (
	"fmt"
	"strings"

	"tidesift/schema"
)

// FromParam maps a catalog parameter's uncertainty to a distribution in its
// key's physical domain (see the package documentation for the mapping). A
// parameter whose uncertainty cannot form a distribution (which the store's
// validation prevents) becomes Fixed at its value; use NewFromParam to see why.
func FromParam(p schema.Param, info schema.KeyInfo) Dist {
	d, err := NewFromParam(p, info)
	if err != nil {
		return Fixed{V: domainOf(info).clamp(p.Value)}
	}
	return d
}

// NewFromParam is FromParam reporting, instead of hiding, an uncertainty that
// cannot form a distribution.
func NewFromParam(p schema.Param, info schema.KeyInfo) (Dist, error) {
	u := p.Unc
	if err := u.Validate(); err != nil {
		return nil, fmt.Errorf("%s: %w", p.Key, err)
	}
	if u.IsZeroWidth() {
		return Fixed{V: domainOf(info).clamp(p.Value)}, nil
	}
	var d Dist
	var err error
	switch u.Kind {
	case schema.UncSymmetric:
		d, err = NewNormal(p.Value, u.Sigma, info)
	case schema.UncAsymmetric:
		d, err = NewSplitNormal(p.Value, u.Minus, u.Plus, info)
	case schema.UncRange:
		d, err = NewUniform(u.Min, u.Max, info)
	case schema.UncFactor:
		d, err = NewLogNormal(p.Value, u.Factor, info)
	default:
		d = Fixed{V: domainOf(info).clamp(p.Value)}
	}
	if err != nil {
		return nil, fmt.Errorf("%s: %w", p.Key, err)
	}
	return d, nil
}

// Distribution names accepted by Spec.Dist.
const (
	DistFixed       = "fixed"
	DistNormal      = "normal"
	DistSplitNormal = "split-normal"
	DistUniform     = "uniform"
	DistLogNormal   = "log-normal"
	DistLogUniform  = "log-uniform"
)

// DistNames lists the names Spec.Dist accepts, in documentation order.
var DistNames = []string{DistFixed, DistNormal, DistSplitNormal, DistUniform, DistLogNormal, DistLogUniform}

// Spec is a distribution written out by name and parameters, as a profile's
// prior gives it. Which fields are used depends on Dist:
//
//	fixed         Value
//	normal        Value (mean), Sigma
//	split-normal  Value (mode), Plus, Minus
//	uniform       Min, Max
//	log-normal    Value (median), Factor
//	log-uniform   Min, Max
type Spec struct {
	Dist                                        string
	Value, Sigma, Plus, Minus, Min, Max, Factor float64
}

// Fields returns the parameter names the distribution name uses, in the order
// of the table above, or nil for an unknown name.
func Fields(dist string) []string {
	switch dist {
	case DistFixed:
		return []string{"value"}
	case DistNormal:
		return []string{"value", "sigma"}
	case DistSplitNormal:
		return []string{"value", "plus", "minus"}
	case DistUniform, DistLogUniform:
		return []string{"min", "max"}
	case DistLogNormal:
		return []string{"value", "factor"}
	}
	return nil
}

// Build returns the distribution s describes, in the key's domain.
func (s Spec) Build(info schema.KeyInfo) (Dist, error) {
	switch s.Dist {
	case DistFixed:
		dom := domainOf(info)
		if !dom.contains(s.Value) {
			return nil, fmt.Errorf("fixed value %g lies outside the domain %s", s.Value, dom)
		}
		return Fixed{V: s.Value}, nil
	case DistNormal:
		return NewNormal(s.Value, s.Sigma, info)
	case DistSplitNormal:
		return NewSplitNormal(s.Value, s.Minus, s.Plus, info)
	case DistUniform:
		return NewUniform(s.Min, s.Max, info)
	case DistLogNormal:
		return NewLogNormal(s.Value, s.Factor, info)
	case DistLogUniform:
		return NewLogUniform(s.Min, s.Max, info)
	}
	return nil, fmt.Errorf("unknown distribution %q (valid: %s)", s.Dist, strings.Join(DistNames, ", "))
}

// Uncertainty expresses d in the catalog's uncertainty vocabulary, for reports
// of assumed inputs: the central value and an Uncertainty of the nearest form
// (a log-uniform prior reports its range).
func Uncertainty(d Dist) (value float64, u schema.Uncertainty) {
	switch t := d.(type) {
	case Fixed:
		return t.V, schema.Uncertainty{}
	case *TruncNormal:
		return t.Mu, schema.Uncertainty{Kind: schema.UncSymmetric, Sigma: t.Sigma}
	case *SplitNormal:
		return t.Mode, schema.Uncertainty{Kind: schema.UncAsymmetric, Plus: t.Upper, Minus: t.Lower}
	case Uniform:
		return Median(t), schema.Uncertainty{Kind: schema.UncRange, Min: t.Lo, Max: t.Hi}
	case LogUniform:
		return Median(t), schema.Uncertainty{Kind: schema.UncRange, Min: t.Lo, Max: t.Hi}
	case *LogNormal:
		return t.Median, schema.Uncertainty{Kind: schema.UncFactor, Factor: t.Factor}
	}
	return Median(d), schema.Uncertainty{}
}
