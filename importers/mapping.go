package importers

import (
	"errors"
	"fmt"
	"io"
	"math"
	"strings"

	"github.com/pelletier/go-toml/v2"

	"tidesift/importers/units"
	"tidesift/schema"
)

// Map says how a foreign table's columns become canonical keys. It is read
// from TOML by LoadMap; the package documentation shows the syntax, and
// testdata/foreign.map.toml is a complete example.
type Map struct {
	// Format forces a format ("csv", "tsv", "json", "xlsx", "votable").
	Format string `toml:"format"`
	// Table selects one table of a multi-table file: its name or 1-based index.
	Table string `toml:"table"`
	// Sheet selects a workbook sheet by name.
	Sheet string `toml:"sheet"`
	// UnknownColumns is "error" (the default: a column neither mapped nor
	// canonical is an error) or "ignore" (such columns are skipped).
	UnknownColumns string `toml:"unknown_columns"`
	// Ignore lists columns to skip.
	Ignore []string `toml:"ignore"`
	// Constants are text fields that hold for every row; a non-empty cell of
	// the same field wins.
	Constants MapConstants `toml:"constants"`
	// ConstantValues are values that hold for every row, by canonical key
	// (typically the host planet's and star's parameters); a value in the row
	// wins.
	ConstantValues map[string]ConstantValue `toml:"constant_values"`
	// Columns maps a column header, exactly as the file writes it, to a key.
	Columns map[string]ColumnMap `toml:"columns"`
}

// MapConstants are text fields that hold for every row.
type MapConstants struct {
	Planet string `toml:"planet"`
	Star   string `toml:"star"`
	Source string `toml:"source"`
}

// ColumnMap sends one column to a key. Key is a canonical key, or one of
// name, planet, star, alias, source, ignore. Role says what the column holds
// for a numeric key: value (the default), err, err_plus, err_minus, min, max,
// factor or source. Unit is the unit of the column's numbers (VOUnits
// spelling; "1" for a pure number); it overrides a unit the file declares.
type ColumnMap struct {
	Key  string `toml:"key"`
	Role string `toml:"role"`
	Unit string `toml:"unit"`
}

// ConstantValue is a value that holds for every row, with an optional
// uncertainty in one form, in Unit.
type ConstantValue struct {
	Value    *float64 `toml:"value"`
	Unit     string   `toml:"unit"`
	Err      *float64 `toml:"err"`
	ErrPlus  *float64 `toml:"err_plus"`
	ErrMinus *float64 `toml:"err_minus"`
	Min      *float64 `toml:"min"`
	Max      *float64 `toml:"max"`
	Factor   *float64 `toml:"factor"`
	Source   string   `toml:"source"`
}

// LoadMap reads a column map from TOML. Unknown fields are errors (a
// misspelt field would otherwise be silently ignored); messages give the line
// and column.
func LoadMap(r io.Reader) (*Map, error) {
	dec := toml.NewDecoder(r).DisallowUnknownFields()
	var m Map
	if err := dec.Decode(&m); err != nil {
		var se *toml.StrictMissingError
		if errors.As(err, &se) {
			var b strings.Builder
			for _, e := range se.Errors {
				row, col := e.Position()
				fmt.Fprintf(&b, "\n  line %d, column %d: unknown field %q (fields: format, table, sheet, unknown_columns, ignore, [constants], [constant_values.KEY], [columns])\n%s", row, col, strings.Join(e.Key(), "."), e.String())
			}
			return nil, fmt.Errorf("%w:%s", ErrBadMap, b.String())
		}
		var de *toml.DecodeError
		if errors.As(err, &de) {
			row, col := de.Position()
			return nil, fmt.Errorf("%w: line %d, column %d: %v\n%s", ErrBadMap, row, col, de.Error(), de.String())
		}
		return nil, fmt.Errorf("%w: %v", ErrBadMap, err)
	}
	if err := m.check(); err != nil {
		return nil, err
	}
	return &m, nil
}

// check validates what TOML cannot: keys, roles, units and constants.
func (m *Map) check() error {
	var errs []error
	switch m.UnknownColumns {
	case "", "error", "ignore":
	default:
		errs = append(errs, fmt.Errorf("unknown_columns = %q; expected \"error\" or \"ignore\"", m.UnknownColumns))
	}
	if m.Format != "" {
		ok := false
		for _, f := range Formats {
			ok = ok || f == m.Format
		}
		if !ok {
			errs = append(errs, fmt.Errorf("format = %q; expected one of %s", m.Format, strings.Join(Formats, ", ")))
		}
	}
	for col, e := range m.Columns {
		k := strings.ToLower(strings.TrimSpace(e.Key))
		if _, ok := fieldByName[k]; ok {
			if e.Role != "" {
				errs = append(errs, fmt.Errorf("[columns] %q: key %q is a text field and takes no role", col, e.Key))
			}
			continue
		}
		info, ok := schema.LookupKey(k)
		if !ok {
			errs = append(errs, fmt.Errorf("[columns] %q: key %q is not a canonical key (%s; or name, planet, star, alias, source, ignore)", col, e.Key, keyList()))
			continue
		}
		if _, ok := parseRole(strings.ToLower(e.Role)); !ok {
			errs = append(errs, fmt.Errorf("[columns] %q: role %q; expected one of %s", col, e.Role, strings.Join(roleNames[:], ", ")))
		}
		if e.Unit != "" {
			u, err := units.Parse(e.Unit)
			if err == nil {
				err = units.Expect(info.Key, e.Unit, u, keyDims[info.Key])
			}
			if err != nil && !(strings.EqualFold(e.Role, "factor") || strings.EqualFold(e.Role, "source")) {
				errs = append(errs, fmt.Errorf("[columns] %q: %w", col, err))
			}
		}
	}
	for k, v := range m.ConstantValues {
		if _, err := v.param(k); err != nil {
			errs = append(errs, fmt.Errorf("[constant_values.%s]: %w", k, err))
		}
	}
	if len(errs) == 0 {
		return nil
	}
	return fmt.Errorf("%w: %w", ErrBadMap, errors.Join(errs...))
}

// lookup finds the entry for a column, by its full header, then by the name
// before its "[unit]", then ignoring case.
func (m *Map) lookup(header, name string) (ColumnMap, string, bool) {
	if m == nil || len(m.Columns) == 0 {
		return ColumnMap{}, "", false
	}
	for _, k := range []string{header, name} {
		if e, ok := m.Columns[k]; ok {
			return e, k, true
		}
	}
	for k, e := range m.Columns {
		if strings.EqualFold(strings.TrimSpace(k), header) || strings.EqualFold(strings.TrimSpace(k), name) {
			return e, k, true
		}
	}
	return ColumnMap{}, "", false
}

func (m *Map) ignored(header, name string) bool {
	if m == nil {
		return false
	}
	for _, s := range m.Ignore {
		if strings.EqualFold(strings.TrimSpace(s), header) || strings.EqualFold(strings.TrimSpace(s), name) {
			return true
		}
	}
	return false
}

// param converts a constant to a validated SI parameter of key k.
func (v ConstantValue) param(k string) (schema.Param, error) {
	info, ok := schema.LookupKey(k)
	if !ok {
		return schema.Param{}, fmt.Errorf("%w %q (%s)", schema.ErrUnknownKey, k, keyList())
	}
	if v.Value == nil {
		return schema.Param{}, fmt.Errorf("%s: value is missing", k)
	}
	want := keyDims[k]
	u := units.Unit{Factor: 1}
	if v.Unit != "" {
		var err error
		if u, err = units.Parse(v.Unit); err != nil {
			return schema.Param{}, err
		}
		if err := units.Expect(k, v.Unit, u, want); err != nil {
			return schema.Param{}, err
		}
	} else if want != units.Dimensionless {
		return schema.Param{}, fmt.Errorf("%w: %s needs unit = ... (%s)", ErrMissingUnit, k, want.Wants())
	}
	p := schema.Param{Key: k, Value: *v.Value * u.Factor, Source: strings.TrimSpace(v.Source), Status: schema.StatusMeasured}
	forms := 0
	if v.Err != nil {
		forms++
		p.Unc = schema.Uncertainty{Kind: schema.UncSymmetric, Sigma: *v.Err * u.Factor}
	}
	if v.ErrPlus != nil || v.ErrMinus != nil {
		forms++
		if v.ErrPlus == nil || v.ErrMinus == nil {
			return schema.Param{}, fmt.Errorf("%w: give both err_plus and err_minus", ErrUncertaintyForm)
		}
		p.Unc = schema.Uncertainty{Kind: schema.UncAsymmetric, Plus: *v.ErrPlus * u.Factor, Minus: *v.ErrMinus * u.Factor}
	}
	if v.Min != nil || v.Max != nil {
		forms++
		if v.Min == nil || v.Max == nil {
			return schema.Param{}, fmt.Errorf("%w: give both min and max", ErrUncertaintyForm)
		}
		p.Unc = schema.Uncertainty{Kind: schema.UncRange, Min: *v.Min * u.Factor, Max: *v.Max * u.Factor}
	}
	if v.Factor != nil {
		forms++
		p.Unc = schema.Uncertainty{Kind: schema.UncFactor, Factor: *v.Factor}
	}
	if forms > 1 {
		return schema.Param{}, fmt.Errorf("%w: give one uncertainty form (err, err_plus/err_minus, min/max or factor)", ErrUncertaintyForm)
	}
	if math.IsNaN(p.Value) {
		return schema.Param{}, fmt.Errorf("%w: %s", schema.ErrNotFinite, k)
	}
	if err := info.Check(p.Value); err != nil {
		return schema.Param{}, err
	}
	if err := p.Unc.Validate(); err != nil {
		return schema.Param{}, err
	}
	return p, nil
}
