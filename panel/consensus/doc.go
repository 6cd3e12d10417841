// Package consensus turns a panel's ratings into the gold standard: per event and per
// criterion the votes and the majority decision, the number of criteria the majority
// found present, and the panel's overall verdict.
//
// A decision is a strict majority of the raters who answered (panels decide by majority;
// Kural et al. 2020 used the majority of seven raters). With fewer answers than the
// quorum there is no decision. A tie — possible with an even number of answers — counts
// as absent, present or undetermined, as the study's tie policy says.
package consensus
