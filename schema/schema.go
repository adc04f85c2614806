package schema

import (
	"errors"
	"fmt"
	"math"
	"sort"
	"strings"
	"time"
)

// Kind is the kind of a catalog body.
type Kind string

// The three kinds of body a catalog holds. Moons are the ranked targets.
const (
	KindStar   Kind = "star"
	KindPlanet Kind = "planet"
	KindMoon   Kind = "moon"
)

// UncKind says which form an uncertainty takes.
type UncKind uint8

// The uncertainty forms of the design's catalog model.
const (
	UncNone       UncKind = iota // an exact or unqualified value
	UncSymmetric                 // value ± Sigma (one standard deviation)
	UncAsymmetric                // value +Plus −Minus (one standard deviation each side)
	UncRange                     // a range [Min, Max] holding the value
	UncFactor                    // value ×/÷ Factor (Factor > 1, one geometric standard deviation)
)

var uncKindNames = [...]string{"none", "symmetric", "asymmetric", "range", "factor"}

// String returns the stored spelling of k ("none", "symmetric", …).
func (k UncKind) String() string {
	if int(k) < len(uncKindNames) {
		return uncKindNames[k]
	}
	return fmt.Sprintf("UncKind(%d)", uint8(k))
}

// ParseUncKind is the inverse of UncKind.String.
func ParseUncKind(s string) (UncKind, error) {
	for i, n := range uncKindNames {
		if n == s {
			return UncKind(i), nil
		}
	}
	return 0, fmt.Errorf("unknown uncertainty kind %q (want one of %s)", s, strings.Join(uncKindNames[:], ", "))
}

// MarshalText implements encoding.TextMarshaler so JSON shows the name.
func (k UncKind) MarshalText() ([]byte, error) { return []byte(k.String()), nil }

// UnmarshalText implements encoding.TextUnmarshaler.
func (k *UncKind) UnmarshalText(b []byte) error {
	v, err := ParseUncKind(string(b))
	if err != nil {
		return err
	}
	*k = v
	return nil
}

// Uncertainty is the uncertainty of one value, in the same SI unit as the value.
// Only the fields of its Kind are meaningful; the others are zero.
type Uncertainty struct {
	Kind   UncKind `json:"kind"`
	Sigma  float64 `json:"sigma,omitempty"`  // UncSymmetric
	Plus   float64 `json:"plus,omitempty"`   // UncAsymmetric, upper σ (≥ 0)
	Minus  float64 `json:"minus,omitempty"`  // UncAsymmetric, lower σ (≥ 0, a magnitude)
	Min    float64 `json:"min,omitempty"`    // UncRange
	Max    float64 `json:"max,omitempty"`    // UncRange
	Factor float64 `json:"factor,omitempty"` // UncFactor, > 1
}

// Validate reports whether u is well formed: finite, non-negative σ, Min ≤ Max
// for a range, and Factor ≥ 1 for a multiplicative factor.
func (u Uncertainty) Validate() error {
	finite := func(name string, x float64) error {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return fmt.Errorf("%w: %s is %v", ErrNotFinite, name, x)
		}
		return nil
	}
	switch u.Kind {
	case UncNone:
		return nil
	case UncSymmetric:
		if err := finite("σ", u.Sigma); err != nil {
			return err
		}
		if u.Sigma < 0 {
			return fmt.Errorf("%w: σ = %g", ErrNegativeUncertainty, u.Sigma)
		}
	case UncAsymmetric:
		if err := errors.Join(finite("+σ", u.Plus), finite("−σ", u.Minus)); err != nil {
			return err
		}
		if u.Plus < 0 || u.Minus < 0 {
			return fmt.Errorf("%w: +σ = %g, −σ = %g (give both as magnitudes)", ErrNegativeUncertainty, u.Plus, u.Minus)
		}
	case UncRange:
		if err := errors.Join(finite("min", u.Min), finite("max", u.Max)); err != nil {
			return err
		}
		if u.Min > u.Max {
			return fmt.Errorf("%w: min %g > max %g", ErrMinAboveMax, u.Min, u.Max)
		}
	case UncFactor:
		if err := finite("factor", u.Factor); err != nil {
			return err
		}
		if u.Factor < 1 {
			return fmt.Errorf("%w: factor %g (a ×/÷ factor must be ≥ 1)", ErrOutOfDomain, u.Factor)
		}
	default:
		return fmt.Errorf("unknown uncertainty kind %d", u.Kind)
	}
	return nil
}

// IsZeroWidth reports whether u describes no spread at all.
func (u Uncertainty) IsZeroWidth() bool {
	switch u.Kind {
	case UncSymmetric:
		return u.Sigma == 0
	case UncAsymmetric:
		return u.Plus == 0 && u.Minus == 0
	case UncRange:
		return u.Min == u.Max
	case UncFactor:
		return u.Factor == 1
	}
	return true
}

// Status says where a value came from.
type Status string

// Value statuses. Assumed values are filled in from a profile prior at ranking
// time and are never written back to the catalog.
const (
	StatusMeasured Status = "measured"
	StatusAssumed  Status = "assumed"
)

// Param is one numeric parameter of a body, in the SI unit of its key
// (see KeyInfo.Unit).
type Param struct {
	Key      string      `json:"key"`
	Value    float64     `json:"value"`
	Unc      Uncertainty `json:"uncertainty"`
	Source   string      `json:"source,omitempty"`
	Status   Status      `json:"status"`
	Revision int64       `json:"revision,omitempty"` // the revision that set it; 0 if not stored
}

// Record is one imported row in SI units, with its provenance. Importers produce
// records; the store consumes them. Params holds moon, planet and star keys
// together (keys are unique across body kinds, see Keys); the store files each
// under the body its KeyInfo names.
type Record struct {
	File    string   // file name as given by the user, for messages
	Row     int      // 1-based data row (header excluded) or line, for messages
	Name    string   // moon name as written
	Planet  string   // host planet name as written
	Star    string   // planet's star name as written; may be empty
	Aliases []string // other names of the moon
	Source  string   // row-level source, used where a param has none
	Params  []Param  // sorted by Key, no duplicates
}

// Revision is one change of the catalog: an import or an edit.
type Revision struct {
	ID      int64     `json:"id"`
	Time    time.Time `json:"time"`
	File    string    `json:"file,omitempty"`
	SHA256  string    `json:"sha256,omitempty"`
	Note    string    `json:"note,omitempty"`
	Changes int       `json:"changes"` // values added or changed
}

// Body is a star, planet or moon as read from the catalog at one revision.
type Body struct {
	ID      int64            `json:"-"`
	Kind    Kind             `json:"kind"`
	Name    string           `json:"name"`
	Parent  string           `json:"parent,omitempty"` // star of a planet, planet of a moon
	Aliases []string         `json:"aliases,omitempty"`
	Params  map[string]Param `json:"params"`
}

// Catalog is a snapshot of the whole catalog at one revision.
type Catalog struct {
	Revision    Revision `json:"revision"`
	ContentHash string   `json:"content_hash"` // SHA-256 of the snapshot's canonical content
	Stars       []Body   `json:"stars"`
	Planets     []Body   `json:"planets"`
	Moons       []Body   `json:"moons"` // sorted by (planet, name), case-insensitively
}

// Planet returns the planet named name (matched with NameKey), or nil.
func (c *Catalog) Planet(name string) *Body { return findBody(c.Planets, name) }

// Star returns the star named name (matched with NameKey), or nil.
func (c *Catalog) Star(name string) *Body { return findBody(c.Stars, name) }

func findBody(bs []Body, name string) *Body {
	k := NameKey(name)
	for i := range bs {
		if NameKey(bs[i].Name) == k {
			return &bs[i]
		}
	}
	return nil
}

// Inputs returns the parameters that bear on a moon: its own, its planet's and
// its planet's star's, in one map keyed by canonical key.
func (c *Catalog) Inputs(moon *Body) map[string]Param {
	out := make(map[string]Param, len(moon.Params)+4)
	if p := c.Planet(moon.Parent); p != nil {
		if s := c.Star(p.Parent); s != nil {
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
	return out
}

// StarOf returns the name of the star of a moon's planet, or "".
func (c *Catalog) StarOf(moon *Body) string {
	if p := c.Planet(moon.Parent); p != nil {
		return p.Parent
	}
	return ""
}

// NameKey is the natural-key form of a body name: trimmed, runs of white space
// collapsed to one space, lower case. Two names with equal keys are one body.
// (Unicode normalisation is applied by the importers before names reach here.)
func NameKey(name string) string {
	// Most names are ASCII already in key form: return them as they are
	// (an import computes a few keys per row).
	if isKeyForm(name) {
		return name
	}
	if isCollapsed(name, false) {
		return strings.ToLower(name) // ASCII: no white space to collapse
	}
	return strings.ToLower(strings.Join(strings.Fields(name), " "))
}

// CollapseSpace trims a name and collapses its runs of white space to one
// space: the display form a body's name is stored in.
func CollapseSpace(name string) string {
	if isCollapsed(name, false) {
		return name
	}
	return strings.Join(strings.Fields(name), " ")
}

// isKeyForm reports whether NameKey(s) == s, for ASCII s (false otherwise).
func isKeyForm(s string) bool { return isCollapsed(s, true) }

// isCollapsed reports whether s is non-empty ASCII with single spaces between
// words and none at either end (and, with lower, no upper-case letter).
func isCollapsed(s string, lower bool) bool {
	space := true // a leading space is not allowed
	for i := 0; i < len(s); i++ {
		c := s[i]
		switch {
		case c >= 0x80, c == '\t', c == '\n', c == '\v', c == '\f', c == '\r':
			return false
		case lower && 'A' <= c && c <= 'Z':
			return false
		case c == ' ':
			if space {
				return false
			}
			space = true
		default:
			space = false
		}
	}
	return !space
}

// SortedKeys returns the keys of a parameter map in the order of Keys.
func SortedKeys(m map[string]Param) []string {
	out := make([]string, 0, len(m))
	for k := range m {
		out = append(out, k)
	}
	sort.Slice(out, func(i, j int) bool {
		oi, oj := keyOrder(out[i]), keyOrder(out[j])
		if oi != oj {
			return oi < oj
		}
		return out[i] < out[j]
	})
	return out
}

func keyOrder(k string) int {
	if i, ok := keyIndex[k]; ok {
		return i
	}
	return len(Keys)
}
