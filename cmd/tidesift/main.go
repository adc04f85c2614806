// Command tidesift keeps a local catalog of candidate moons — every value with
// its uncertainty and source — derives tidal heating, volatile retention and
// ocean likelihood from it, propagates the uncertainties by Monte Carlo, and
// ranks the candidates under an explicit scoring profile.
//
// The scores are triage aids built on simplified models; they support, and never
// replace, expert review. Run `tidesift --help` for the commands and the exit
// statuses, and `tidesift demo` for a tour on an invented catalog.
package main

import "os"

func main() {
	os.Exit(run(os.Args[1:], stdStreams()))
}
