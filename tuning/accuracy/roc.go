package accuracy

import (
	"slices"

	"gonum.org/v1/gonum/stat"
)

// ROC returns the empirical ROC curve of scores against truth, with higher
// scores meaning "more likely positive". It wraps gonum's stat.ROC on sorted
// copies of the inputs, so the caller's slices are not reordered.
//
// Threshold convention (that of stat.ROC): thresholds is strictly
// decreasing, starts at +Inf and then lists each distinct score, and
// tpr[i], fpr[i] are the weighted fractions of reference positives and
// reference negatives with score ≥ thresholds[i]. The curve therefore runs
// from (0,0) at +Inf to (1,1) at the smallest score, and tied scores form a
// single diagonal step.
//
// Nil weights count each event once. ROC panics on mismatched lengths or
// negative weights and returns nil slices for empty input. If one class is
// absent its rate is NaN. The rates are 1 − (count below)/(class total) as
// stat.ROC forms them, so they carry rounding error; Counts gives the exact
// counts at the same thresholds.
func ROC(scores []float64, truth []bool, weights []float64) (tpr, fpr, thresholds []float64) {
	if len(scores) != len(truth) {
		panic("accuracy: scores and truth length mismatch")
	}
	checkWeights(weights, len(scores))
	y := slices.Clone(scores)
	c := slices.Clone(truth)
	w := slices.Clone(weights)
	stat.SortWeightedLabeled(y, c, w)
	return stat.ROC(nil, y, c, w)
}

// AUC returns the area under an ROC curve by the trapezoidal rule,
//
//	A = Σᵢ (fprᵢ − fprᵢ₋₁)(tprᵢ + tprᵢ₋₁)/2,
//
// for points ordered by fpr (either direction). On the empirical curve from
// ROC this equals the Mann–Whitney estimate P(X > Y) + ½P(X = Y), X a
// positive's score and Y a negative's, with design weights entering as
// products wᵢwⱼ (Hanley & McNeil 1982, Radiology 143:29–36); the ½ for ties
// is the diagonal step.
func AUC(tpr, fpr []float64) float64 {
	if len(tpr) != len(fpr) {
		panic("accuracy: tpr and fpr length mismatch")
	}
	var a float64
	for i := 1; i < len(tpr); i++ {
		a += (fpr[i] - fpr[i-1]) * (tpr[i] + tpr[i-1]) / 2
	}
	if a < 0 {
		a = -a
	}
	return a
}
