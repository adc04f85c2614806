// Package export writes a ranking result (a *rank.Result) for people and for
// scripts: a terminal table, CSV, the JSON contract document and a workbook
// for review panels. It reads the Result only: it never opens the catalog and
// never recomputes a physical quantity, so every number it shows is one the
// ranking produced.
//
// # Writers
//
//   - WriteTable: the plain-text table of `tidesift rank` (text/tabwriter, no
//     colours, stable for goldens), with a footer giving the samples, seed,
//     profile and catalog revision and the caution that the scores are a triage
//     aid on simplified models.
//   - WriteCSV: one row per target, every quantile as its own numeric column.
//   - WriteJSON: the machine-readable ranking document (the JSON tags of
//     rank.Result), indented; a non-finite number is written as null.
//   - WriteWorkbook / SaveWorkbook: the review workbook with the sheets
//     Ranking, Derived, Inputs, Drivers, Changes (when WorkbookInfo.Changes is
//     set) and Method. WorkbookInfo carries what the Result does not: the
//     method text, the tidesift version, the creation time and the changes
//     since an earlier revision (Changes, built by the caller from the
//     store's diff and an earlier ranking).
//   - FormatRange: a median with its 5–95 % range as readable text.
//
// # The workbook
//
// Data sheets are written with excelize's stream writer, so memory stays
// bounded: 10,000 targets take about 3.5 s and 170 MiB on two cores (see
// BenchmarkWorkbook10k). Every data sheet has a frozen, wrapped header row,
// an autofilter, column widths measured from the content and number formats
// per unit (0.00E+00 for powers, fluxes and forces, 0.0 for kelvin, #,##0
// for metres and m/s, 0.000 for probabilities and scores). Ranges appear
// both as text and as numeric p05/p50/p95 columns; NaN and ±Inf are empty
// cells. The Ranking sheet has data bars on the score median and, beside the
// table, a high-low-close chart of the best ChartTargets targets' score
// medians with their 5–95 % ranges (the library draws no error bars). A
// sheet that would pass the 1,048,576-row limit keeps what fits and says so.
// The output is not byte-identical between runs: test it by reading it back.
//
// # Safety
//
// A text cell that a spreadsheet would read as a formula (one beginning with
// '=', '+', '-', '@', a tab, a carriage return or NUL) is written with a
// leading apostrophe, in CSV and in the workbook alike; numeric cells are never
// altered. Workbook text is always written as a string cell, never as a
// formula.
//
// # Example
//
//	res, err := rank.Run(catalog, profile, opts)
//	if err != nil { ... }
//	_ = export.WriteTable(os.Stdout, res, export.TableOptions{Top: 20})
//	err = export.SaveWorkbook("panel.xlsx", res, export.WorkbookInfo{
//		Method:  methodText,
//		Version: version,
//		Created: time.Now(),
//	})
//
// FormatRange(rank.Quantiles{P05: 75e12, P50: 93e12, P95: 112e12}, "W")
// returns "93 (75–112) TW".
package export
