// Package draw selects a stratified sample of candidate events with known
// first-order inclusion probabilities, so that every later estimate can be
// design-weighted (Horvitz & Thompson 1952; Cochran 1977, ch. 5).
//
// The design, per stratum h:
//
//  1. Optional per-subject cap c: a subject s holding N_sh > c units of the
//     stratum is thinned to a simple random subsample of c of them
//     (probability c/N_sh for each); the thinned stratum has the fixed size
//     N'_h = Σ_s min(N_sh, c).
//  2. A simple random sample without replacement of n_h units is taken from
//     the thinned stratum, n_h coming from an allocation on N'_h.
//
// Hence π_i = min(1, c/N_sh) · n_h/N'_h exactly, and the weight is 1/π_i.
// Thinning uses a random stream that depends only on the seed, so a later
// top-up phase (TopUp) sees the same thinned strata; two successive simple
// random samples without replacement (n1 from N', then n2 from N'−n1) are
// one simple random sample of n1+n2, so π = min(1, c/N_sh)·(n1+n2)/N'_h.
//
// Allocations: equal, proportional, Neyman, an explicit table, and
// Accuracy, the compromise Neyman allocation for sensitivity and
// specificity from a prior prevalence per stratum (AccuracyWeights). An
// adaptive top-up (TopUpAdaptive) allocates a later phase from the panel's
// returns; its weights are conditional two-phase weights, unbiased although
// the phase sizes depend on the returns. Every phase's allocation and reason
// is kept in design.json.
//
// Results are deterministic for a given population and seed whatever the
// order of the input rows: rows are sorted by ID before any random step and
// all randomness comes from math/rand/v2 PCG sources seeded explicitly.
package draw
