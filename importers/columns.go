package importers

import (
	"fmt"
	"math"
	"sort"
	"strings"

	"tidesift/importers/table"
	"tidesift/importers/units"
	"tidesift/schema"
)

// role is what a numeric column holds for its key.
type role uint8

const (
	roleValue role = iota
	roleErr
	roleErrPlus
	roleErrMinus
	roleMin
	roleMax
	roleFactor
	roleSource
	nRoles
)

// roleSuffix is the canonical header suffix of each role, longest first where
// one is a suffix of another.
var roleSuffix = [nRoles]string{"", "_err", "_err_plus", "_err_minus", "_min", "_max", "_factor", "_source"}

var roleNames = [nRoles]string{"value", "err", "err_plus", "err_minus", "min", "max", "factor", "source"}

func parseRole(s string) (role, bool) {
	if s == "" {
		return roleValue, true
	}
	for i, n := range roleNames {
		if n == s {
			return role(i), true
		}
	}
	return 0, false
}

// text columns.
type field uint8

const (
	fieldNone field = iota
	fieldName
	fieldPlanet
	fieldStar
	fieldAlias
	fieldSource
	fieldIgnore
)

var fieldByName = map[string]field{
	"name": fieldName, "planet": fieldPlanet, "star": fieldStar,
	"alias": fieldAlias, "aliases": fieldAlias, "source": fieldSource, "ignore": fieldIgnore,
}

// keyDims is the SI dimension of each canonical key, from its unit spelling.
var keyDims = func() map[string]units.Dim {
	m := make(map[string]units.Dim, len(schema.Keys))
	for _, k := range schema.Keys {
		u, err := units.Parse(k.Unit)
		if err != nil || math.Abs(u.Factor-1) > 1e-12 {
			panic(fmt.Sprintf("schema key %s: unit %q is not an SI unit units can parse: %v", k.Key, k.Unit, err))
		}
		m[k.Key] = u.Dim
	}
	return m
}()

// keyPlan is how one key is read from a row.
type keyPlan struct {
	info   schema.KeyInfo
	col    [nRoles]int     // column index per role, -1 if absent
	factor [nRoles]float64 // to SI, per numeric role
	unit   string          // unit text of the value column, for messages
	konst  *schema.Param   // map constant, used where the row gives no value
	index  int             // position of the key in schema.Keys
	comps  []role          // the numeric companions present (err … factor)
}

func (k *keyPlan) has(r role) bool { return k.col[r] >= 0 }

// plan is how every row of one table becomes a record.
type plan struct {
	file       string
	headers    []string // column headers as written
	colKey     []string // canonical key (or text field) each column fills, for messages
	text       [fieldIgnore]int
	keys       []keyPlan // sorted by key
	constName  [fieldIgnore]string
	headerRow  int
	planetKeys bool // some key belongs to a planet
}

// splitHeader splits "mass [kg]" into "mass", "kg", true. A header without
// brackets has no unit (ok=false); "mass []" declares a dimensionless unit.
func splitHeader(h string) (name, unit string, hasUnit bool, err error) {
	i := strings.IndexByte(h, '[')
	if i < 0 {
		if strings.IndexByte(h, ']') >= 0 {
			return "", "", false, fmt.Errorf("unbalanced ']' in the header; expected \"key [unit]\"")
		}
		return strings.TrimSpace(h), "", false, nil
	}
	j := strings.LastIndexByte(h, ']')
	if j < i || strings.TrimSpace(h[j+1:]) != "" {
		return "", "", false, fmt.Errorf("a header's unit goes in brackets at its end, as \"key [unit]\"")
	}
	return strings.TrimSpace(h[:i]), strings.TrimSpace(h[i+1 : j]), true, nil
}

// canonical reads a header name of the canonical layout.
func canonical(name string) (key string, r role, f field, ok bool) {
	l := strings.ToLower(name)
	if f, ok := fieldByName[l]; ok && f != fieldIgnore {
		return "", 0, f, true
	}
	if _, ok := schema.LookupKey(l); ok {
		return l, roleValue, fieldNone, true
	}
	// Longest suffix first: _err_plus before _err.
	for _, r := range []role{roleErrPlus, roleErrMinus, roleErr, roleMin, roleMax, roleFactor, roleSource} {
		if k, found := strings.CutSuffix(l, roleSuffix[r]); found {
			if _, ok := schema.LookupKey(k); ok {
				return k, r, fieldNone, true
			}
		}
	}
	return "", 0, fieldNone, false
}

// closeColumns suggests canonical headers near a foreign one.
func closeColumns(name string) []string {
	l := strings.ToLower(name)
	var out []string
	for _, k := range schema.Keys {
		if levenshtein(l, k.Key) <= 2 || (len(l) >= 3 && strings.Contains(k.Key, l)) {
			out = append(out, k.Key)
		}
	}
	for f := range fieldByName {
		if f != "ignore" && levenshtein(l, f) <= 1 {
			out = append(out, f)
		}
	}
	sort.Strings(out)
	if len(out) > 4 {
		out = out[:4]
	}
	return out
}

type colTarget struct {
	key     string
	role    role
	field   field
	unit    string
	hasUnit bool
	mapped  bool
}

// buildPlan resolves every column to a key and role, parses units and checks
// them against the keys, and applies the map's constants. Every problem is
// added to c; the plan is usable only when c gained nothing.
func buildPlan(file string, cols []table.Column, m *Map, headerRow int, c *collector) *plan {
	p := &plan{file: file, headerRow: headerRow}
	for i := range p.text {
		p.text[i] = -1
	}
	p.headers = make([]string, len(cols))
	p.colKey = make([]string, len(cols))
	byKey := map[string]*keyPlan{}
	getKey := func(k string) *keyPlan {
		kp := byKey[k]
		if kp == nil {
			info, _ := schema.LookupKey(k)
			kp = &keyPlan{info: info, index: keyIndex(k)}
			for r := range kp.col {
				kp.col[r] = -1
			}
			byKey[k] = kp
		}
		return kp
	}
	herr := func(col string, key string, err error, hint string) {
		c.add(&ParseError{File: file, Row: headerRow, Column: col, Key: key, Err: err, Hint: hint})
	}
	targets := make([]colTarget, len(cols))
	used := map[string]bool{} // map entries that matched a column
	for i, col := range cols {
		h := col.Name
		p.headers[i] = h
		name, unit, hasUnit, err := splitHeader(h)
		if err != nil {
			herr(h, "", fmt.Errorf("%w: %v", ErrUnknownColumn, err), "")
			targets[i].field = fieldIgnore
			continue
		}
		if !hasUnit && col.Unit != "" {
			unit, hasUnit = col.Unit, true
		}
		t := colTarget{unit: unit, hasUnit: hasUnit}
		if e, entryName, ok := m.lookup(h, name); ok {
			used[entryName] = true
			t.mapped = true
			if e.Unit != "" {
				t.unit, t.hasUnit = e.Unit, true
			}
			k := strings.ToLower(strings.TrimSpace(e.Key))
			if f, ok := fieldByName[k]; ok {
				t.field = f
			} else if _, ok := schema.LookupKey(k); ok {
				r, ok := parseRole(strings.ToLower(strings.TrimSpace(e.Role)))
				if !ok {
					herr(h, k, fmt.Errorf("%w: the map gives role %q; expected one of %s", ErrBadMap, e.Role, strings.Join(roleNames[:], ", ")), "")
					t.field = fieldIgnore
				}
				t.key, t.role = k, r
			} else {
				herr(h, k, fmt.Errorf("%w: the map sends this column to key %q, which is not a canonical key (%s)", ErrBadMap, e.Key, keyList()), "")
				t.field = fieldIgnore
			}
		} else if m.ignored(h, name) {
			t.field = fieldIgnore
		} else if k, r, f, ok := canonical(name); ok {
			t.key, t.role, t.field = k, r, f
		} else if m != nil && m.UnknownColumns == "ignore" {
			t.field = fieldIgnore
		} else {
			msg := fmt.Errorf("%w %q; expected a canonical key (%s), a companion such as mass_err, or name, planet, star, alias, source", ErrUnknownColumn, name, keyList())
			if cl := closeColumns(name); len(cl) > 0 {
				msg = fmt.Errorf("%w (close: %s)", msg, strings.Join(cl, ", "))
			}
			herr(h, "", msg, hintMap)
			t.field = fieldIgnore
		}
		targets[i] = t
	}
	if m != nil {
		var missing []string
		for name := range m.Columns {
			if !used[name] {
				missing = append(missing, name)
			}
		}
		sort.Strings(missing)
		for _, name := range missing {
			herr(name, "", fmt.Errorf("%w: the map names column %q, which this file does not have", ErrBadMap, name), "check the spelling against the file's header")
		}
	}

	// Place each column; duplicates are errors.
	for i, t := range targets {
		h := p.headers[i]
		switch {
		case t.field == fieldIgnore:
			p.colKey[i] = ""
		case t.field != fieldNone:
			fname := fieldNames[t.field]
			p.colKey[i] = fname
			if j := p.text[t.field]; j >= 0 {
				herr(h, fname, fmt.Errorf("%w: %s is already read from column %q", ErrDuplicateColumn, fname, p.headers[j]), "")
				continue
			}
			p.text[t.field] = i
		default:
			kp := getKey(t.key)
			p.colKey[i] = t.key + roleSuffix[t.role]
			if j := kp.col[t.role]; j >= 0 {
				herr(h, t.key, fmt.Errorf("%w: %s%s is already read from column %q", ErrDuplicateColumn, t.key, roleSuffix[t.role], p.headers[j]), "")
				continue
			}
			kp.col[t.role] = i
		}
	}

	// Units: a value column's unit is its key's; companions inherit it.
	for k, kp := range byKey {
		want := keyDims[k]
		vi := kp.col[roleValue]
		if vi < 0 {
			for r := roleErr; r < nRoles; r++ {
				if kp.col[r] >= 0 {
					herr(p.headers[kp.col[r]], k, fmt.Errorf("%w: column %s%s has no value column %s to go with", ErrUncertaintyForm, k, roleSuffix[r], k), "")
				}
			}
			continue
		}
		vt := targets[vi]
		vu, ok := p.unitFor(k, vt, want, p.headers[vi], herr)
		if !ok {
			continue
		}
		kp.factor[roleValue] = vu.Factor
		kp.unit = vt.unit
		for r := roleErr; r < roleSource; r++ {
			ci := kp.col[r]
			if ci < 0 {
				continue
			}
			ct := targets[ci]
			if r == roleFactor {
				if ct.hasUnit && ct.unit != "" && ct.unit != "1" {
					herr(p.headers[ci], k, fmt.Errorf("%w: a ×/÷ factor is a pure number; expected no unit", ErrWrongUnit), "")
				}
				kp.factor[r] = 1
				continue
			}
			if !ct.hasUnit {
				kp.factor[r] = vu.Factor
				continue
			}
			cu, ok := p.unitFor(k, ct, want, p.headers[ci], herr)
			if ok {
				kp.factor[r] = cu.Factor
			}
		}
	}

	// Map constants.
	if m != nil {
		p.constName[fieldPlanet] = normName(m.Constants.Planet)
		p.constName[fieldStar] = normName(m.Constants.Star)
		p.constName[fieldSource] = strings.TrimSpace(m.Constants.Source)
		names := make([]string, 0, len(m.ConstantValues))
		for k := range m.ConstantValues {
			names = append(names, k)
		}
		sort.Strings(names)
		for _, k := range names {
			par, err := m.ConstantValues[k].param(k)
			if err != nil {
				herr("", k, err, "")
				continue
			}
			kp := getKey(k)
			kp.konst = &par
		}
	}

	if p.text[fieldName] < 0 {
		herr("", "name", fmt.Errorf("%w: no name column; expected a column headed name (or a map entry with key = \"name\")", ErrMissingName), hintMap)
	}
	if p.text[fieldPlanet] < 0 && p.constName[fieldPlanet] == "" {
		herr("", "planet", fmt.Errorf("%w: no planet column; a moon is known by its name and its planet: add a planet column, or set [constants] planet in a map", ErrMissingName), hintMap)
	}

	p.keys = make([]keyPlan, 0, len(byKey))
	for _, kp := range byKey {
		for r := roleErr; r < roleSource; r++ {
			if kp.col[r] >= 0 {
				kp.comps = append(kp.comps, r)
			}
		}
		p.keys = append(p.keys, *kp)
		if kp.info.Body != schema.KindMoon {
			p.planetKeys = true
		}
	}
	sort.Slice(p.keys, func(i, j int) bool { return p.keys[i].info.Key < p.keys[j].info.Key })
	return p
}

func keyIndex(k string) int {
	for i := range schema.Keys {
		if schema.Keys[i].Key == k {
			return i
		}
	}
	panic("importers: key " + k + " is not in schema.Keys")
}

var fieldNames = [...]string{fieldName: "name", fieldPlanet: "planet", fieldStar: "star", fieldAlias: "alias", fieldSource: "source", fieldIgnore: "ignore"}

func keyList() string {
	ks := make([]string, len(schema.Keys))
	for i, k := range schema.Keys {
		ks[i] = k.Key
	}
	return strings.Join(ks, ", ")
}

// unitFor parses a column's unit and checks its dimension against the key's.
func (p *plan) unitFor(key string, t colTarget, want units.Dim, header string, herr func(string, string, error, string)) (units.Unit, bool) {
	info, _ := schema.LookupKey(key)
	if !t.hasUnit {
		if want == units.Dimensionless {
			return units.Unit{Factor: 1}, true
		}
		hint := fmt.Sprintf("write the header as \"%s [%s]\" or give the unit in a map", key, info.Unit)
		if t.mapped {
			hint = fmt.Sprintf("add unit = %q (or the file's unit) to this column's map entry", info.Unit)
		}
		herr(header, key, fmt.Errorf("%w: %s needs a unit (%s); expected %s", ErrMissingUnit, key, want.Wants(), "a header such as \""+key+" ["+info.Unit+"]\""), hint)
		return units.Unit{}, false
	}
	u, err := units.Parse(t.unit)
	if err != nil {
		herr(header, key, err, "")
		return units.Unit{}, false
	}
	if err := units.Expect(key, t.unit, u, want); err != nil {
		herr(header, key, err, "")
		return units.Unit{}, false
	}
	return u, true
}

// levenshtein is the edit distance in bytes, enough for ASCII header names.
func levenshtein(a, b string) int {
	prev := make([]int, len(b)+1)
	cur := make([]int, len(b)+1)
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= len(a); i++ {
		cur[0] = i
		for j := 1; j <= len(b); j++ {
			cost := 1
			if a[i-1] == b[j-1] {
				cost = 0
			}
			cur[j] = min(prev[j]+1, cur[j-1]+1, prev[j-1]+cost)
		}
		prev, cur = cur, prev
	}
	return prev[len(b)]
}
