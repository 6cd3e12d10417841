// Package consensus turns a panel's ratings into the gold standard: per event and per
// criterion the votes and the majority decision, the number of criteria the majority
// found present, and the panel's overall verdict.
//
// A decision is a strict majority of the raters who answered (panels decide by majority;
// Kural et al. 2020 used the majority of seven raters). With fewer answers than the
// quorum there is no decision. A tie — possible with an even number of answers — counts
// as absent, present or undetermined, as the study's tie policy says.
//
// "Cannot judge" (FORMAT.md of package returns) is an abstention: it reaches a Rating as
// a nil answer, so that rater counts toward neither side of that question's majority nor
// toward its quorum. The agreement statistics treat it as a missing value
// (agreement.Missing in the rater-by-item table): observed agreement, Fleiss' kappa and
// Gwet's AC1 are computed from the answers given, and Krippendorff's alpha handles
// missing values by construction (Krippendorff 2011, "Computing
// Krippendorff's alpha-reliability", §C). An event where abstentions leave fewer answers
// than the quorum gets no decision ("no-quorum").
package consensus
