package agreement

import "math"

// KrippendorffAlphaNominal returns Krippendorff's alpha for nominal data by the
// coincidence-matrix method (Krippendorff 2011, "Computing Krippendorff's
// Alpha-Reliability", Univ. Pennsylvania ASC paper 43, section C):
//
//	o_ck = Σ_u Σ_{i≠i'} [v_iu=c][v_i'u=k] / (m_u − 1),  n_c = Σ_k o_ck,  n = Σ_c n_c,
//	α = 1 − (n − 1) (n − Σ_c o_cc) / (n² − Σ_c n_c²).
//
// Only pairable units (m_u ≥ 2 answers) enter; Missing cells simply reduce
// m_u. Each unit contributes m_u pairable values however many raters
// answered it, and the n − 1 factor is the small-sample correction of
// expected disagreement. With weights (nil = 1), unit u's contributions are
// multiplied by w_u, so integer weights equal repeated units. It returns NaN
// when there are no pairable values or only one category occurs.
func KrippendorffAlphaNominal(c *Counts, weights []float64) float64 {
	t := c.Totals(weights)
	return t.KrippendorffAlphaNominal()
}

// KrippendorffAlphaNominal returns alpha from the totals; see the package
// function.
func (t *Totals) KrippendorffAlphaNominal() float64 {
	var n, sq float64
	for _, v := range t.Values {
		n += v
		sq += v * v
	}
	den := n*n - sq
	if n == 0 || den <= 0 {
		return math.NaN()
	}
	return 1 - (n-1)*(n-t.Coincide)/den
}
