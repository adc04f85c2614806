package units

import (
	"errors"
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"
	"unicode"
	"unicode/utf8"
)

// Sentinel errors. Parse returns ErrUnknownUnit and ErrSyntax; Expect returns
// ErrIncompatible. Test with errors.Is.
var (
	// ErrUnknownUnit: a unit symbol that is neither a VOUnits/CDS spelling, a
	// prefixed form of one, nor a listed alias. The message lists close spellings.
	ErrUnknownUnit = errors.New("unknown unit")
	// ErrSyntax: a unit string that does not follow the unit grammar (see the
	// package documentation), e.g. an unbalanced parenthesis.
	ErrSyntax = errors.New("malformed unit")
	// ErrIncompatible: a unit of the wrong physical dimension for a quantity,
	// e.g. km for a mass.
	ErrIncompatible = errors.New("unit of the wrong dimension")
)

// Dim is a physical dimension as exponents of the base quantities. Angle is
// kept as a base of its own (SI counts the radian as dimensionless) so that an
// angle cannot be given where a pure number is expected, and the reverse.
type Dim struct {
	Length, Mass, Time, Temperature, Angle int8
}

// Dimensions tidesift's keys use, for comparisons and messages.
var (
	Dimensionless = Dim{}
	Length        = Dim{Length: 1}
	Mass          = Dim{Mass: 1}
	Time          = Dim{Time: 1}
	Temperature   = Dim{Temperature: 1}
	Angle         = Dim{Angle: 1}
	Power         = Dim{Mass: 1, Length: 2, Time: -3}
	Density       = Dim{Mass: 1, Length: -3}
	ArealDensity  = Dim{Mass: 1, Length: -2}
	HeatFlux      = Dim{Mass: 1, Time: -3} // W/m²
)

type dimName struct {
	d           Dim
	noun        string // "a length"
	wants       string // "a length unit such as m, km, AU"
	name, short string
}

var dimNames = []dimName{
	{Dimensionless, "dimensionless", `a dimensionless number (no unit, or "1")`, "dimensionless", ""},
	{Length, "a length", "a length unit such as m, km, AU, earthRad", "length", ""},
	{Mass, "a mass", "a mass unit such as kg, earthMass", "mass", ""},
	{Time, "a time", "a time unit such as s, h, d, yr", "time", ""},
	{Temperature, "a temperature", "a temperature unit: K", "temperature", ""},
	{Angle, "an angle", "an angle unit such as deg, rad", "angle", ""},
	{Power, "a power", "a power unit such as W, solLum", "power", ""},
	{Density, "a density", "a density unit such as kg/m3, g/cm3", "density", ""},
	{ArealDensity, "a mass per area", "a mass-per-area unit such as kg/m2, g/cm2", "mass per area", ""},
	{HeatFlux, "a heat flux", "a flux unit such as W/m2, mW/m2", "heat flux", ""},
}

func lookupDim(d Dim) (dimName, bool) {
	for _, n := range dimNames {
		if n.d == d {
			return n, true
		}
	}
	return dimName{}, false
}

// String names the dimension ("length", "density") or, for one without a
// name, spells it in base units ("m2 kg s-1").
func (d Dim) String() string {
	if n, ok := lookupDim(d); ok {
		return n.name
	}
	return d.baseUnits()
}

func (d Dim) baseUnits() string {
	var parts []string
	add := func(sym string, e int8) {
		switch e {
		case 0:
		case 1:
			parts = append(parts, sym)
		default:
			parts = append(parts, sym+strconv.Itoa(int(e)))
		}
	}
	add("m", d.Length)
	add("kg", d.Mass)
	add("s", d.Time)
	add("K", d.Temperature)
	add("rad", d.Angle)
	return strings.Join(parts, " ")
}

func (d Dim) noun() string {
	if n, ok := lookupDim(d); ok {
		return n.noun
	}
	return "of dimension " + d.baseUnits()
}

// Wants says what a quantity of dimension d expects, for messages:
// "a mass unit such as kg, earthMass".
func (d Dim) Wants() string {
	if n, ok := lookupDim(d); ok {
		return n.wants
	}
	return "a unit of dimension " + d.baseUnits()
}

func (d Dim) mul(o Dim, k int8) Dim {
	return Dim{
		Length:      d.Length + k*o.Length,
		Mass:        d.Mass + k*o.Mass,
		Time:        d.Time + k*o.Time,
		Temperature: d.Temperature + k*o.Temperature,
		Angle:       d.Angle + k*o.Angle,
	}
}

// Unit is a parsed unit: a value in this unit times Factor is the value in SI
// (metre, kilogram, second, kelvin, radian, watt and their products).
type Unit struct {
	Factor float64
	Dim    Dim
}

// ToSI converts v from u to SI.
func (u Unit) ToSI(v float64) float64 { return v * u.Factor }

// wrapped is an error with its own text that still matches a sentinel.
type wrapped struct {
	msg string
	err error
}

func (w *wrapped) Error() string { return w.msg }
func (w *wrapped) Unwrap() error { return w.err }

// Expect checks that u, written as text, has dimension want, for the quantity
// named quantity. The error wraps ErrIncompatible and reads like
// "unit km is a length; mass wants a mass unit such as kg, earthMass".
func Expect(quantity, text string, u Unit, want Dim) error {
	if u.Dim == want {
		return nil
	}
	if text == "" {
		text = `""`
	}
	return &wrapped{
		msg: fmt.Sprintf("unit %s is %s; %s wants %s", text, u.Dim.noun(), quantity, want.Wants()),
		err: ErrIncompatible,
	}
}

// prefix sets a symbol accepts.
const (
	pfxNone  = ""
	pfxAll   = "all"
	pfxLarge = "large" // k, M, G (kyr, Myr, Gyr, kpc, Mpc)
	pfxSmall = "small" // m, u (mrad, urad)
)

type symbol struct {
	factor   float64
	dim      Dim
	prefixes string
	alias    bool // a plain-ASCII alias, not a VOUnits or CDS symbol
}

// term is a unit during parsing: mant × 10^p10. Keeping powers of ten apart
// makes g/cm3 exactly 1000 rather than 999.9999999999999.
type term struct {
	mant float64
	p10  int
	dim  Dim
}

func (t term) unit() Unit { return Unit{Factor: t.mant * math.Pow10(t.p10), Dim: t.dim} }

func (t term) pow(e int) term {
	return term{mant: math.Pow(t.mant, float64(e)), p10: t.p10 * e, dim: Dim{}.mul(t.dim, int8(e))}
}

func (t term) times(o term) term {
	return term{mant: t.mant * o.mant, p10: t.p10 + o.p10, dim: t.dim.mul(o.dim, 1)}
}

// symbols holds every unit symbol tidesift knows. VOUnits 1.0 (IVOA
// Recommendation 2014) spellings first, then the CDS "Standards for
// Astronomical Catalogues" spellings VOUnits lacks, then plain aliases.
var symbols = map[string]symbol{
	// SI base and derived units (VOUnits: all SI prefixes allowed).
	"m":   {1, Length, pfxAll, false},
	"g":   {1, Mass, pfxAll, false}, // 1e-3 kg: the power of ten is applied in resolve
	"s":   {1, Time, pfxAll, false},
	"K":   {1, Temperature, pfxAll, false},
	"rad": {1, Angle, pfxSmall, false},
	"W":   {1, Power, pfxAll, false},
	"J":   {1, Dim{Mass: 1, Length: 2, Time: -2}, pfxAll, false},
	"N":   {1, Dim{Mass: 1, Length: 1, Time: -2}, pfxAll, false},

	// Astronomical units of VOUnits.
	"AU":     {AstronomicalUnit, Length, pfxNone, false},
	"au":     {AstronomicalUnit, Length, pfxNone, false},
	"pc":     {Parsec, Length, pfxLarge, false},
	"min":    {60, Time, pfxNone, false},
	"h":      {3600, Time, pfxNone, false},
	"d":      {Day, Time, pfxNone, false},
	"a":      {JulianYear, Time, pfxLarge, false},
	"yr":     {JulianYear, Time, pfxLarge, false},
	"deg":    {Degree, Angle, pfxNone, false},
	"arcmin": {Degree / 60, Angle, pfxNone, false},
	"arcsec": {Degree / 3600, Angle, pfxNone, false},
	"mas":    {Degree / 3600e3, Angle, pfxNone, false},

	"solMass":     {SolarMass, Mass, pfxNone, false},
	"solRad":      {NominalSolarRadius, Length, pfxNone, false},
	"solLum":      {NominalSolarLuminosity, Power, pfxNone, false},
	"jupiterMass": {JupiterMass, Mass, pfxNone, false},
	"jupiterRad":  {NominalJupiterEquatorialR, Length, pfxNone, false},
	"earthMass":   {EarthMass, Mass, pfxNone, false},
	"earthRad":    {NominalEarthEquatorialR, Length, pfxNone, false},

	// CDS spellings (Jupiter and Earth units that VOUnits 1.0 lacks).
	"Mjup":    {JupiterMass, Mass, pfxNone, false},
	"Mgeo":    {EarthMass, Mass, pfxNone, false},
	"Rjup":    {NominalJupiterEquatorialR, Length, pfxNone, false},
	"Rgeo":    {NominalEarthEquatorialR, Length, pfxNone, false},
	"jovMass": {JupiterMass, Mass, pfxNone, false},
	"geoMass": {EarthMass, Mass, pfxNone, false},
	"Msun":    {SolarMass, Mass, pfxNone, false},
	"Rsun":    {NominalSolarRadius, Length, pfxNone, false},
	"Lsun":    {NominalSolarLuminosity, Power, pfxNone, false},

	// Plain ASCII aliases.
	"Mearth":  {EarthMass, Mass, pfxNone, true},
	"Rearth":  {NominalEarthEquatorialR, Length, pfxNone, true},
	"MJup":    {JupiterMass, Mass, pfxNone, true},
	"RJup":    {NominalJupiterEquatorialR, Length, pfxNone, true},
	"Msol":    {SolarMass, Mass, pfxNone, true},
	"Rsol":    {NominalSolarRadius, Length, pfxNone, true},
	"Lsol":    {NominalSolarLuminosity, Power, pfxNone, true},
	"day":     {Day, Time, pfxNone, true},
	"days":    {Day, Time, pfxNone, true},
	"hr":      {3600, Time, pfxNone, true},
	"hour":    {3600, Time, pfxNone, true},
	"hours":   {3600, Time, pfxNone, true},
	"sec":     {1, Time, pfxNone, true},
	"seconds": {1, Time, pfxNone, true},
	"minutes": {60, Time, pfxNone, true},
	"year":    {JulianYear, Time, pfxNone, true},
	"years":   {JulianYear, Time, pfxNone, true},
	"degree":  {Degree, Angle, pfxNone, true},
	"degrees": {Degree, Angle, pfxNone, true},
	"radian":  {1, Angle, pfxNone, true},
	"radians": {1, Angle, pfxNone, true},
	"kelvin":  {1, Temperature, pfxNone, true},
}

// prefixes of the SI (SI brochure, 9th edition, Table 7) in VOUnits spelling;
// "u" and "µ" both stand for micro. Longest first so "da" wins over "d".
var prefixes = []struct {
	sym string
	p10 int
}{
	{"da", 1}, {"Y", 24}, {"Z", 21}, {"E", 18}, {"P", 15}, {"T", 12},
	{"G", 9}, {"M", 6}, {"k", 3}, {"h", 2}, {"d", -1}, {"c", -2},
	{"m", -3}, {"u", -6}, {"µ", -6}, {"μ", -6}, {"n", -9}, {"p", -12},
	{"f", -15}, {"a", -18}, {"z", -21}, {"y", -24},
}

func prefixAllowed(set, p string) bool {
	switch set {
	case pfxAll:
		return true
	case pfxLarge:
		return p == "k" || p == "M" || p == "G"
	case pfxSmall:
		return p == "m" || p == "u" || p == "µ" || p == "μ"
	}
	return false
}

// resolve looks a single symbol up, exact spelling first, then as prefix+symbol.
func resolve(name string) (term, bool) {
	if s, ok := symbols[name]; ok {
		return s.term(), true
	}
	for _, p := range prefixes {
		base, ok := strings.CutPrefix(name, p.sym)
		if !ok || base == "" {
			continue
		}
		if s, ok := symbols[base]; ok && !s.alias && prefixAllowed(s.prefixes, p.sym) {
			t := s.term()
			t.p10 += p.p10
			return t, true
		}
	}
	return term{}, false
}

func (s symbol) term() term {
	t := term{mant: s.factor, dim: s.dim}
	if s.dim == Mass && s.factor == 1 { // the gram
		t.p10 = -3
	}
	return t
}

// Symbols returns every unit symbol and alias Parse accepts without a prefix,
// sorted; prefixed forms (km, mW, Myr) are accepted too but not listed.
func Symbols() []string {
	out := make([]string, 0, len(symbols))
	for k := range symbols {
		out = append(out, k)
	}
	sort.Strings(out)
	return out
}

// Parse reads a unit string. "" and "1" are dimensionless with factor 1.
// See the package documentation for the grammar.
func Parse(s string) (Unit, error) {
	t := strings.TrimSpace(s)
	if t == "" || t == "1" {
		return Unit{Factor: 1}, nil
	}
	if !utf8.ValidString(t) {
		return Unit{}, &wrapped{msg: fmt.Sprintf("%v %q: not valid UTF-8", ErrSyntax, s), err: ErrSyntax}
	}
	p := parser{s: t, orig: s}
	tm, err := p.unit()
	if err != nil {
		return Unit{}, err
	}
	u := tm.unit()
	if math.IsInf(u.Factor, 0) || math.IsNaN(u.Factor) || u.Factor == 0 {
		return Unit{}, p.syntax("scale factor is zero or out of range")
	}
	return u, nil
}

type parser struct {
	s    string
	orig string
	i    int
}

func (p *parser) syntax(why string) error {
	return &wrapped{msg: fmt.Sprintf("%v %q: %s", ErrSyntax, p.orig, why), err: ErrSyntax}
}

func (p *parser) peek() byte {
	if p.i < len(p.s) {
		return p.s[p.i]
	}
	return 0
}

func (p *parser) unit() (term, error) {
	u := term{mant: 1}
	if c := p.peek(); c >= '0' && c <= '9' || c == '.' {
		f, err := p.scale()
		if err != nil {
			return term{}, err
		}
		u = f
		// an optional separator between the scale and the unit
		if c := p.peek(); c == ' ' || c == '*' || (c == '.' && p.i+1 < len(p.s) && !isDigit(p.s[p.i+1])) {
			p.i++
			for p.peek() == ' ' {
				p.i++
			}
		}
		if p.i == len(p.s) {
			return u, nil
		}
	}
	v, err := p.product()
	if err != nil {
		return term{}, err
	}
	if p.i != len(p.s) {
		return term{}, p.syntax(fmt.Sprintf("unexpected %q", p.s[p.i:]))
	}
	return u.times(v), nil
}

func isDigit(c byte) bool { return c >= '0' && c <= '9' }

// scale reads a leading numeric factor: a decimal number (1.898E27), or a power
// of ten in CDS (10+3, 10-6) or FITS (10**3, 10^3) form.
func (p *parser) scale() (term, error) {
	start := p.i
	for isDigit(p.peek()) {
		p.i++
	}
	if p.peek() == '.' && p.i+1 < len(p.s) && isDigit(p.s[p.i+1]) {
		p.i++
		for isDigit(p.peek()) {
			p.i++
		}
	}
	mant := p.s[start:p.i]
	if mant == "" {
		return term{}, p.syntax("a scale factor must start with a digit")
	}
	if mant == "10" {
		j := p.i
		switch {
		case strings.HasPrefix(p.s[j:], "**"):
			j += 2
		case strings.HasPrefix(p.s[j:], "^"):
			j++
		case j < len(p.s) && (p.s[j] == '+' || p.s[j] == '-') && j+1 < len(p.s) && isDigit(p.s[j+1]):
		default:
			j = -1
		}
		if j >= 0 {
			p.i = j
			e, err := p.integer()
			if err != nil {
				return term{}, err
			}
			return term{mant: 1, p10: e}, nil
		}
	}
	if c := p.peek(); c == 'e' || c == 'E' {
		j := p.i + 1
		if j < len(p.s) && (p.s[j] == '+' || p.s[j] == '-') {
			j++
		}
		if j < len(p.s) && isDigit(p.s[j]) {
			for j < len(p.s) && isDigit(p.s[j]) {
				j++
			}
			p.i = j
		}
	}
	f, err := strconv.ParseFloat(p.s[start:p.i], 64)
	if err != nil || f <= 0 {
		return term{}, p.syntax(fmt.Sprintf("bad scale factor %q", p.s[start:p.i]))
	}
	return term{mant: f}, nil
}

// integer reads a signed integer exponent, optionally in parentheses.
func (p *parser) integer() (int, error) {
	paren := p.peek() == '('
	if paren {
		p.i++
	}
	start := p.i
	if c := p.peek(); c == '+' || c == '-' {
		p.i++
	}
	for isDigit(p.peek()) {
		p.i++
	}
	txt := p.s[start:p.i]
	e, err := strconv.Atoi(txt)
	if err != nil || e < -99 || e > 99 {
		return 0, p.syntax(fmt.Sprintf("bad exponent %q (whole numbers from -99 to 99)", txt))
	}
	if paren {
		if p.peek() != ')' {
			return 0, p.syntax("exponent: expected ')' (fractional exponents are not supported)")
		}
		p.i++
	}
	return e, nil
}

// product: factor { ('.' | '*' | ' ' | '/') factor }.
func (p *parser) product() (term, error) {
	u := term{mant: 1}
	sign := 1
	for {
		f, err := p.factor()
		if err != nil {
			return term{}, err
		}
		u = u.times(f.pow(sign))
		switch p.peek() {
		case '.', '*', ' ':
			p.i++
			for p.peek() == ' ' {
				p.i++
			}
			if p.peek() == '/' { // "kg /m3"
				p.i++
				for p.peek() == ' ' {
					p.i++
				}
				sign = -1
				continue
			}
			sign = 1
		case '/':
			p.i++
			for p.peek() == ' ' {
				p.i++
			}
			sign = -1
		default:
			return u, nil
		}
	}
}

// factor: symbol [exponent] | '(' product ')' [exponent].
func (p *parser) factor() (term, error) {
	var u term
	if p.peek() == '(' {
		p.i++
		inner, err := p.product()
		if err != nil {
			return term{}, err
		}
		if p.peek() != ')' {
			return term{}, p.syntax("missing ')'")
		}
		p.i++
		u = inner
	} else {
		start := p.i
		for p.i < len(p.s) {
			r, n := utf8.DecodeRuneInString(p.s[p.i:])
			if !unicode.IsLetter(r) {
				break
			}
			p.i += n
		}
		name := p.s[start:p.i]
		if name == "" {
			if p.i >= len(p.s) {
				return term{}, p.syntax("a unit symbol is missing at the end")
			}
			return term{}, p.syntax(fmt.Sprintf("expected a unit symbol at %q", p.s[p.i:]))
		}
		var ok bool
		u, ok = resolve(name)
		if !ok {
			return term{}, unknown(name, p.orig)
		}
	}
	e, has, err := p.exponent()
	if err != nil {
		return term{}, err
	}
	if has {
		u = u.pow(e)
	}
	return u, nil
}

// exponent: '**' int | '^' int | int (m3, m-3, m+2), int optionally in parentheses.
func (p *parser) exponent() (int, bool, error) {
	switch {
	case strings.HasPrefix(p.s[p.i:], "**"):
		p.i += 2
	case p.peek() == '^':
		p.i++
	case isDigit(p.peek()):
	case (p.peek() == '+' || p.peek() == '-') && p.i+1 < len(p.s) && isDigit(p.s[p.i+1]):
	default:
		return 0, false, nil
	}
	e, err := p.integer()
	if err != nil {
		return 0, false, err
	}
	return e, true, nil
}

func unknown(name, whole string) error {
	msg := fmt.Sprintf("%v %q", ErrUnknownUnit, name)
	if strings.TrimSpace(whole) != name {
		msg += fmt.Sprintf(" in %q", whole)
	}
	if c := Close(name); len(c) > 0 {
		msg += " (close spellings: " + strings.Join(c, ", ") + ")"
	} else {
		msg += " (VOUnits spellings such as m, km, AU, s, d, yr, kg, earthMass, K, deg, W)"
	}
	return &wrapped{msg: msg, err: ErrUnknownUnit}
}

// commonPrefixed are prefixed forms worth suggesting for a misspelling.
var commonPrefixed = []string{"km", "cm", "mm", "kg", "mg", "ms", "kpc", "Mpc", "kyr", "Myr", "Gyr", "Ma", "Ga", "mW", "kW", "mK", "mrad"}

// Close returns up to four known spellings near name (same letters ignoring
// case, or at most two edits away), nearest first.
func Close(name string) []string {
	type cand struct {
		s string
		d int
	}
	var cs []cand
	consider := func(s string) {
		d := distance(name, s)
		if strings.EqualFold(name, s) {
			d = 0
		}
		limit := 2
		if utf8.RuneCountInString(name) <= 2 {
			limit = 1
		}
		if d <= limit {
			cs = append(cs, cand{s, d})
		}
	}
	for s := range symbols {
		consider(s)
	}
	for _, s := range commonPrefixed {
		consider(s)
	}
	sort.Slice(cs, func(i, j int) bool {
		if cs[i].d != cs[j].d {
			return cs[i].d < cs[j].d
		}
		return cs[i].s < cs[j].s
	})
	out := make([]string, 0, 4)
	for _, c := range cs {
		if c.s == name {
			continue
		}
		if len(out) == 4 {
			break
		}
		out = append(out, c.s)
	}
	return out
}

// distance is the Levenshtein edit distance between a and b, in runes.
func distance(a, b string) int {
	ra, rb := []rune(a), []rune(b)
	prev := make([]int, len(rb)+1)
	cur := make([]int, len(rb)+1)
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= len(ra); i++ {
		cur[0] = i
		for j := 1; j <= len(rb); j++ {
			cost := 1
			if ra[i-1] == rb[j-1] {
				cost = 0
			}
			cur[j] = min(prev[j]+1, cur[j-1]+1, prev[j-1]+cost)
		}
		prev, cur = cur, prev
	}
	return prev[len(rb)]
}
