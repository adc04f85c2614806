// Package method holds tidesift's method text: every formula, constant and
// simplification of the physical models (package tidesift/rank/physics) and of
// the uncertainty and ranking procedure, each with its published source, and
// the caution that the scores are triage aids on simplified models that never
// replace expert review. The text is written once, in method.md, and printed by
// the CLI's methods command and the workbook's method sheet.
//
// Example:
//
//	fmt.Print(method.Text())            // the whole text
//	for _, s := range method.Sections() // or headed parts
//		fmt.Println(s.Title)
//
// The section "Uncertainty and ranking" describes the Monte Carlo design in
// outline. The engine states its exact procedure itself (rank.MethodText);
// WithUncertainty splices that text in place of the outline, so the methods
// command and the workbook print
//
//	method.WithUncertainty(rank.MethodText())
package method
