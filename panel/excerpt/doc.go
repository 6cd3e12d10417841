// Package excerpt cuts, for each drawn event, what a rater will see: the rated window of
// the recording centred on the event with a few seconds of context either side
// (referential traces of a common electrode set, at the recorded rate with only the mean
// removed, so the review page applies and states the display filters itself; rates above
// 512 Hz are decimated by a stated whole factor) and the scalp voltage map at the event's
// peak, from the study's filters, interpolated with spherical splines (Perrin et al.
// 1989). Nothing that identifies the patient or the recording is carried into an item;
// provenance goes to the coordinator's key only.
package excerpt
