// Package design estimates population quantities from a stratified sample
// with known inclusion probabilities: Horvitz–Thompson totals, the
// stratified mean, combined ratio estimators (sensitivity, specificity,
// PPV, prevalence, rates) with linearised variances, and a stratified
// bootstrap. With Sample.Cluster set (the subject of each event) the
// linearised variances treat subjects as primary sampling units
// (with-replacement ultimate-cluster estimator, strata sharing a subject
// collapsed) and carry the design degrees of freedom #PSU − #strata for t
// intervals and Korn–Graubard effective sample sizes; the bootstrap still
// resamples events within strata.
//
// References: Horvitz & Thompson (1952), J. Am. Stat. Assoc. 47:663–685;
// Cochran (1977) Sampling Techniques, 3rd ed., Wiley, chapters 5–6;
// Särndal, Swensson & Wretman (1992) Model Assisted Survey Sampling,
// Springer; Rao & Wu (1988), J. Am. Stat. Assoc. 83:231–241; Rao, Wu & Yue
// (1992), Survey Methodology 18:209–217; Korn & Graubard (1998), Survey
// Methodology 24:193–201; Korn & Graubard (1999) Analysis of Health
// Surveys, Wiley; Wolter (2007) Introduction to Variance Estimation, 2nd
// ed., Springer.
package design
