package agreement

import "math"

// GwetAC1 returns Gwet's first-order agreement coefficient for many raters,
//
//	AC1 = (p_a − p_e) / (1 − p_e),  p_e = Σ_k π_k(1 − π_k) / (K − 1),
//
// with p_a and π_k as in FleissKappa (Gwet 2008, "Computing inter-rater
// reliability and its variance in the presence of high agreement", Br. J.
// Math. Stat. Psychol. 61:29–48, eqs. 14–15; missing ratings handled as in
// Gwet 2014, Handbook of Inter-Rater Reliability, 4th ed.). K is the number of
// categories declared for the table, used or not, as Gwet prescribes; for
// present/absent criteria K = 2. Unlike kappa it stays stable when one
// category is rare, the usual case for IEDs. weights may be nil. It returns
// NaN when no item has two answers.
func GwetAC1(c *Counts, weights []float64) float64 {
	t := c.Totals(weights)
	return t.GwetAC1()
}

// GwetAC1 returns Gwet's AC1 from the totals; see the package function.
func (t *Totals) GwetAC1() float64 {
	if t.Rated == 0 || t.K < 2 {
		return math.NaN()
	}
	var pe float64
	for _, s := range t.Share {
		p := s / t.Rated
		pe += p * (1 - p)
	}
	pe /= float64(t.K - 1)
	return chanceCorrect(t.ObservedAgreement(), pe)
}
