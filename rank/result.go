package rank

import "tidesift/schema"

// FormatVersion is the version of the machine-readable ranking document. Bump it
// whenever a JSON name below changes meaning or disappears; adding a field does
// not need a bump. Version 2: assumed_inputs lists only catalog keys a prior
// replaced (version 1 also listed model parameters such as rock_density).
const FormatVersion = 2

// Result is a ranking of a catalog's moons under one profile. Its JSON form is the
// contract of `tidesift rank --format json` (see DEVELOPERS.md); exporters read a
// Result and never recompute it.
type Result struct {
	FormatVersion   int        `json:"format_version"`
	CatalogRevision int64      `json:"catalog_revision"`
	CatalogHash     string     `json:"catalog_hash"` // schema.Catalog.ContentHash
	Profile         string     `json:"profile"`      // profile name
	Samples         int        `json:"samples"`
	Seed            uint64     `json:"seed"`
	TopK            int        `json:"top_k"` // k of P(rank ≤ k)
	GOARCH          string     `json:"goarch"`
	Targets         []Target   `json:"targets"`            // best first (by median rank, then median score, then name)
	Excluded        []Excluded `json:"excluded,omitempty"` // moons not ranked, with the reason
	Warnings        []string   `json:"warnings,omitempty"` // problems that did not stop the ranking

	// Not part of the JSON document: context for exporters.
	ProfileTOML string          `json:"-"` // the profile in full, as TOML
	Revision    schema.Revision `json:"-"`
}

// Target is one ranked moon.
type Target struct {
	Name          string    `json:"name"`
	Planet        string    `json:"planet"`
	Star          string    `json:"star"`
	Rank          float64   `json:"rank"` // median rank over samples (1 = best)
	RankP05       float64   `json:"rank_p05"`
	RankP95       float64   `json:"rank_p95"`
	PTop          PTop      `json:"p_top"`
	Score         Quantiles `json:"score"`
	ScoreMedianSE float64   `json:"score_p50_se"` // Monte Carlo standard error of the score median
	// AssumedInputs lists, in key order, the catalog keys (schema.LookupKey)
	// that the catalog lacked for this target and a profile prior filled in:
	// the inputs the target's ranking rests on instead of a measurement. It
	// is never nil (an empty list when every catalog input was given). Model
	// parameters that only a profile sets, such as the rock end member's
	// density (profile.RockDensityKey), are the same assumption for every
	// target and are not missing data, so they are left out here; they stay
	// in Inputs (status assumed) and Priors, where the method is described.
	AssumedInputs []string           `json:"assumed_inputs"`
	Drivers       []Driver           `json:"drivers"` // largest share first
	Metrics       Metrics            `json:"metrics"`
	Flags         map[string]float64 `json:"flags,omitempty"` // physics validity flag → fraction of samples that raised it
	Notes         []string           `json:"notes,omitempty"` // e.g. a metric the model could not compute in some samples
	Inputs        []schema.Param     `json:"-"`               // every input used, measured or assumed, for exporters
	Priors        map[string]string  `json:"-"`               // key → description of the prior of every input taken from the profile: AssumedInputs and model parameters
}

// Excluded is a moon left out of the ranking because a required input is
// missing from the catalog and has no prior in the profile.
type Excluded struct {
	Name    string   `json:"name"`
	Planet  string   `json:"planet"`
	Missing []string `json:"missing"`
}

// PTop is the probability that a target ranks in the top K.
type PTop struct {
	K int     `json:"k"`
	P float64 `json:"p"`
}

// Quantiles summarises a distribution by its 5th, 50th and 95th percentiles.
type Quantiles struct {
	P05 float64 `json:"p05"`
	P50 float64 `json:"p50"`
	P95 float64 `json:"p95"`
}

// Driver is an uncertain input's first-order share of a target's score variance.
type Driver struct {
	Input string  `json:"input"`
	Share float64 `json:"share"`
}

// Metrics holds the quantiles of every derived quantity of a target, in SI units.
type Metrics struct {
	TidalPower          Quantiles          `json:"tidal_power_w"`
	RadiogenicPower     Quantiles          `json:"radiogenic_power_w"`
	HeatFlux            Quantiles          `json:"heat_flux_w_m2"`
	TidalForce          Quantiles          `json:"tidal_force_n"`
	SurfaceTemperature  Quantiles          `json:"surface_temperature_k"`
	EscapeVelocity      Quantiles          `json:"escape_velocity_m_s"`
	WaterLayerThickness Quantiles          `json:"water_layer_thickness_m"`
	IceShellThickness   Quantiles          `json:"ice_shell_thickness_m"`
	OceanProbability    float64            `json:"ocean_probability"`
	OceanProbabilitySE  float64            `json:"ocean_probability_se"` // binomial Monte Carlo standard error
	Retention           map[string]float64 `json:"retention"`            // volatile formula → P(retained)
}
