package rank

import (
	"errors"
	"fmt"
	"math"
	"sort"
	"strings"

	"tidesift/rank/physics"
	"tidesift/rank/profile"
	"tidesift/rank/uncertain"
	"tidesift/schema"
)

// ErrMissingInputs is returned by Central (and recorded for each excluded
// target of Run) when a moon lacks a required input that neither the catalog
// nor the profile's priors supply.
var ErrMissingInputs = errors.New("missing required inputs")

// slot is one sampled input of a target.
type slot struct {
	key     string
	dist    uncertain.Dist
	param   schema.Param // as reported in Target.Inputs
	assumed bool
	stream  uint64 // generator stream: the owning body's identity and the key
	shared  bool   // owned by a planet or star: the same draws for each of its moons
}

// role is a physics input; each is filled from at most one slot.
type role int

const (
	rMass role = iota
	rRadius
	rDensity
	rSemiMajorAxis
	rEccentricity
	rObliquity
	rPeriod
	rK2Q
	rK2
	rQ
	rBondAlbedo
	rSurfaceTemperature
	rMomentOfInertia
	rAtmosphereColumn
	rPlanetMass
	rStarDistance
	rStarLuminosity
	rRockDensity
	numRoles
)

var roleKeys = [numRoles]string{
	"mass", "radius", "density", "semi_major_axis", "eccentricity", "obliquity", "period",
	"k2_q", "k2", "q", "bond_albedo", "surface_temperature", "moment_of_inertia", "atmosphere_column",
	"planet_mass", "star_distance", "star_luminosity", profile.RockDensityKey,
}

// plan says how one target's physics inputs are built from sampled slots.
type plan struct {
	slots []slot
	at    [numRoles]int // slot index of each role, −1 when absent
	// Derived inputs: mass or radius from the bulk density, k2/Q from k2 and Q.
	massFromDensity, radiusFromDensity, k2qFromRatio bool
	missing                                          []string
}

// source describes where a value for a key can come from.
type source struct {
	ok, measured bool
	param        schema.Param
	dist         uncertain.Dist
	prior        string
}

// buildPlan resolves a moon's inputs: catalog values (measured) first, then
// the profile's priors (assumed); derived inputs where a direct one is
// missing. Priors never replace a catalog value.
func buildPlan(ix *catIndex, moon *schema.Body, prof *profile.Profile) (*plan, error) {
	in, starName := ix.inputs(moon)
	var errs []error
	lookup := func(key string) source {
		info, _ := profile.PriorKey(key)
		if p, ok := in[key]; ok && key != profile.RockDensityKey {
			d, err := uncertain.NewFromParam(p, info)
			if err != nil {
				errs = append(errs, err)
				d = uncertain.FromParam(p, info)
			}
			if p.Status == "" {
				p.Status = schema.StatusMeasured
			}
			return source{ok: true, measured: true, param: p, dist: d}
		}
		if pr, ok := prof.Prior(key); ok {
			_, u := uncertain.Uncertainty(pr.Dist)
			v := uncertain.Median(pr.Dist)
			desc := pr.Dist.Describe()
			return source{ok: true, dist: pr.Dist, prior: desc, param: schema.Param{
				Key: key, Value: v, Unc: u, Status: schema.StatusAssumed,
				Source: fmt.Sprintf("assumed: profile %q prior, %s", prof.Name, desc),
			}}
		}
		return source{}
	}
	var src [numRoles]source
	for r := range numRoles {
		src[r] = lookup(roleKeys[r])
	}
	p := &plan{}
	for i := range p.at {
		p.at[i] = -1
	}
	// Each input draws from its own stream, keyed by the body that owns the
	// key: a planet's or star's values are then the same in sample j for all
	// of its moons, so the joint ranking keeps their correlation.
	planet := schema.NameKey(moon.Parent)
	star := schema.NameKey(starName)
	starOwner := fnv1a(fnv1a(fnvOffset, "star\x00"), star)
	planetOwner := fnv1a(fnv1a(fnvOffset, "planet\x00"), planet)
	moonOwner := fnv1a(fnv1a(fnv1a(fnv1a(fnvOffset, "moon\x00"), planet), "\x00"), schema.NameKey(moon.Name))
	use := func(r role) {
		s := src[r]
		k := roleKeys[r]
		h, shared := moonOwner, false
		switch roleBody[r] {
		case schema.KindStar:
			h, shared = starOwner, true
		case schema.KindPlanet:
			h, shared = planetOwner, true
		}
		p.at[r] = len(p.slots)
		p.slots = append(p.slots, slot{key: k, dist: s.dist, param: s.param, assumed: !s.measured,
			stream: fnv1a(fnv1a(h, "\x00"), k), shared: shared})
	}
	m, rad, rho := src[rMass], src[rRadius], src[rDensity]
	// Two of mass, radius and density: measured pairs first, then any pair
	// (a prior filling one), in the order mass–radius, mass–density,
	// radius–density.
	sized := false
	for _, has := range []func(source) bool{
		func(s source) bool { return s.measured },
		func(s source) bool { return s.ok },
	} {
		switch {
		case has(m) && has(rad):
			use(rMass)
			use(rRadius)
		case has(m) && has(rho):
			use(rMass)
			use(rDensity)
			p.radiusFromDensity = true
		case has(rad) && has(rho):
			use(rRadius)
			use(rDensity)
			p.massFromDensity = true
		default:
			continue
		}
		sized = true
		break
	}
	if !sized {
		if !m.ok {
			p.missing = append(p.missing, "mass (or density with radius)")
		}
		if !rad.ok {
			p.missing = append(p.missing, "radius (or density with mass)")
		}
	}
	kq, k2, q := src[rK2Q], src[rK2], src[rQ]
	switch {
	case kq.measured:
		use(rK2Q)
	case k2.measured && q.ok || q.measured && k2.ok:
		use(rK2)
		use(rQ)
		p.k2qFromRatio = true
	case kq.ok:
		use(rK2Q)
	case k2.ok && q.ok:
		use(rK2)
		use(rQ)
		p.k2qFromRatio = true
	default:
		p.missing = append(p.missing, "k2_q (or k2 and q)")
	}
	required := []role{rSemiMajorAxis, rEccentricity, rObliquity, rPlanetMass}
	optional := []role{rPeriod, rSurfaceTemperature, rMomentOfInertia, rAtmosphereColumn}
	if src[rSurfaceTemperature].ok {
		optional = append(optional, rBondAlbedo, rStarDistance, rStarLuminosity)
	} else {
		required = append(required, rBondAlbedo, rStarDistance, rStarLuminosity)
	}
	if src[rMomentOfInertia].ok {
		optional = append(optional, rRockDensity)
	} else {
		required = append(required, rRockDensity)
	}
	for _, r := range required {
		if src[r].ok {
			use(r)
		} else {
			p.missing = append(p.missing, roleKeys[r])
		}
	}
	for _, r := range optional {
		if src[r].ok {
			use(r)
		}
	}
	// Display order: by key, as schema.Keys lists them.
	var slotRole [numRoles]role
	for r := range numRoles {
		if i := p.at[r]; i >= 0 {
			slotRole[i] = r
		}
	}
	roles := slotRole[:len(p.slots)]
	sort.SliceStable(roles, func(i, j int) bool { return roleOrder[roles[i]] < roleOrder[roles[j]] })
	sorted := make([]slot, len(p.slots))
	for i := range p.at {
		p.at[i] = -1
	}
	for i, r := range roles {
		for _, sl := range p.slots {
			if sl.key == roleKeys[r] {
				sorted[i] = sl
			}
		}
		p.at[r] = i
	}
	p.slots = sorted
	return p, errors.Join(errs...)
}

// catIndex finds planets and stars by name key in constant time
// (schema.Catalog's lookups scan every body, which a catalog of thousands of
// moons cannot afford once per moon).
type catIndex struct {
	planets, stars map[string]*schema.Body
}

func newCatIndex(cat *schema.Catalog) *catIndex {
	ix := &catIndex{planets: make(map[string]*schema.Body, len(cat.Planets)), stars: make(map[string]*schema.Body, len(cat.Stars))}
	for i := range cat.Planets {
		k := schema.NameKey(cat.Planets[i].Name)
		if _, dup := ix.planets[k]; !dup {
			ix.planets[k] = &cat.Planets[i]
		}
	}
	for i := range cat.Stars {
		k := schema.NameKey(cat.Stars[i].Name)
		if _, dup := ix.stars[k]; !dup {
			ix.stars[k] = &cat.Stars[i]
		}
	}
	return ix
}

// inputs is schema.Catalog.Inputs (the moon's parameters over its planet's
// over its star's) and schema.Catalog.StarOf, through the index.
func (ix *catIndex) inputs(moon *schema.Body) (map[string]schema.Param, string) {
	out := make(map[string]schema.Param, len(moon.Params)+4)
	star := ""
	if p := ix.planets[schema.NameKey(moon.Parent)]; p != nil {
		star = p.Parent
		if s := ix.stars[schema.NameKey(p.Parent)]; s != nil {
			for k, v := range s.Params {
				out[k] = v
			}
		}
		for k, v := range p.Params {
			out[k] = v
		}
	}
	for k, v := range moon.Params {
		out[k] = v
	}
	return out, star
}

const fnvOffset = 14695981039346656037

// fnv1a continues a 64-bit FNV-1a hash h over s.
func fnv1a(h uint64, s string) uint64 {
	for i := 0; i < len(s); i++ {
		h ^= uint64(s[i])
		h *= 1099511628211
	}
	return h
}

// roleBody is the kind of body that owns each role's key, and roleOrder its
// position in schema.Keys (display order of Target.Inputs).
var roleBody, roleOrder = func() (b [numRoles]schema.Kind, o [numRoles]int) {
	for r := range numRoles {
		info, _ := profile.PriorKey(roleKeys[r])
		b[r] = info.Body
		o[r] = len(schema.Keys)
		for i, k := range schema.Keys {
			if k.Key == roleKeys[r] {
				o[r] = i
			}
		}
	}
	return
}()

// roleColumns points each role at its slot's column (cols[slot][:n]), or at
// nan (n NaNs) when the plan has no slot for it.
func (p *plan) roleColumns(cols [][]float64, nan []float64, n int, rc *[numRoles][]float64) {
	for r := range rc {
		if s := p.at[r]; s >= 0 {
			rc[r] = cols[s][:n]
		} else {
			rc[r] = nan[:n]
		}
	}
}

// inputs assembles the physics inputs of sample i from the role columns of
// roleColumns.
func (p *plan) inputs(rc *[numRoles][]float64, i int, in *physics.Inputs) {
	in.Mass = rc[rMass][i]
	in.Radius = rc[rRadius][i]
	switch {
	case p.massFromDensity:
		r := in.Radius
		in.Mass = rc[rDensity][i] * (4.0 / 3.0) * math.Pi * r * r * r
	case p.radiusFromDensity:
		in.Radius = math.Cbrt(3 * in.Mass / (4 * math.Pi * rc[rDensity][i]))
	}
	in.SemiMajorAxis = rc[rSemiMajorAxis][i]
	in.Eccentricity = rc[rEccentricity][i]
	in.Obliquity = rc[rObliquity][i]
	in.Period = rc[rPeriod][i]
	if p.k2qFromRatio {
		in.K2Q = physics.K2QFrom(rc[rK2][i], rc[rQ][i])
	} else {
		in.K2Q = rc[rK2Q][i]
	}
	in.BondAlbedo = rc[rBondAlbedo][i]
	in.SurfaceTemperature = rc[rSurfaceTemperature][i]
	in.MomentOfInertia = rc[rMomentOfInertia][i]
	in.AtmosphereColumn = rc[rAtmosphereColumn][i]
	in.PlanetMass = rc[rPlanetMass][i]
	in.StarDistance = rc[rStarDistance][i]
	in.StarLuminosity = rc[rStarLuminosity][i]
	in.RockDensity = rc[rRockDensity][i]
}

// params lists every input used, in key order (for Target.Inputs and Central).
func (p *plan) params() []schema.Param {
	out := make([]schema.Param, len(p.slots))
	for i, s := range p.slots {
		out[i] = s.param
	}
	return out
}

func (p *plan) assumed() (keys []string, priors map[string]string) {
	keys = []string{}
	for _, s := range p.slots {
		if s.assumed {
			keys = append(keys, s.key)
			if priors == nil {
				priors = map[string]string{}
			}
			priors[s.key] = s.dist.Describe()
		}
	}
	return keys, priors
}

// Central evaluates the model for one moon at its central input values: the
// catalog value of each measured input and the median of each prior. It
// returns the derived quantities and every input used (assumed ones with
// Status schema.StatusAssumed and the prior in Source). A moon lacking a
// required input gets an error wrapping ErrMissingInputs, with the inputs
// that could be resolved.
func Central(cat *schema.Catalog, moon *schema.Body, prof *profile.Profile) (*physics.Derived, []schema.Param, error) {
	p, err := buildPlan(newCatIndex(cat), moon, prof)
	if err != nil {
		return nil, nil, fmt.Errorf("%s: %w", moon.Name, err)
	}
	params := p.params()
	if len(p.missing) > 0 {
		return nil, params, fmt.Errorf("%s: %w: %s (give them in the catalog or as profile priors)", moon.Name, ErrMissingInputs, strings.Join(p.missing, ", "))
	}
	cols := make([][]float64, len(p.slots))
	for i, s := range p.slots {
		v := s.param.Value
		if s.assumed {
			v = uncertain.Median(s.dist)
		}
		cols[i] = []float64{v}
	}
	var in physics.Inputs
	var rc [numRoles][]float64
	p.roleColumns(cols, []float64{math.NaN()}, 1, &rc)
	p.inputs(&rc, 0, &in)
	d := new(physics.Derived)
	physics.Evaluate(in, prof.Model, d)
	return d, params, nil
}
