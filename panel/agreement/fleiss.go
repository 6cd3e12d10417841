package agreement

import "math"

// FleissKappa returns Fleiss' kappa for many raters,
//
//	κ = (p_a − p_e) / (1 − p_e),  p_e = Σ_k π_k²,  π_k = Σ_i w_i n_ik/n_i / Σ_i w_i,
//
// with p_a the ObservedAgreement (Fleiss 1971, "Measuring nominal scale
// agreement among many raters", Psychol. Bull. 76:378–382, eqs. 2–5).
//
// Unequal numbers of raters per item (Missing cells) follow Gwet (2014,
// Handbook of Inter-Rater Reliability, 4th ed., ch. 2): p_a averages over
// items with n_i ≥ 2, while π_k averages each item's category shares n_ik/n_i
// over all items with n_i ≥ 1. With a constant n_i this is Fleiss' formula
// exactly. Ties need no rule: raters are exchangeable. weights may be nil.
// It returns NaN when p_e = 1 or no item has two answers.
func FleissKappa(c *Counts, weights []float64) float64 {
	t := c.Totals(weights)
	return t.FleissKappa()
}

// FleissKappa returns Fleiss' kappa from the totals; see the package function.
func (t *Totals) FleissKappa() float64 {
	if t.Rated == 0 {
		return math.NaN()
	}
	var pe float64
	for _, s := range t.Share {
		p := s / t.Rated
		pe += p * p
	}
	return chanceCorrect(t.ObservedAgreement(), pe)
}
