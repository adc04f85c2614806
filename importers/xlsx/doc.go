// Package xlsx reads a table of moons from one sheet of an Office Open XML
// workbook (.xlsx), as colleagues' spreadsheets arrive: often with a title
// block above the column names. It hands the importers package a neutral
// table (tidesift/importers/table); mapping, units and validation happen
// there.
//
//	rd, err := xlsx.NewReader(f, xlsx.Options{Sheet: "Moons"})
//	if err != nil { ... }
//	defer rd.Close()
//	for {
//		cells, row, err := rd.Next() // row: the sheet row number, as Excel shows it
//		if err == io.EOF {
//			break
//		}
//		...
//	}
//
// # Which rows
//
// The first sheet is read unless Options.Sheet names another (an exact match,
// else one that differs only in case). The header row is Options.HeaderRow,
// or else the first row, among the first 100, that has a cell "name" and at
// least two other cells that look like canonical column headers (a catalog
// key such as "mass [kg]" or "eccentricity", a companion such as
// "mass_err [kg]", or planet, star, source, alias); failing that, the first
// row with at least two non-empty cells, all of them text. Rows above the
// header (a title block) are ignored; so are empty rows anywhere below it. A
// value to the right of the last header cell is an error, since it has no
// column name.
//
// # Cells
//
// Cells are read as stored, not as displayed: a number formatted to show two
// decimals still yields every digit it holds (1.2345678E+22 stays that, not
// "1.23E+22"), and a formula yields its cached result. Text is trimmed.
//
// # Memory and hostile files
//
// The sheet is read with excelize's streaming row iterator, so the reader
// holds one row at a time. A workbook is a zip archive and needs random
// access: a regular *os.File is opened in place; any other reader is copied
// to a temporary file first. The archive's parts may unzip to at most
// Options.MaxUnzip bytes in all (256 MiB) and parts above Options.MaxUnzipXML
// (16 MiB) are unzipped to temporary files instead of memory; a workbook
// declaring more (a zip bomb) is refused with ErrTooLarge before anything is
// unzipped. The zip reader also refuses a part that unzips to more than it
// declares.
package xlsx
