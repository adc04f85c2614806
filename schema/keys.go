package schema

import (
	"errors"
	"fmt"
	"math"
)

// Sentinel errors of value validation. Importers wrap them in position-carrying
// errors; the store's check wraps them with the body and key. Test with errors.Is.
var (
	// ErrUnknownKey is returned by LookupKey users for a key not in Keys.
	ErrUnknownKey = errors.New("unknown key")
	// ErrOutOfDomain is returned by KeyInfo.Check for a value outside its physical domain.
	ErrOutOfDomain = errors.New("value outside its physical domain")
	// ErrNotFinite is returned for NaN or ±Inf where a number is required.
	ErrNotFinite = errors.New("value is not a finite number")
	// ErrNegativeUncertainty is returned by Uncertainty.Validate for σ < 0.
	ErrNegativeUncertainty = errors.New("negative uncertainty")
	// ErrMinAboveMax is returned by Uncertainty.Validate for a range whose min exceeds its max.
	ErrMinAboveMax = errors.New("range minimum above maximum")
)

// KeyInfo describes one canonical catalog key: which body it belongs to, its SI
// unit (VOUnits spelling) and its physical domain.
type KeyInfo struct {
	Key         string
	Body        Kind
	Unit        string  // SI unit in VOUnits spelling; "" for dimensionless
	Min, Max    float64 // domain bounds (±Inf when open-ended)
	MinOpen     bool    // true: value must be > Min; false: ≥ Min
	MaxOpen     bool    // true: value must be < Max; false: ≤ Max
	Description string
}

// Keys lists every canonical key, in display order. Keys are unique across body
// kinds, so a flat map of a moon's inputs (Catalog.Inputs) is unambiguous.
var Keys = []KeyInfo{
	{Key: "mass", Body: KindMoon, Unit: "kg", Min: 0, Max: inf, MinOpen: true, Description: "moon mass"},
	{Key: "radius", Body: KindMoon, Unit: "m", Min: 0, Max: inf, MinOpen: true, Description: "moon mean radius"},
	{Key: "density", Body: KindMoon, Unit: "kg/m3", Min: 0, Max: inf, MinOpen: true, Description: "moon bulk density (used when mass or radius is missing)"},
	{Key: "semi_major_axis", Body: KindMoon, Unit: "m", Min: 0, Max: inf, MinOpen: true, Description: "semi-major axis of the moon's orbit about its planet"},
	{Key: "eccentricity", Body: KindMoon, Unit: "", Min: 0, Max: 1, MaxOpen: true, Description: "orbital eccentricity"},
	{Key: "obliquity", Body: KindMoon, Unit: "rad", Min: 0, Max: math.Pi, Description: "spin-axis obliquity to the orbit normal"},
	{Key: "period", Body: KindMoon, Unit: "s", Min: 0, Max: inf, MinOpen: true, Description: "orbital period"},
	{Key: "k2_q", Body: KindMoon, Unit: "", Min: 0, Max: inf, MinOpen: true, Description: "tidal Love number over quality factor, k2/Q"},
	{Key: "k2", Body: KindMoon, Unit: "", Min: 0, Max: 1.5, MinOpen: true, Description: "tidal Love number k2 (≤ 3/2 for a fluid body)"},
	{Key: "q", Body: KindMoon, Unit: "", Min: 0, Max: inf, MinOpen: true, Description: "tidal quality factor Q"},
	{Key: "bond_albedo", Body: KindMoon, Unit: "", Min: 0, Max: 1, Description: "Bond albedo"},
	{Key: "surface_temperature", Body: KindMoon, Unit: "K", Min: 0, Max: inf, MinOpen: true, Description: "mean surface temperature, when measured"},
	{Key: "moment_of_inertia", Body: KindMoon, Unit: "", Min: 0, Max: 2.0 / 3.0, MinOpen: true, Description: "normalised polar moment of inertia C/MR² (0.4 for a uniform sphere)"},
	{Key: "atmosphere_column", Body: KindMoon, Unit: "kg/m2", Min: 0, Max: inf, Description: "atmospheric column mass per unit area, for a Jeans-escape timescale"},
	{Key: "planet_mass", Body: KindPlanet, Unit: "kg", Min: 0, Max: inf, MinOpen: true, Description: "host planet mass"},
	{Key: "planet_radius", Body: KindPlanet, Unit: "m", Min: 0, Max: inf, MinOpen: true, Description: "host planet radius"},
	{Key: "star_distance", Body: KindPlanet, Unit: "m", Min: 0, Max: inf, MinOpen: true, Description: "planet's semi-major axis about its star"},
	{Key: "star_luminosity", Body: KindStar, Unit: "W", Min: 0, Max: inf, MinOpen: true, Description: "stellar luminosity"},
	{Key: "star_mass", Body: KindStar, Unit: "kg", Min: 0, Max: inf, MinOpen: true, Description: "stellar mass"},
}

var inf = math.Inf(1)

var keyIndex = func() map[string]int {
	m := make(map[string]int, len(Keys))
	for i, k := range Keys {
		m[k.Key] = i
	}
	return m
}()

// LookupKey returns the description of a canonical key.
func LookupKey(key string) (KeyInfo, bool) {
	i, ok := keyIndex[key]
	if !ok {
		return KeyInfo{}, false
	}
	return Keys[i], true
}

// Check reports whether v lies in the key's physical domain. The error wraps
// ErrNotFinite or ErrOutOfDomain and says what was expected.
func (k KeyInfo) Check(v float64) error {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return fmt.Errorf("%w: %s = %v", ErrNotFinite, k.Key, v)
	}
	lowOK := v >= k.Min
	if k.MinOpen {
		lowOK = v > k.Min
	}
	highOK := v <= k.Max
	if k.MaxOpen {
		highOK = v < k.Max
	}
	if lowOK && highOK {
		return nil
	}
	return fmt.Errorf("%w: %s = %g, expected %s", ErrOutOfDomain, k.Key, v, k.DomainString())
}

// DomainString renders the domain as an interval, e.g. "(0, +Inf)" or "[0, 1)".
func (k KeyInfo) DomainString() string {
	lo, hi := "[", "]"
	if k.MinOpen {
		lo = "("
	}
	if k.MaxOpen || math.IsInf(k.Max, 1) {
		hi = ")"
	}
	return fmt.Sprintf("%s%g, %g%s", lo, k.Min, k.Max, hi)
}

// CheckParam validates a parameter's value against its key's domain and its
// uncertainty's form. Unknown keys wrap ErrUnknownKey.
func CheckParam(p Param) error {
	info, ok := LookupKey(p.Key)
	if !ok {
		return fmt.Errorf("%w %q", ErrUnknownKey, p.Key)
	}
	if err := info.Check(p.Value); err != nil {
		return err
	}
	if err := p.Unc.Validate(); err != nil {
		return fmt.Errorf("%s: %w", p.Key, err)
	}
	return nil
}
