// Package tuning chooses a detector operating point from a rated sample: how
// many IFCN criteria (Kane et al. 2017, Clinical Neurophysiology Practice
// 2:170–185) an event must meet, which cutoffs the automatic features need,
// where to set the detector score, and how good the chosen point honestly is.
//
// Run takes plain values — one Event per rated candidate or control, with its
// design weight, features, panel majorities and reference standard — and
// returns a Result; it writes nothing (package export/report does).
//
// Two kinds of estimate are reported side by side. Unweighted figures describe
// the rated sample, with Wilson intervals (Newcombe 1998, Statistics in
// Medicine 17:857–872, method 3). Design-weighted figures project the sample
// to the archive with the design weights 1/π: combined ratio estimators with
// their stratified linearised variance (package sampling/design; Cochran 1977,
// Sampling Techniques, §6.11) and Wald intervals. Operating points are chosen
// on the design-weighted figures, because those describe the archive the
// detector will run on.
//
// Choosing a point on the same events it is judged on flatters it. The
// headline (OperatingPoint.Headline) is what to expect on new recordings:
// the optimism-corrected subject bootstrap (Harrell, Lee & Mark 1996),
// which repeats the whole selection in every replicate. The in-sample
// figures are optimistic; the subject-grouped cross-validation, which also
// repeats the selection, tends to be pessimistic with few subjects (each
// fold learns from fewer); the bootstrap of the final rule does not repeat
// the selection and is centred on the optimistic figure. All are reported,
// labelled so.
//
// The automatic rule "at least k criteria met at these cutoffs" is fitted
// with each cutoff fitted to its criterion's own panel majority and the
// detector score as a seventh vote fitted against the panel's IED verdict
// (MethodScoreVote, the default), with the six criteria alone
// (MethodCriterion), with each cutoff read off its feature's ROC against
// the panel's IED verdict (MethodVerdict), or by the joint search
// (MethodJoint); the report shows the joint search's honest figures beside
// the default's.
package tuning
