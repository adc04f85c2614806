package profile

import (
	"bytes"
	"errors"
	"fmt"
	"io/fs"
	"math"
	"sort"
	"strings"

	toml "github.com/pelletier/go-toml/v2"

	"tidesift/rank/physics"
	"tidesift/rank/uncertain"
	"tidesift/sampledata"
	"tidesift/schema"
)

// Profile is a parsed, validated scoring profile.
type Profile struct {
	Name        string
	Description string
	TopK        int             // k of P(rank ≤ k)
	Model       physics.Options // complete: keys the file leaves out hold physics.DefaultOptions()
	Criteria    []Criterion     // in file order
	Priors      []Prior         // sorted by key

	header string // the source's leading comment block, kept by TOML()
	source []byte
}

// Criterion is one scored quantity: a metric, a transfer function to [0, 1]
// and a weight. The composite score of a sample is Σ wᵢ Tᵢ(xᵢ) / Σ wᵢ.
type Criterion struct {
	Metric   string  // metric name as written, e.g. "heat_flux_w_m2" or "retains:N2"
	Transfer string  // "ramp", "log_ramp" or "window"
	Lo, Hi   float64 // ramp ends, or the window's full-score interval
	Soft     float64 // window only: width of each linear edge (0: a hard window)
	Weight   float64 // > 0

	metric       Metric
	volatile     int
	kind         transferKind
	logLo, logHi float64
}

// Prior is a distribution for an input the catalog lacks.
type Prior struct {
	Key  string // a catalog key (schema.Keys) or "rock_density"
	Spec uncertain.Spec
	Dist uncertain.Dist
}

// RockDensityKey is the prior key of the rock end member's density in the
// two-component interior (kg/m³): not a catalog key, always a profile prior.
const RockDensityKey = "rock_density"

// PriorKey returns the domain of a key a prior may set: every catalog key
// except those of names, plus RockDensityKey.
func PriorKey(key string) (schema.KeyInfo, bool) {
	if key == RockDensityKey {
		return schema.KeyInfo{Key: RockDensityKey, Body: schema.KindMoon, Unit: "kg/m3", Min: 0, Max: math.Inf(1), MinOpen: true,
			Description: "density of the rock end member of the two-component interior"}, true
	}
	return schema.LookupKey(key)
}

func priorKeyNames() []string {
	out := make([]string, 0, len(schema.Keys)+1)
	for _, k := range schema.Keys {
		out = append(out, k.Key)
	}
	return append(out, RockDensityKey)
}

// Prior returns the prior for key, if the profile has one.
func (p *Profile) Prior(key string) (Prior, bool) {
	i := sort.Search(len(p.Priors), func(i int) bool { return p.Priors[i].Key >= key })
	if i < len(p.Priors) && p.Priors[i].Key == key {
		return p.Priors[i], true
	}
	return Prior{}, false
}

// Source returns the profile's TOML exactly as it was parsed, comments included.
func (p *Profile) Source() []byte { return bytes.Clone(p.source) }

// Score is the composite score of one evaluation, in [0, 1].
func (p *Profile) Score(d *physics.Derived) float64 {
	var s, w float64
	for i := range p.Criteria {
		c := &p.Criteria[i]
		x := c.Value(d)
		var a float64
		switch {
		case c.kind == tRamp: // Apply's linear ramp, inlined (NaN gives 0)
			a = ramp(x, c.Lo, c.Hi)
		case c.kind == tLogRamp && c.Lo < c.Hi && !(x > c.Lo): // includes NaN
			a = 0
		default:
			a = c.Apply(x)
		}
		s += c.Weight * a
		w += c.Weight
	}
	return s / w
}

// ErrUnknownProfile is returned by Load for a name that is neither a built-in
// profile nor a readable file.
var ErrUnknownProfile = errors.New("unknown profile")

// BuiltinNames lists the built-in profiles, sorted.
func BuiltinNames() []string { return sampledata.ProfileNames() }

// Builtin returns the built-in profile called name.
func Builtin(name string) (*Profile, error) {
	data, ok := sampledata.Profiles()[name]
	if !ok {
		return nil, fmt.Errorf("%w %q (built-in profiles: %s)", ErrUnknownProfile, name, strings.Join(BuiltinNames(), ", "))
	}
	return Parse(name, data)
}

// Load resolves a --profile argument: a built-in profile's name, else a file
// read with readFile (the caller passes os.ReadFile; package rank and its
// sub-packages do no file I/O of their own). A nil readFile resolves built-ins only.
func Load(nameOrFile string, readFile func(string) ([]byte, error)) (*Profile, error) {
	if _, ok := sampledata.Profiles()[nameOrFile]; ok {
		return Builtin(nameOrFile)
	}
	if readFile == nil {
		return Builtin(nameOrFile)
	}
	data, err := readFile(nameOrFile)
	if err != nil {
		if errors.Is(err, fs.ErrNotExist) {
			return nil, fmt.Errorf("%w %q: not a built-in profile (%s) and no such file", ErrUnknownProfile, nameOrFile, strings.Join(BuiltinNames(), ", "))
		}
		return nil, fmt.Errorf("read profile: %w", err)
	}
	return Parse(nameOrFile, data)
}

// The TOML form, decoded strictly (unknown keys are errors).
type fileProfile struct {
	Name        *string              `toml:"name"`
	Description *string              `toml:"description"`
	TopK        *int64               `toml:"top_k"`
	Model       fileModel            `toml:"model"`
	Criteria    []fileCriterion      `toml:"criterion"`
	Priors      map[string]filePrior `toml:"priors"`
}

type fileModel struct {
	IceDensity              *float64 `toml:"ice_density_kg_m3"`
	CoreDensity             *float64 `toml:"core_density_kg_m3"`
	MantleDensity           *float64 `toml:"mantle_density_kg_m3"`
	WaterDensity            *float64 `toml:"water_density_kg_m3"`
	RockHeatProduction      *float64 `toml:"rock_heat_production_w_kg"`
	MeltingTemperature      *float64 `toml:"melting_temperature_k"`
	IceStabilityTemperature *float64 `toml:"ice_stability_temperature_k"`
	MinOceanThickness       *float64 `toml:"min_ocean_thickness_m"`
}

type fileCriterion struct {
	Metric   *string  `toml:"metric"`
	Transfer *string  `toml:"transfer"`
	Lo       *float64 `toml:"lo"`
	Hi       *float64 `toml:"hi"`
	Soft     *float64 `toml:"soft"`
	Weight   *float64 `toml:"weight"`
}

type filePrior struct {
	Dist   *string  `toml:"dist"`
	Value  *float64 `toml:"value"`
	Sigma  *float64 `toml:"sigma"`
	Plus   *float64 `toml:"plus"`
	Minus  *float64 `toml:"minus"`
	Min    *float64 `toml:"min"`
	Max    *float64 `toml:"max"`
	Factor *float64 `toml:"factor"`
}

// validKeys lists the keys each table accepts, for unknown-key messages.
var validKeys = map[string][]string{
	"":          {"name", "description", "top_k", "[model]", "[[criterion]]", "[priors]"},
	"model":     {"ice_density_kg_m3", "core_density_kg_m3", "mantle_density_kg_m3", "water_density_kg_m3", "rock_heat_production_w_kg", "melting_temperature_k", "ice_stability_temperature_k", "min_ocean_thickness_m"},
	"criterion": {"metric", "transfer", "lo", "hi", "soft", "weight"},
	"prior":     {"dist", "value", "sigma", "plus", "minus", "min", "max", "factor"},
}

// DefaultTopK is the k of P(rank ≤ k) when a profile does not set top_k.
const DefaultTopK = 5

// Parse parses and validates a profile. name is used in messages (a file name
// or the built-in's name) and as the profile's name when the file has none.
// Syntax errors and unknown keys come back as *Error with line and column;
// semantic problems as an ErrorList of every problem found, each naming the
// key and, where there are any, the valid choices.
func Parse(name string, data []byte) (*Profile, error) {
	var fp fileProfile
	dec := toml.NewDecoder(bytes.NewReader(data))
	dec.DisallowUnknownFields()
	if err := dec.Decode(&fp); err != nil {
		return nil, decodeError(name, data, err)
	}
	pos := indexPositions(data)
	v := &validator{src: name, pos: pos}
	p := &Profile{source: bytes.Clone(data), header: leadingComments(data)}

	p.Name = strings.TrimSuffix(baseName(name), ".toml")
	if fp.Name != nil {
		p.Name = strings.TrimSpace(*fp.Name)
		if p.Name == "" {
			v.errf("name", "empty name")
		}
	}
	if fp.Description != nil {
		p.Description = *fp.Description
	}
	p.TopK = DefaultTopK
	if fp.TopK != nil {
		if *fp.TopK < 1 || *fp.TopK > 1<<31-1 {
			v.errf("top_k", "top_k = %d: want a whole number ≥ 1", *fp.TopK)
		} else {
			p.TopK = int(*fp.TopK)
		}
	}
	p.Model = v.model(fp.Model)
	if len(fp.Criteria) == 0 {
		v.errf("", "no [[criterion]] table: a profile scores at least one metric")
	}
	for i, fc := range fp.Criteria {
		if c, ok := v.criterion(i+1, fc); ok {
			p.Criteria = append(p.Criteria, c)
		}
	}
	keys := make([]string, 0, len(fp.Priors))
	for k := range fp.Priors {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	for _, k := range keys {
		if pr, ok := v.prior(k, fp.Priors[k]); ok {
			p.Priors = append(p.Priors, pr)
		}
	}
	if len(v.errs) > 0 {
		sort.SliceStable(v.errs, func(i, j int) bool {
			a, b := v.errs[i], v.errs[j]
			return a.Line < b.Line || a.Line == b.Line && a.Column < b.Column
		})
		return nil, v.errs
	}
	return p, nil
}

func baseName(s string) string {
	if i := strings.LastIndexAny(s, `/\`); i >= 0 {
		return s[i+1:]
	}
	return s
}

type validator struct {
	src  string
	pos  map[string]position
	errs ErrorList
}

// errf records a problem at key (a dotted path into the index of positions;
// "criterion.2.metric" is shown as "criterion[2].metric").
func (v *validator) errf(key, format string, args ...any) {
	e := &Error{Source: v.src, Key: displayKey(key), Msg: fmt.Sprintf(format, args...)}
	for k := key; k != ""; {
		if p, ok := v.pos[k]; ok {
			e.Line, e.Column = p.line, p.col
			break
		}
		i := strings.LastIndexByte(k, '.')
		if i < 0 {
			break
		}
		k = k[:i]
	}
	v.errs = append(v.errs, e)
}

func finite(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }

func (v *validator) model(m fileModel) physics.Options {
	o := physics.DefaultOptions()
	set := func(key string, dst *float64, src *float64, allowZero bool) {
		if src == nil {
			return
		}
		x := *src
		if !finite(x) || x < 0 || (!allowZero && x == 0) {
			want := "a positive number"
			if allowZero {
				want = "a number ≥ 0"
			}
			v.errf("model."+key, "%s = %g: want %s", key, x, want)
			return
		}
		*dst = x
	}
	set("ice_density_kg_m3", &o.IceDensity, m.IceDensity, false)
	set("core_density_kg_m3", &o.CoreDensity, m.CoreDensity, false)
	set("mantle_density_kg_m3", &o.MantleDensity, m.MantleDensity, false)
	set("water_density_kg_m3", &o.WaterDensity, m.WaterDensity, false)
	set("rock_heat_production_w_kg", &o.RockHeatProduction, m.RockHeatProduction, true)
	set("melting_temperature_k", &o.MeltingTemperature, m.MeltingTemperature, false)
	set("ice_stability_temperature_k", &o.IceStabilityTemperature, m.IceStabilityTemperature, false)
	set("min_ocean_thickness_m", &o.MinOceanThickness, m.MinOceanThickness, true)
	if len(v.errs) == 0 {
		if err := o.Validate(); err != nil {
			v.errf("model", "%v", err)
		}
	}
	return o
}

func (v *validator) criterion(n int, fc fileCriterion) (Criterion, bool) {
	at := fmt.Sprintf("criterion.%d", n)
	nerr := len(v.errs)
	var c Criterion
	if fc.Metric == nil {
		v.errf(at, "missing metric (valid: %s)", strings.Join(metricNames(), ", "))
	} else {
		c.Metric = *fc.Metric
		m, vol, ok, badGas := parseMetric(c.Metric)
		switch {
		case badGas:
			v.errf(at+".metric", "unknown gas in metric %q (valid gases: %s)", c.Metric, strings.Join(VolatileNames(), ", "))
		case !ok:
			v.errf(at+".metric", "unknown metric %q (valid: %s)", c.Metric, strings.Join(metricNames(), ", "))
		}
		c.metric, c.volatile = m, vol
	}
	if fc.Transfer == nil {
		v.errf(at, "missing transfer (valid: %s)", strings.Join(TransferNames, ", "))
	} else {
		c.Transfer = *fc.Transfer
		switch c.Transfer {
		case TransferRamp:
			c.kind = tRamp
		case TransferLogRamp:
			c.kind = tLogRamp
		case TransferWindow:
			c.kind = tWindow
		default:
			v.errf(at+".transfer", "unknown transfer %q (valid: %s)", c.Transfer, strings.Join(TransferNames, ", "))
		}
	}
	num := func(key string, src *float64, dst *float64, required bool) bool {
		if src == nil {
			if required {
				v.errf(at, "missing %s", key)
			}
			return false
		}
		if !finite(*src) {
			v.errf(at+"."+key, "%s = %g: want a finite number", key, *src)
			return false
		}
		*dst = *src
		return true
	}
	hasLo := num("lo", fc.Lo, &c.Lo, true)
	hasHi := num("hi", fc.Hi, &c.Hi, true)
	c.Weight = 1
	if num("weight", fc.Weight, &c.Weight, false) && !(c.Weight > 0) {
		v.errf(at+".weight", "weight = %g: want a number > 0", c.Weight)
	}
	if num("soft", fc.Soft, &c.Soft, false) {
		if c.kind != tWindow && fc.Transfer != nil {
			v.errf(at+".soft", "soft applies only to transfer = %q", TransferWindow)
		} else if c.Soft < 0 {
			v.errf(at+".soft", "soft = %g: want a number ≥ 0", c.Soft)
		}
	}
	if hasLo && hasHi && fc.Transfer != nil {
		switch c.kind {
		case tRamp:
			if c.Lo == c.Hi {
				v.errf(at+".hi", "ramp needs lo ≠ hi (lo > hi scores low values higher)")
			}
		case tLogRamp:
			if !(c.Lo > 0 && c.Hi > 0) || c.Lo == c.Hi {
				v.errf(at+".lo", "log_ramp needs lo, hi > 0 and lo ≠ hi, got lo = %g, hi = %g", c.Lo, c.Hi)
			} else {
				c.logLo, c.logHi = math.Log10(c.Lo), math.Log10(c.Hi)
			}
		case tWindow:
			if !(c.Lo < c.Hi) {
				v.errf(at+".hi", "window needs lo < hi, got lo = %g, hi = %g", c.Lo, c.Hi)
			}
		}
	}
	return c, len(v.errs) == nerr
}

func (v *validator) prior(key string, fp filePrior) (Prior, bool) {
	at := "priors." + key
	info, ok := PriorKey(key)
	if !ok {
		v.errf(at, "unknown prior key %q (valid: %s)", key, strings.Join(priorKeyNames(), ", "))
		return Prior{}, false
	}
	if fp.Dist == nil {
		v.errf(at, "missing dist (valid: %s)", strings.Join(uncertain.DistNames, ", "))
		return Prior{}, false
	}
	s := uncertain.Spec{Dist: *fp.Dist}
	fields := uncertain.Fields(s.Dist)
	if fields == nil {
		v.errf(at+".dist", "unknown distribution %q (valid: %s)", s.Dist, strings.Join(uncertain.DistNames, ", "))
		return Prior{}, false
	}
	given := map[string]*float64{"value": fp.Value, "sigma": fp.Sigma, "plus": fp.Plus, "minus": fp.Minus, "min": fp.Min, "max": fp.Max, "factor": fp.Factor}
	dst := map[string]*float64{"value": &s.Value, "sigma": &s.Sigma, "plus": &s.Plus, "minus": &s.Minus, "min": &s.Min, "max": &s.Max, "factor": &s.Factor}
	nerr := len(v.errs)
	for _, f := range fields {
		if given[f] == nil {
			v.errf(at, "%s needs %s", s.Dist, strings.Join(fields, ", "))
			return Prior{}, false
		}
		if !finite(*given[f]) {
			v.errf(at+"."+f, "%s = %g: want a finite number", f, *given[f])
		}
		*dst[f] = *given[f]
	}
	for _, f := range validKeys["prior"][1:] {
		if given[f] != nil && !contains(fields, f) {
			v.errf(at+"."+f, "%s is not a parameter of %s (it takes %s)", f, s.Dist, strings.Join(fields, ", "))
		}
	}
	if len(v.errs) > nerr {
		return Prior{}, false
	}
	d, err := s.Build(info)
	if err != nil {
		v.errf(at, "%v", err)
		return Prior{}, false
	}
	return Prior{Key: key, Spec: s, Dist: d}, true
}

func contains(xs []string, x string) bool {
	for _, y := range xs {
		if y == x {
			return true
		}
	}
	return false
}
