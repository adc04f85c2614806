// Package votable reads one table from an IVOA VOTable document, versions 1.3
// to 1.5 (IVOA Recommendation "VOTable Format Definition": 1.3 of 2013-09-20,
// 1.4 of 2019-10-21, which this reader follows, and 1.5 of
// 2025-01-16).
// It streams: it holds one row at a time, whatever the size of the document,
// and hands the importers package a neutral table (tidesift/importers/table)
// whose columns carry each FIELD's name, unit, UCD, datatype and description.
//
//	rd, err := votable.NewReader(f, votable.Options{Table: "moons"})
//	if err != nil { ... }
//	for _, c := range rd.Columns() {
//		fmt.Println(c.Name, c.Unit, c.UCD) // mass kg phys.mass
//	}
//	for {
//		cells, tr, err := rd.Next()
//		if err == io.EOF {
//			break
//		}
//		...
//	}
//	for _, w := range rd.Warnings() { ... } // e.g. several tables, first one read
//
// # What is read
//
// Elements are matched by local name, so any namespace (or none) is accepted.
// RESOURCEs may nest; each TABLE's FIELDs give the columns (name, else ID;
// unit; ucd; datatype; arraysize; the null attribute of VALUES; the
// DESCRIPTION). PARAM, GROUP, INFO, LINK and COOSYS are passed over.
//
// Data may be TABLEDATA (TR/TD) or BINARY2 or BINARY with an embedded
// STREAM encoding="base64". The binary forms decode boolean, bit,
// unsignedByte, short, int, long, float, double, floatComplex,
// doubleComplex, char and unicodeChar, with a fixed or variable ("*")
// arraysize; array values become space-separated text, as TABLEDATA writes
// them. The FITS serialisation is refused as not supported, and a STREAM with
// an href is refused: tidesift does not fetch data a file points to.
//
// # Rows and missing values
//
// The row number of Next is the 1-based TR index (TABLEDATA) or row index
// (binary). A cell is "" (missing) for an empty TD, a value equal to the
// FIELD's VALUES null, a NaN in a floating-point field, and a BINARY2 row
// whose null flag is set for the field.
//
// # Several tables
//
// Options.Table selects a table by name, else by ID, else by 1-based position.
// By default the first TABLE is read, and once the reader reaches the end of
// the document Warnings says that there were others and lists them; Tables
// lists a document's tables without reading rows. An Options.Table that
// matches nothing is an error that lists the tables present.
//
// # Hostile input
//
// A DOCTYPE or ENTITY declaration (any <!... other than a comment or CDATA) is
// refused at its first bytes; the XML decoder is strict; any single piece of
// markup (a text, a tag, a comment, a CDATA section) longer than
// Options.MaxToken (1 MiB), and elements nested deeper than Options.MaxDepth
// (64), are refused before they are buffered. Base64 STREAM content is read
// in a streaming way and is bounded only by the size of each value.
package votable
