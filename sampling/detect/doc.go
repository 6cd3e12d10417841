// Package detect finds candidate sharp transients in EEG recordings and measures
// one feature per IFCN criterion for each (Kane et al. 2017, "A revised glossary
// of terms most commonly used by clinical electroencephalographers and updated
// proposal for the report format of the EEG findings. Revision 2017", Clin
// Neurophysiol Pract 2:170–185).
//
// The finder is deliberately liberal: it aims at high recall and leaves
// specificity to the rating panel and the tuner. A recording is conditioned
// (montage, zero-phase band-pass and notch) in overlapping windows, so memory
// does not grow with the recording's length; in each window every derivation's
// local extrema whose main-phase amplitude exceeds ThresholdMAD robust background
// scales, whose main phase lasts 20–200 ms and whose apex is more pointed than a
// rounded wave's, are detections; detections within ±MergeMS of each other on any
// channels are one event, anchored on the sharpest large one, and events within
// 500 ms of a stronger one are phases of its discharge and reported once, at the
// discharge's main phase (find.go, complexes). Rows are written as each window is
// measured. Each event then gets the
// six criterion features (see FEATURES.md, one file c1.go … c6.go per criterion;
// c3 reads the event's virtual channel, virtual.go), the yes/no of each at its
// cutoff, their count and a ranking score. A recording's sleep-stage annotations
// give each row its vigilance state and keep c2's background spectrum to it.
//
// Run processes an archive's recordings in parallel and writes one Parquet table
// (candidate.Row) per recording; MeasureAt measures the same features at given
// times, for events imported from another detector.
package detect
