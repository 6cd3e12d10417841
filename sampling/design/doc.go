// Package design estimates population quantities from a stratified sample
// with known inclusion probabilities: Horvitz–Thompson totals, the
// stratified mean, combined ratio estimators (sensitivity, specificity,
// PPV, prevalence, rates) with linearised variances, and a stratified
// bootstrap.
//
// References: Horvitz & Thompson (1952), J. Am. Stat. Assoc. 47:663–685;
// Cochran (1977) Sampling Techniques, 3rd ed., Wiley, chapters 5–6;
// Särndal, Swensson & Wretman (1992) Model Assisted Survey Sampling,
// Springer; Rao & Wu (1988), J. Am. Stat. Assoc. 83:231–241; Rao, Wu & Yue
// (1992), Survey Methodology 18:209–217.
package design
