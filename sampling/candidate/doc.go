// Package candidate is the candidate-event table: one row per sharp transient found in
// (or imported into) the archive, with one measured feature per IFCN criterion (Kane et
// al. 2017), the yes/no of each criterion at its cutoff, and a ranking score. It is the
// hand-over between detection, the draw, the tuner and the export.
package candidate
