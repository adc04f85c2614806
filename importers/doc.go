// Package importers turns a table file into catalog records in SI units:
// it detects the format, maps the columns onto canonical keys, converts units
// and validates every value, or says exactly what is wrong and where.
//
//	res, err := importers.ReadFile("moons.csv", importers.Options{})
//	if err != nil {
//		// an *ErrorList: one *ParseError per problem, each naming the file,
//		// row, column, value and what was expected
//	}
//	// res.Records → store.Import; res.SHA256 identifies the file's bytes
//
// # The canonical layout
//
// One row per moon. A header is "key [unit]" (schema.Keys lists the keys and
// their SI units; units.Parse the spellings). Companions of a key hold its
// uncertainty, in the unit of the key unless they carry a "[unit]" of their
// own: key_err (symmetric σ), key_err_plus with key_err_minus (asymmetric, both
// as magnitudes), key_min with key_max (a range that must hold the value), or
// key_factor (×/÷, at least 1). One row gives one uncertainty form per value.
// key_source is the value's citation; source is the row's. The text columns
// are name, planet, star and alias (other names, separated by ';'). The tidal
// response may come as k2_q, or as k2 and q (stored as given; the ranking
// combines them). Header names are matched ignoring case.
//
//	name,planet,star,mass [earthMass],mass_err,radius [km],eccentricity,obliquity [deg],source
//	Nerith,Vorlan,Ossery,0.0136,0.0003,1790,0.0051,0.02,Invented survey A (2026)
//
// A column without a unit whose key has one (every key but eccentricity,
// k2_q, k2, q, bond_albedo and moment_of_inertia) is an error, never read as
// SI by default: give "key [unit]" or a unit in a map. Obliquity is stored in
// radians; write "obliquity [deg]" for degrees.
//
// # Missing values
//
// An empty cell, "--", "NaN", "null" and "N/A" (in any case) mean the value is
// missing: the record simply lacks that key, never holds zero. "Inf" and
// "-Inf", and numbers beyond the float64 range, are errors
// (schema.ErrNotFinite): an infinite measurement is a mistake, not a gap.
// A missing value with an uncertainty given beside it is an error.
//
// # Validation
//
// Every problem is collected, up to Options.MaxErrors (default 50), into an
// *ErrorList; its Error text lists them, with "... and N more" past the limit.
// Each is a *ParseError wrapping a sentinel (see errors.go) or a schema
// sentinel; test with errors.Is. Checked: unknown and duplicate columns,
// unknown units and units of the wrong dimension, missing units, text where a
// number belongs, non-finite numbers, values outside their key's physical
// domain (schema.KeyInfo.Check), negative uncertainties, min above max, a
// value outside its own range, a missing moon or planet name, a moon given
// twice in one file (both rows named), and a planet or star given different
// values (or a planet different stars) on two rows (both rows and values
// named).
//
// Import is all or nothing: with any problem Read returns no records. With
// Options.SkipInvalid the good rows are kept and each bad row becomes a Reject
// (its row, raw cells and reasons); WriteRejects writes them as a CSV report.
// Problems with the header or the map, and unreadable files (broken quoting,
// a row over 1 MiB), still fail the whole file. A moon repeated later in the
// file is a duplicate even when its first row was rejected: fix both.
//
// Names are stored in Unicode NFC, trimmed, with runs of white space
// collapsed; case is kept for display (the store matches case-insensitively).
//
// tidesift's own CSV output puts an apostrophe before text that a spreadsheet
// would run as a formula (a leading =, +, -, @, tab, CR or NUL). Reading a
// canonical CSV or TSV undoes exactly that: in a text column (name, planet,
// star, alias, source, key_source) "'=Kel" reads as "=Kel", while "'Ara" (an
// apostrophe before a letter) and two apostrophes before "=" are kept as
// written. A file read through a map keeps its text as written.
//
// # Column maps
//
// A foreign table (an archive download, a colleague's sheet) is read through
// a column map in TOML, loaded with LoadMap and passed as Options.Map;
// SuggestMap writes a starter map for a file. The syntax is tidesift's own:
//
//	# which table of a multi-table file (name or 1-based index), which sheet
//	table = "moons"
//	sheet = "Data"
//	# columns neither mapped nor canonical: "error" (default) or "ignore"
//	unknown_columns = "error"
//	ignore = ["Notes", "Flag"]
//
//	[constants]                # text that holds for every row
//	planet = "Vorlan"
//	star = "Ossery"
//	source = "Invented survey B (2026)"
//
//	[constant_values.planet_mass]   # a value for every row, in its own unit
//	value = 1.02
//	unit = "jupiterMass"
//	err = 0.01                      # or err_plus/err_minus, min/max, factor
//
//	[columns]                  # header as written → key, role, unit
//	"Sat"     = { key = "name" }
//	"M_sat"   = { key = "mass", unit = "Mgeo" }
//	"e_M_sat" = { key = "mass", role = "err" }      # in the unit of M_sat
//	"a (Mm)"  = { key = "semi_major_axis", unit = "Mm" }
//	"Albedo"  = { key = "bond_albedo" }
//
// Roles are value (the default), err, err_plus, err_minus, min, max, factor
// and source. A map unit overrides a unit the file declares. A map that names
// a column the file lacks, an unknown key, role or unit, or a misspelt field
// is an error with its line and column. testdata/foreign.map.toml is a full
// example.
//
// # Formats
//
// CSV and TSV are read by importers/csv; formats.go holds the one place
// where a format name becomes a table.Reader (detectFormat, openTable).
// The input is hashed (SHA-256) as it streams; no reader holds the whole file.
//
// # Memory
//
// Read keeps one Record per accepted row (about 1.5 KB for a dozen values,
// most of it schema.Param). ReadStream hands records to a callback instead
// and keeps only what the cross-row checks need (the duplicate check and the
// first value of each planet and star): about 83 bytes per row of a file
// with ten moons to a planet, so a million rows hold roughly 80 MiB live
// (BenchmarkStreamHeap measures it). The duplicate check keeps hashes, not
// names (see keySet for the odds of a false alarm). Records never share
// memory with the lines they came from.
package importers
