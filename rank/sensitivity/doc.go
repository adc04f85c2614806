// Package sensitivity estimates first-order variance-based sensitivity
// indices from Monte Carlo samples already drawn — no extra model runs.
//
// The first-order (Sobol') index of input Xᵢ on output Y is
// Sᵢ = V(E[Y | Xᵢ]) / V(Y): the share of Y's variance that fixing Xᵢ would
// remove on average. The given-data estimator partitions the range of Xᵢ into
// M classes of (nearly) equal probability, and estimates V(E[Y | Xᵢ]) by the
// between-class variance of the class means of Y:
//
//	Ŝᵢ = Σₘ (nₘ/n)(ȳₘ − ȳ)² / V̂(Y)
//
// This is the "scatterplot partitioning" / binning estimator of Plischke,
// Borgonovo & Smith (2013, Eur. J. Oper. Res. 226, 536–550, eq. 19), which is
// Pearson's correlation ratio η² of Y on the classes of Xᵢ. Its bias is of
// order (M − 1)/n: positive from noise in the class means, negative from
// averaging E[Y | Xᵢ] within a class. The noise part is removed with Kelley's
// (1935) adjustment of the correlation ratio, so an input that does not matter
// gets a share near 0 rather than near (M − 1)/n; ClassCount sets M.
//
// The engine streams: it fixes a Partition of each input's range from its
// distribution (equal-width classes between the 0.5 % and 99.5 % quantiles,
// on a log scale for log-normal and log-uniform inputs), adds (xᵢ, y) pairs to
// an Accumulator per input as samples are evaluated, and reads the index at
// the end (Accumulator.Index). FirstOrder works from stored samples instead,
// ranking x to form classes of equal size.
//
//	s := sensitivity.FirstOrder(x1, y, sensitivity.ClassCount(len(y)))
package sensitivity
