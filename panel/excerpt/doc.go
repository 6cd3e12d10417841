// Package excerpt cuts, for each drawn event, what a rater will see: a window of the
// recording centred on the event (referential traces of a common electrode set, filtered
// as for reading and decimated for size) and the scalp voltage map at the event's peak,
// interpolated with spherical splines (Perrin et al. 1989). Nothing that identifies the
// patient or the recording is carried into an item; provenance goes to the coordinator's
// key only.
package excerpt
