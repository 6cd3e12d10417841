// Package simulate is a simulated rating panel: fictional raters who answer each item's
// six IFCN criteria and overall verdict from a known truth through a profile of their
// own. The demo and the tests use it to check that consensus, agreement statistics and
// the Dawid–Skene model recover what was put in.
//
// The model, per rater and item:
//   - with probability Lapse the rater answers at random (a moment of inattention);
//   - otherwise criterion c is answered "present" with probability Sens[c] when the item
//     meets it and 1−Spec[c] when it does not;
//   - the overall verdict is, with probability Gestalt, the rater's overall recognition
//     of the event (epileptiform for a true IED: experts judge the whole event, not only
//     a tally) and otherwise "epileptiform" when the rater's own count of present
//     criteria reaches the rater's threshold (4 of 6, Kane et al. 2017; Kural et al.
//     2020); either is flipped with probability VerdictFlip;
//   - a hurried rater lets one overall impression drive every answer: with probability
//     Halo all six criteria copy the impression (present for a true IED);
//   - on a hidden duplicate, the rater repeats the first answers with probability
//     Consistency and answers afresh otherwise.
//
// All raters are invented; their names say so.
package simulate
