package accuracy

import (
	"cmp"
	"math"
	"slices"
)

// Counts returns the confusion counts of the rule "score ≥ threshold" at
// every threshold of ROC's convention: +Inf first, then each distinct score
// in decreasing order. Counts are running sums of the (weighted) events, so
// they are exact where rates from ROC, multiplied back by class totals,
// carry rounding error; use Counts to build operating points.
//
// Nil weights count each event once. Counts panics on mismatched lengths,
// negative weights or NaN scores.
func Counts(scores []float64, truth []bool, weights []float64) (thresholds []float64, counts []Confusion) {
	if len(scores) != len(truth) {
		panic("accuracy: scores and truth length mismatch")
	}
	checkWeights(weights, len(scores))
	idx := make([]int, len(scores))
	var pos, neg float64
	for i := range idx {
		if math.IsNaN(scores[i]) {
			panic("accuracy: NaN score")
		}
		idx[i] = i
		if truth[i] {
			pos += weight(weights, i)
		} else {
			neg += weight(weights, i)
		}
	}
	slices.SortFunc(idx, func(a, b int) int { return cmp.Compare(scores[b], scores[a]) })
	thresholds = []float64{math.Inf(1)}
	counts = []Confusion{{FN: pos, TN: neg}}
	var tp, fp float64
	for k := 0; k < len(idx); {
		s := scores[idx[k]]
		for ; k < len(idx) && scores[idx[k]] == s; k++ {
			if truth[idx[k]] {
				tp += weight(weights, idx[k])
			} else {
				fp += weight(weights, idx[k])
			}
		}
		thresholds = append(thresholds, s)
		counts = append(counts, Confusion{TP: tp, FP: fp, FN: Remainder(pos, tp), TN: Remainder(neg, fp)})
	}
	return thresholds, counts
}

// Remainder returns total − part for a cell built by subtraction, such as
// FN = positives − TP: zero when the difference is below the rounding of
// summing the weights (≤ 1e-9·total) or negative. A weighted count is a sum
// of non-negative weights, so −2e-13 can only be rounding error, and a
// ratio over it (NPV over an empty "called negative" set) must come out
// undefined, not 1.33 or −2.
func Remainder(total, part float64) float64 {
	d := total - part
	if d <= 1e-9*math.Abs(total) {
		return 0
	}
	return d
}

// Points turns Counts output into operating points for Choose; hours is
// the recording time the events were drawn from (see NewPoint).
func Points(thresholds []float64, counts []Confusion, hours float64) []Point {
	if len(thresholds) != len(counts) {
		panic("accuracy: thresholds and counts length mismatch")
	}
	pts := make([]Point, len(counts))
	for i, c := range counts {
		pts[i] = NewPoint(thresholds[i], c, hours)
	}
	return pts
}

func weight(weights []float64, i int) float64 {
	if weights == nil {
		return 1
	}
	return weights[i]
}
