package agreement

import "math"

// ObservedAgreement returns the mean pairwise agreement
//
//	p_a = Σ_i w_i P_i / Σ_i w_i,  P_i = Σ_k n_ik(n_ik−1) / (n_i(n_i−1)),
//
// the share of agreeing rater pairs within item i (Fleiss 1971, eq. 2),
// averaged over items answered by at least two raters; items with fewer
// answers are skipped, and Missing cells are not raters of that item.
// weights may be nil. It returns NaN when no item has two answers.
func ObservedAgreement(c *Counts, weights []float64) float64 {
	t := c.Totals(weights)
	return t.ObservedAgreement()
}

// ObservedAgreement returns p_a from the totals; see the package function.
func (t *Totals) ObservedAgreement() float64 {
	if t.Pairable == 0 {
		return math.NaN()
	}
	return t.Agree / t.Pairable
}

// chanceCorrect returns (pa−pe)/(1−pe), NaN when chance agreement is total.
func chanceCorrect(pa, pe float64) float64 {
	if pe >= 1 {
		return math.NaN()
	}
	return (pa - pe) / (1 - pe)
}
