package agreement

import "math"

// CohenKappa returns Cohen's kappa for two raters' answers to the same items,
//
//	κ = (p_o − p_e) / (1 − p_e),  p_o = Σ_k p_kk,  p_e = Σ_k p_k· p_·k,
//
// where p_jk is the share of items rater a put in j and rater b in k (Cohen
// 1960, "A coefficient of agreement for nominal scales", Educ. Psychol.
// Meas. 20:37–46). Items where either side is Missing are skipped; the
// category set is whatever either rater used, since unused categories add
// nothing to p_o or p_e. It returns NaN when no item is rated by both or
// p_e = 1 (both raters constant in the same category). It panics if the
// slices differ in length.
func CohenKappa(a, b []int) float64 {
	if len(a) != len(b) {
		panic("agreement: slice length mismatch")
	}
	k := 0
	for i := range a {
		k = max(k, a[i]+1, b[i]+1)
	}
	if k == 0 {
		return math.NaN()
	}
	m := make([][]float64, k)
	for j := range m {
		m[j] = make([]float64, k)
	}
	for i := range a {
		if a[i] == Missing || b[i] == Missing {
			continue
		}
		m[a[i]][b[i]]++
	}
	return CohenKappaMatrix(m)
}

// CohenKappaMatrix returns Cohen's kappa from a square contingency table of
// counts or proportions, rows for one rater and columns for the other, as
// such tables are printed in Cohen (1960) and Fleiss, Levin & Paik (2003,
// Statistical Methods for Rates and Proportions, 3rd ed., ch. 18). It panics
// if m is not square.
func CohenKappaMatrix(m [][]float64) float64 {
	k := len(m)
	row := make([]float64, k)
	col := make([]float64, k)
	var total, diag float64
	for j := range m {
		if len(m[j]) != k {
			panic("agreement: contingency table not square")
		}
		for l, v := range m[j] {
			row[j] += v
			col[l] += v
			total += v
		}
		diag += m[j][j]
	}
	if total == 0 {
		return math.NaN()
	}
	var pe float64
	for j := range k {
		pe += row[j] * col[j]
	}
	pe /= total * total
	return chanceCorrect(diag/total, pe)
}

// PairwiseCohen returns the R×R matrix of CohenKappa between every pair of
// raters (columns) of t, each pair over the items both answered. The diagonal
// is 1 by convention.
func PairwiseCohen(t Table) [][]float64 {
	r := t.Raters()
	cols := make([][]int, r)
	for j := range cols {
		cols[j] = t.Column(j)
	}
	out := make([][]float64, r)
	for j := range out {
		out[j] = make([]float64, r)
		out[j][j] = 1
	}
	for j := range r {
		for l := j + 1; l < r; l++ {
			k := CohenKappa(cols[j], cols[l])
			out[j][l], out[l][j] = k, k
		}
	}
	return out
}
