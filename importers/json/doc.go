// Package json reads a table of moons from JSON: either one array of objects
// or a stream of objects, usually one per line (NDJSON). Each object is a row;
// its keys are the same header strings as the canonical CSV layout
// ("name", "mass [kg]", "mass_err [kg]", ...), and its values are numbers,
// strings or null. The reader only parses: it hands the importers package a
// neutral table (see tidesift/importers/table), which maps the columns, converts
// units and validates.
//
//	[
//	  {"name": "Vasha b I", "planet": "Vasha b", "mass [kg]": 1.2e22, "mass_err [kg]": 3e20},
//	  {"name": "Vasha b II", "planet": "Vasha b", "mass [kg]": null}
//	]
//
// or, the same table as NDJSON:
//
//	{"name": "Vasha b I", "planet": "Vasha b", "mass [kg]": 1.2e22, "mass_err [kg]": 3e20}
//	{"name": "Vasha b II", "planet": "Vasha b", "mass [kg]": null}
//
// Reading it:
//
//	r, err := json.NewReader(f, json.Options{})
//	if err != nil { ... }
//	for {
//		cells, row, err := r.Next()
//		if err == io.EOF {
//			break
//		}
//		...
//	}
//
// # Cells
//
// A number is passed on as written in the file (1.2e22 stays "1.2e22", so no
// precision is lost before unit conversion); a string as its text; null, or a
// key absent from an object, as "" (missing). true and false become "true" and
// "false", which the importers reject where a number is needed. A nested object
// or array as a value is an error naming the element and the key.
//
// # Columns
//
// The columns are the union of the keys, in order of first appearance, so
// later objects may carry keys the first one lacks. To know them before the
// first row, the reader scans the input once: a seekable input (a regular
// file) is then rewound; any other (a pipe, or the buffered reader the
// importers pass) is copied to a temporary file during that scan and the rows
// are read from the copy, which Close (or the end of Next) removes. Memory
// holds one element at a time either way. With Options.NoPrescan the columns
// are the keys of the first object and nothing is copied; a later object
// with a key the first one lacks is then an error naming the element and the
// key.
//
// # Row numbers
//
// For an array, the row number is the 1-based index of the element; for a
// stream of objects, it is the 1-based line on which the object starts. Errors
// name both where they can.
//
// # Limits
//
// Hostile or broken files are refused with a *LimitError before they can use
// unbounded memory: nesting deeper than Options.MaxDepth (64), a string longer
// than Options.MaxString (1 MiB) or one element larger than
// Options.MaxElement (16 MiB). The whole file may be arbitrarily large: only one
// element is held at a time.
package json
