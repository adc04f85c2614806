package importers

import (
	"bufio"
	"fmt"
	"io"
	"sort"
	"strconv"
	"strings"
	"unicode/utf8"

	"tidesift/importers/table"
	"tidesift/importers/units"
	"tidesift/schema"
)

// SuggestMap reads a file's columns (and a sample of its rows) and returns a
// starter column map in TOML: one [columns] entry per column with the key,
// role and unit guessed from the column's name, declared unit and VOTable
// UCD, each with a comment saying what the guess rests on, and a comment
// where it could not guess. The map loads with LoadMap as written; a column
// whose unit could not be guessed is left without one, so that reading with
// the map stops with ErrMissingUnit at that column until the unit is filled in.
func SuggestMap(name string, r io.Reader, opt Options) (string, error) {
	br := bufio.NewReaderSize(r, 64<<10)
	head, _ := br.Peek(4096)
	format := opt.Format
	if format == "" {
		format = detectFormat(name, head)
	}
	tr, err := openTable(format, br, opt)
	if err != nil {
		return "", fmt.Errorf("suggest a map for %s: %w", name, err)
	}
	if c, ok := tr.(io.Closer); ok {
		defer c.Close() // only a sample of rows is read
	}
	cols := tr.Columns()
	if len(cols) > maxColumns {
		return "", fmt.Errorf("suggest a map for %s: %w: the header has %d columns; tidesift reads at most %d", name, ErrTableSyntax, len(cols), maxColumns)
	}
	// A sample of rows tells text columns from numeric ones.
	numeric := make([]int, len(cols))
	text := make([]int, len(cols))
	for range 200 {
		cells, _, err := tr.Next()
		if err == io.EOF {
			break
		}
		if err != nil {
			if rec, ok := err.(interface{ Recoverable() bool }); ok && rec.Recoverable() {
				continue
			}
			break
		}
		for i := range cols {
			s := cell(cells, i)
			if isMissing(s) {
				continue
			}
			if _, err := strconv.ParseFloat(s, 64); err == nil {
				numeric[i]++
			} else {
				text[i]++
			}
		}
	}
	return suggest(name, format, cols, numeric, text), nil
}

type guess struct {
	key, role, unit string
	why             []string
	note            string // a caution for the user
}

// suggest writes the starter map for columns cols.
func suggest(name, format string, cols []table.Column, numeric, text []int) string {
	guesses := make([]guess, len(cols))
	seen := map[string]bool{}
	for i, c := range cols {
		isText := text[i] > 0 && numeric[i] == 0
		g := guessColumn(c, isText)
		if g.key != "" && g.key != "ignore" {
			slot := g.key + "/" + g.role
			if seen[slot] {
				g.note = fmt.Sprintf("another column already looks like %s (%s); keep one", g.key, roleOrValue(g.role))
				g.key = "ignore"
			}
			seen[slot] = true
		}
		guesses[i] = g
	}
	// An error column whose key has no value column is doubtful.
	for i, g := range guesses {
		if g.role != "" && g.key != "ignore" && !seen[g.key+"/"] {
			guesses[i].note = fmt.Sprintf("looks like an uncertainty of %s, but no column looks like %s itself", g.key, g.key)
		}
	}

	var b strings.Builder
	fmt.Fprintf(&b, "# Starter column map for %s (%s), suggested by tidesift.\n", tomlComment(name), format)
	b.WriteString("# Every line is a guess from column names, units and UCDs: check each one,\n")
	b.WriteString("# fill in what is marked, then import with --map.\n")
	b.WriteString("# Keys: " + keyList() + ".\n")
	b.WriteString("# Roles: value (default), err, err_plus, err_minus, min, max, factor, source.\n\n")
	b.WriteString("# table = \"\"            # which table of a multi-table file (name or 1-based index)\n")
	b.WriteString("unknown_columns = \"error\"\n\n")

	var haveName, havePlanet, haveStar bool
	for _, g := range guesses {
		haveName = haveName || g.key == "name"
		havePlanet = havePlanet || g.key == "planet"
		haveStar = haveStar || g.key == "star"
	}
	b.WriteString("[constants]\n")
	if !havePlanet {
		b.WriteString("# No column looks like the host planet's name. Name it here if the whole\n# file is about one planet:\n# planet = \"\"\n")
	} else {
		b.WriteString("# planet = \"\"           # only if the file's planet column is empty\n")
	}
	if !haveStar {
		b.WriteString("# star = \"\"\n")
	}
	b.WriteString("# source = \"\"           # a citation for every row\n\n")

	b.WriteString("[columns]\n")
	if !haveName {
		b.WriteString("# No column looks like the moon's name: map one with key = \"name\".\n")
	}
	width := 0
	for _, c := range cols {
		width = max(width, len(tomlQuote(c.Name)))
	}
	written := map[string]bool{}
	for i, c := range cols {
		g := guesses[i]
		q := tomlQuote(c.Name)
		if written[c.Name] {
			// TOML forbids a key twice, and a map could not tell the two apart.
			fmt.Fprintf(&b, "# %s appears again as column %d: a map cannot tell two columns of one name apart; rename one in the file\n", tomlComment(q), i+1)
			continue
		}
		written[c.Name] = true
		entry := "{ key = " + tomlQuote(g.key)
		if g.role != "" {
			entry += ", role = " + tomlQuote(g.role)
		}
		if g.unit != "" {
			entry += ", unit = " + tomlQuote(g.unit)
		}
		entry += " }"
		var notes []string
		if g.key == "ignore" && g.note == "" {
			notes = append(notes, "could not guess this column: ignored; give it a key if it matters")
		}
		if len(g.why) > 0 {
			notes = append(notes, "from "+strings.Join(g.why, ", "))
		}
		if g.note != "" {
			notes = append(notes, g.note)
		}
		if info, ok := schema.LookupKey(g.key); ok && g.unit == "" && info.Unit != "" && g.role == "" {
			notes = append(notes, fmt.Sprintf("FILL IN the unit: add unit = \"...\" (%s)", keyDims[g.key].Wants()))
		}
		fmt.Fprintf(&b, "%-*s = %s", width, q, entry)
		if len(notes) > 0 {
			b.WriteString("  # " + tomlComment(strings.Join(notes, "; ")))
		}
		b.WriteString("\n")
	}
	return b.String()
}

func roleOrValue(r string) string {
	if r == "" {
		return "its value"
	}
	return "its " + r
}

// tomlComment makes s safe inside a TOML comment, which may not hold control
// characters other than tab.
func tomlComment(s string) string {
	return strings.Map(func(r rune) rune {
		if r < 0x20 && r != '\t' || r == 0x7f || r == utf8.RuneError {
			return ' '
		}
		return r
	}, strings.ToValidUTF8(s, "\uFFFD"))
}

// tomlQuote writes s as a TOML basic string: quotes, backslashes and control
// characters escaped, the rest as is (Go's strconv.Quote uses \x and \a
// escapes TOML lacks).
func tomlQuote(s string) string {
	var b strings.Builder
	b.WriteByte('"')
	for _, r := range strings.ToValidUTF8(s, "\uFFFD") {
		switch {
		case r == '"':
			b.WriteString(`\"`)
		case r == '\\':
			b.WriteString(`\\`)
		case r == '\t':
			b.WriteString(`\t`)
		case r == '\n':
			b.WriteString(`\n`)
		case r == '\r':
			b.WriteString(`\r`)
		case r < 0x20 || r == 0x7f:
			fmt.Fprintf(&b, `\u%04X`, r)
		default:
			b.WriteRune(r)
		}
	}
	b.WriteByte('"')
	return b.String()
}

// synonyms maps normalised column names to keys. Planet- and star-level keys
// are reached through the prefixes in hostPrefixes.
var synonyms = map[string]string{
	"name": "name", "moon": "name", "sat": "name", "satellite": "name", "object": "name", "id": "name",
	"moon_name": "name", "sat_name": "name", "designation": "name", "obj": "name",
	"planet": "planet", "host": "planet", "host_planet": "planet", "parent": "planet", "pl_name": "planet", "primary": "planet",
	"star": "star", "host_star": "star", "hostname": "star", "star_name": "star", "st_name": "star",
	"alias": "alias", "aliases": "alias", "aka": "alias", "other_names": "alias",
	"source": "source", "ref": "source", "reference": "source", "refs": "source", "bibcode": "source", "citation": "source",

	"mass": "mass", "m": "mass", "msat": "mass", "m_sat": "mass", "mass_sat": "mass", "moon_mass": "mass", "m_moon": "mass", "mp": "mass",
	"radius": "radius", "r": "radius", "rad": "radius", "rsat": "radius", "r_sat": "radius", "rad_sat": "radius", "moon_radius": "radius", "r_moon": "radius",
	"semi_major_axis": "semi_major_axis", "semimajor": "semi_major_axis", "semimajor_axis": "semi_major_axis", "semi_major": "semi_major_axis",
	"sma": "semi_major_axis", "a": "semi_major_axis", "a_sat": "semi_major_axis", "orbit": "semi_major_axis", "smaxis": "semi_major_axis",
	"eccentricity": "eccentricity", "ecc": "eccentricity", "e": "eccentricity", "ecc_sat": "eccentricity",
	"obliquity": "obliquity", "obliq": "obliquity", "obl": "obliquity", "tilt": "obliquity",
	"period": "period", "per": "period", "p": "period", "porb": "period", "p_orb": "period", "orbital_period": "period", "orbper": "period",
	"k2_q": "k2_q", "k2q": "k2_q", "k2_over_q": "k2_q", "k2": "k2", "q": "q", "qual": "q",
	"albedo": "bond_albedo", "bond_albedo": "bond_albedo", "a_bond": "bond_albedo", "ab": "bond_albedo",
	"surface_temperature": "surface_temperature", "tsurf": "surface_temperature", "t_surf": "surface_temperature", "ts": "surface_temperature",
	"temperature": "surface_temperature", "temp": "surface_temperature", "t": "surface_temperature",
	"density": "density", "rho": "density", "dens": "density", "bulk_density": "density",
	"moment_of_inertia": "moment_of_inertia", "moi": "moment_of_inertia", "c_mr2": "moment_of_inertia", "inertia": "moment_of_inertia",
	"atmosphere_column": "atmosphere_column",
	"lum":               "star_luminosity", "luminosity": "star_luminosity",
}

// longSynonyms are the synonyms long enough to match by near spelling, sorted
// so that ties resolve the same way every run.
var longSynonyms = func() []string {
	var out []string
	for s := range synonyms {
		if len(s) >= 4 {
			out = append(out, s)
		}
	}
	sort.Strings(out)
	return out
}()

// hostPrefixes turn a moon key into its host's: pl_mass → planet_mass.
var hostPrefixes = []struct{ prefix, body string }{
	{"planet_", "planet"}, {"pl_", "planet"}, {"host_", "planet"}, {"p_", "planet"},
	{"star_", "star"}, {"st_", "star"}, {"stellar_", "star"}, {"s_", "star"},
}

var hostKeys = map[string]map[string]string{
	"planet": {"mass": "planet_mass", "radius": "planet_radius", "semi_major_axis": "star_distance", "orbsmax": "star_distance", "rade": "planet_radius", "masse": "planet_mass"},
	"star":   {"mass": "star_mass", "star_luminosity": "star_luminosity", "lum": "star_luminosity", "distance": "star_distance"},
}

// rolePatterns find an uncertainty or range role in a normalised name.
var rolePatterns = []struct {
	prefix, suffix, role string
}{
	{suffix: "_err_plus", role: "err_plus"}, {suffix: "_err_minus", role: "err_minus"},
	{suffix: "_errp", role: "err_plus"}, {suffix: "_errm", role: "err_minus"},
	{suffix: "err1", role: "err_plus"}, {suffix: "err2", role: "err_minus"},
	{suffix: "_plus", role: "err_plus"}, {suffix: "_minus", role: "err_minus"},
	{suffix: "_upper", role: "max"}, {suffix: "_lower", role: "min"},
	{suffix: "_max", role: "max"}, {suffix: "_min", role: "min"},
	{suffix: "_hi", role: "max"}, {suffix: "_lo", role: "min"},
	{suffix: "_err", role: "err"}, {suffix: "_error", role: "err"}, {suffix: "_sigma", role: "err"},
	{suffix: "_sig", role: "err"}, {suffix: "_unc", role: "err"}, {suffix: "_factor", role: "factor"},
	{suffix: "_source", role: "source"}, {suffix: "_ref", role: "source"},
	{prefix: "e_", role: "err"}, {prefix: "err_", role: "err"}, {prefix: "sigma_", role: "err"},
	{prefix: "sig_", role: "err"}, {prefix: "unc_", role: "err"}, {prefix: "min_", role: "min"},
	{prefix: "max_", role: "max"}, {prefix: "r_", role: "source"},
}

// ucdKeys maps the IVOA UCD1+ words worth knowing to keys.
var ucdKeys = []struct{ ucd, key string }{
	{"phys.mass", "mass"},
	{"phys.size.radius", "radius"},
	{"phys.size.smajaxis", "semi_major_axis"},
	{"src.orbital.eccentricity", "eccentricity"},
	{"time.period.revolution", "period"},
	{"time.period", "period"},
	{"phys.density", "density"},
	{"phys.albedo", "bond_albedo"},
	{"phys.temperature", "surface_temperature"},
	{"phys.luminosity", "star_luminosity"},
	{"meta.id", "name"},
	{"meta.bib", "source"},
	{"meta.ref", "source"},
}

// normColumn lower-cases a name and turns every run of other characters than
// letters and digits into one '_'.
func normColumn(s string) string {
	var b strings.Builder
	us := false
	for _, r := range strings.ToLower(s) {
		if r >= 'a' && r <= 'z' || r >= '0' && r <= '9' {
			if us && b.Len() > 0 {
				b.WriteByte('_')
			}
			us = false
			b.WriteRune(r)
		} else {
			us = true
		}
	}
	return b.String()
}

func guessColumn(c table.Column, isText bool) guess {
	var g guess
	name, unit, hasUnit, err := splitHeader(c.Name)
	if err != nil {
		name = c.Name
	}
	// "a (Mm)" and "radius_km": a unit in parentheses or as the last word.
	if !hasUnit {
		if i := strings.LastIndexByte(name, '('); i > 0 && strings.HasSuffix(name, ")") {
			if _, err := units.Parse(name[i+1 : len(name)-1]); err == nil {
				unit, hasUnit = strings.TrimSpace(name[i+1:len(name)-1]), true
				name = strings.TrimSpace(name[:i])
			}
		}
	}
	if !hasUnit && c.Unit != "" {
		unit, hasUnit = c.Unit, true
		g.why = append(g.why, "the declared unit")
	}
	n := normColumn(name)

	// 1. A name of the canonical layout (mass_err, planet_radius).
	if k, ok := canonicalName(n); ok {
		g.key, g.role = k.key, k.role
		g.why = append(g.why, "the canonical name")
	}

	// 2. The UCD, when the file gives one.
	ucd := strings.ToLower(c.UCD)
	if ucd != "" && g.key == "" {
		for _, w := range strings.Split(ucd, ";") {
			w = strings.TrimSpace(w)
			switch {
			case strings.HasPrefix(w, "stat.error"):
				g.role = "err"
			case strings.HasPrefix(w, "stat.min"):
				g.role = "min"
			case strings.HasPrefix(w, "stat.max"):
				g.role = "max"
			}
			for _, u := range ucdKeys {
				if g.key == "" && (w == u.ucd || strings.HasPrefix(w, u.ucd+".")) {
					g.key = u.key
				}
			}
		}
		if g.key != "" {
			g.why = append(g.why, "UCD "+c.UCD)
			// A UCD says "a mass", not whose: the name may say it is the host's.
			if k := hostKey(n, g.key); k != "" {
				g.key = k
			}
		}
	}

	if g.key == "" {
		// A trailing unit word: radius_km, period_days.
		if i := strings.LastIndexByte(n, '_'); i > 0 {
			if u, err := units.Parse(n[i+1:]); err == nil && u.Dim != units.Dimensionless {
				if k := lookupBase(n[:i]); k != "" {
					if units.Expect(k, n[i+1:], u, keyDims[k]) == nil {
						g.key, g.why = k, append(g.why, "the column name")
						if !hasUnit {
							unit, hasUnit = n[i+1:], true
						}
					}
				}
			}
		}
	}

	// 3. The name: strip a role marker, then look the rest up.
	base := n
	if g.key == "" {
		if k, ok := synonyms[n]; ok {
			g.key = k
		} else {
			for _, p := range rolePatterns {
				if p.prefix != "" && strings.HasPrefix(n, p.prefix) && len(n) > len(p.prefix) {
					base = n[len(p.prefix):]
				} else if p.suffix != "" && strings.HasSuffix(n, p.suffix) && len(n) > len(p.suffix) {
					base = n[:len(n)-len(p.suffix)]
				} else {
					continue
				}
				if k := lookupBase(base); k != "" {
					g.key, g.role = k, p.role
					break
				}
				base = n
			}
		}
		if g.key == "" {
			g.key = lookupBase(n)
		}
		if g.key != "" {
			g.why = append(g.why, "the column name")
		}
	}
	switch {
	case g.key == "":
		g.key = "ignore"
		if !isText {
			g.note = "could not guess this column: ignored; give it a key if it matters"
		} else {
			g.note = "could not guess this text column: ignored; give it a key (name, planet, star, alias, source) if it matters"
		}
		g.why = nil
		return g
	case g.role == "value":
		g.role = ""
	}
	if _, isField := fieldByName[g.key]; isField {
		g.role = ""
		return g
	}
	if isText && g.role != "source" {
		g.note = "holds text in the sample rows, not numbers: check"
	}
	if g.key == "surface_temperature" && strings.Contains(n, "eq") {
		g.note = "an equilibrium temperature is not a measured surface temperature; map it only if that is what you mean"
	}
	if hasUnit && g.role != "factor" && g.role != "source" {
		if u, err := units.Parse(unit); err == nil && units.Expect(g.key, unit, u, keyDims[g.key]) == nil {
			g.unit = unit
		} else if err != nil {
			g.note = fmt.Sprintf("the file's unit %q is not one tidesift knows: give unit = \"...\" in a VOUnits spelling", unit)
		} else {
			g.note = fmt.Sprintf("the file's unit %q does not fit %s: check the key", unit, g.key)
		}
	}
	return g
}

type keyRole struct{ key, role string }

// canonicalName reads a normalised name of the canonical layout (mass_err).
func canonicalName(n string) (keyRole, bool) {
	k, r, f, ok := canonical(n)
	if !ok {
		return keyRole{}, false
	}
	if f != fieldNone {
		return keyRole{fieldNames[f], ""}, true
	}
	return keyRole{k, roleNames[r]}, true
}

// hostKey turns a moon key into its host's if the name carries a host prefix.
func hostKey(n, key string) string {
	for _, hp := range hostPrefixes {
		if strings.HasPrefix(n, hp.prefix) || strings.Contains(n, "_"+strings.TrimSuffix(hp.prefix, "_")+"_") {
			if k, ok := hostKeys[hp.body][key]; ok {
				return k
			}
		}
	}
	return ""
}

// lookupBase finds the key of a name stripped of role markers: exact
// synonyms, a host prefix, then a near spelling of a synonym.
func lookupBase(b string) string {
	if k, ok := synonyms[b]; ok {
		if _, isField := fieldByName[k]; !isField || len(b) > 2 {
			return k
		}
	}
	if _, ok := schema.LookupKey(b); ok {
		return b
	}
	for _, hp := range hostPrefixes {
		if rest, ok := strings.CutPrefix(b, hp.prefix); ok {
			if k, ok := hostKeys[hp.body][rest]; ok {
				return k
			}
			if k, ok := synonyms[rest]; ok {
				if hk, ok := hostKeys[hp.body][k]; ok {
					return hk
				}
			}
		}
	}
	if len(b) >= 5 {
		best, bestD := "", 3
		for _, syn := range longSynonyms {
			d := levenshtein(b, syn)
			if len(syn) >= 5 && strings.HasPrefix(b, syn) {
				d = min(d, 1) // "semimajoraxis_km" starts with "semimajor"
			}
			if d < bestD {
				best, bestD = synonyms[syn], d
			}
		}
		return best
	}
	return ""
}
