// Package accuracy measures how well a detector operating point agrees with
// a reference standard: confusion counts and their ratios, intervals for
// proportions, ROC curves and the area under them with its standard error,
// operating-point policies, k-of-n criterion rules, and subject-grouped
// resampling for honest tuning.
//
// Counts are float64 throughout so that design weights from a stratified
// draw (the inverse inclusion probabilities) can be carried into every
// estimate; unweighted use passes nil weights, which count each event once.
//
// Misuse that only a programmer can cause (slices of unequal length,
// negative weights) panics, as in gonum/stat; malformed user input (a policy
// string) and an unsatisfiable request (no operating point meets a policy)
// are reported as typed errors.
package accuracy
