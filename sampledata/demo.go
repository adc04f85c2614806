package sampledata

import _ "embed"

// DemoFileName is the file name under which the demo catalog is imported, so a
// revision made from it reads as the demo in `tidesift revisions`.
const DemoFileName = "tidesift-demo.csv"

//go:embed demo.csv
var demoCSV []byte

// DemoCatalog returns the invented demo catalog in the canonical CSV layout.
// The caller owns the returned slice.
func DemoCatalog() []byte {
	return append([]byte(nil), demoCSV...)
}
