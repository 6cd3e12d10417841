// Package plan answers a study's first question before any rating: how
// many events must the panel rate, with how many raters, to know the
// sensitivity and specificity of an operating point within ±X, and what
// does it cost in rater-hours.
//
// From the candidate strata (sizes and a prior prevalence per stratum, or
// the panel's phase-1 estimates), an allocation, a design effect and an
// expected kappa, Run predicts for each total sample size the expected
// number of IEDs drawn, the 95 % half-widths of the design-weighted
// sensitivity and specificity, the error rate of the panel's majority
// reference and the rater-hours. References: Cochran (1977) Sampling
// Techniques, 3rd ed., §§5.5, 6.11; Kish (1965) Survey Sampling, §8.2
// (design effect); Dawid & Skene (1979), Appl Stat 28:20–28 (raters
// with errors independent given the truth).
package plan
