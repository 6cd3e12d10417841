package accuracy

import "math"

// Confusion holds the (possibly design-weighted) counts of a 2×2 table of a
// binary decision against a reference standard.
type Confusion struct {
	TP, FP, TN, FN float64
}

// ratio returns num/den, or NaN when den is zero: a rate over an empty
// reference class is undefined, not zero.
func ratio(num, den float64) float64 {
	if den == 0 {
		return math.NaN()
	}
	return num / den
}

// Positives returns TP+FN, the weight of reference-positive events.
func (c Confusion) Positives() float64 { return c.TP + c.FN }

// Negatives returns TN+FP, the weight of reference-negative events.
func (c Confusion) Negatives() float64 { return c.TN + c.FP }

// Total returns the total weight TP+FP+TN+FN.
func (c Confusion) Total() float64 { return c.TP + c.FP + c.TN + c.FN }

// Prevalence returns (TP+FN)/N, or NaN when N is zero.
func (c Confusion) Prevalence() float64 { return ratio(c.Positives(), c.Total()) }

// Sensitivity returns TP/(TP+FN), or NaN when there are no reference
// positives.
func (c Confusion) Sensitivity() float64 { return ratio(c.TP, c.TP+c.FN) }

// Specificity returns TN/(TN+FP), or NaN when there are no reference
// negatives.
func (c Confusion) Specificity() float64 { return ratio(c.TN, c.TN+c.FP) }

// PPV returns the positive predictive value TP/(TP+FP), or NaN when nothing
// was called positive.
func (c Confusion) PPV() float64 { return ratio(c.TP, c.TP+c.FP) }

// NPV returns the negative predictive value TN/(TN+FN), or NaN when nothing
// was called negative.
func (c Confusion) NPV() float64 { return ratio(c.TN, c.TN+c.FN) }

// Accuracy returns (TP+TN)/N, or NaN when N is zero.
func (c Confusion) Accuracy() float64 { return ratio(c.TP+c.TN, c.Total()) }

// Youden returns Youden's J = sensitivity + specificity − 1
// (Youden 1950, Cancer 3:32–35). It is NaN when either rate is undefined.
func (c Confusion) Youden() float64 { return c.Sensitivity() + c.Specificity() - 1 }

// LRPos returns the positive likelihood ratio sens/(1−spec).
//
// When 1−spec is zero (no false positives) the ratio is +Inf if sensitivity
// is positive and NaN if sensitivity is also zero (0/0); it is NaN whenever
// sensitivity or specificity is undefined.
func (c Confusion) LRPos() float64 {
	return likelihoodRatio(c.Sensitivity(), 1-c.Specificity())
}

// LRNeg returns the negative likelihood ratio (1−sens)/spec.
//
// When specificity is zero the ratio is +Inf if 1−sens is positive and NaN
// if it is also zero (0/0); it is NaN whenever sensitivity or specificity is
// undefined.
func (c Confusion) LRNeg() float64 {
	return likelihoodRatio(1-c.Sensitivity(), c.Specificity())
}

func likelihoodRatio(num, den float64) float64 {
	switch {
	case math.IsNaN(num) || math.IsNaN(den):
		return math.NaN()
	case den == 0 && num == 0:
		return math.NaN()
	case den == 0:
		return math.Inf(1)
	}
	return num / den
}

// Tally counts decisions pred against reference truth. Event i contributes
// weights[i] to one cell; nil weights count every event once.
//
// Tally panics if the slices differ in length or a weight is negative.
func Tally(pred, truth []bool, weights []float64) Confusion {
	if len(pred) != len(truth) {
		panic("accuracy: pred and truth length mismatch")
	}
	checkWeights(weights, len(truth))
	var c Confusion
	for i, p := range pred {
		w := 1.0
		if weights != nil {
			w = weights[i]
		}
		c.add(p, truth[i], w)
	}
	return c
}

func (c *Confusion) add(pred, truth bool, w float64) {
	switch {
	case pred && truth:
		c.TP += w
	case pred:
		c.FP += w
	case truth:
		c.FN += w
	default:
		c.TN += w
	}
}

// checkWeights panics on a weight slice that cannot be design weights.
func checkWeights(weights []float64, n int) {
	if weights == nil {
		return
	}
	if len(weights) != n {
		panic("accuracy: weights length mismatch")
	}
	for _, w := range weights {
		if !(w >= 0) || math.IsInf(w, 1) {
			panic("accuracy: weights must be finite and non-negative")
		}
	}
}
