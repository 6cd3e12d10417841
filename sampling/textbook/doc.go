// Package textbook is a second synthetic EEG generator, built independently of
// sampling/synth so that the candidate finder and the criterion features,
// designed on synth, can be measured on recordings they were not designed on.
//
// Waveforms follow the published descriptions of the trade (IFCN glossary,
// Kane et al. 2017; Schomer & Lopes da Silva, Niedermeyer's
// Electroencephalography, 7th ed. 2018; from memory): spikes, sharp waves,
// spike-and-slow-wave complexes, polyspikes; benign variants; artefacts. The
// background is a sum of cortical dipoles driven by damped resonators, seen
// through a four-shell sphere (brain, CSF, skull, scalp) in the Berg & Scherg
// (1994) approximation — a different construction and forward model from
// synth's. Truth rows use synth.Event, so evaluation code reads both.
//
// GENERATOR.md describes every kind, its parameters and why it meets or fails
// each IFCN criterion.
//
// Research and quality tool, not a diagnostic device; the recordings are
// fictional.
package textbook
