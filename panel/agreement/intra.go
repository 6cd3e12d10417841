package agreement

// IntraRater summarises one rater's consistency on hidden duplicates: first[i]
// and second[i] are the rater's two answers to the same item shown twice.
// po is the share of duplicates answered identically and kappa is
// CohenKappa(first, second), treating the two sittings as two raters (Fleiss,
// Levin & Paik 2003, ch. 18, on reliability from replicate ratings). Pairs
// with a Missing side are skipped; n is the number of pairs used. It panics
// if the slices differ in length.
func IntraRater(first, second []int) (po, kappa float64, n int) {
	if len(first) != len(second) {
		panic("agreement: slice length mismatch")
	}
	same := 0
	for i := range first {
		if first[i] == Missing || second[i] == Missing {
			continue
		}
		n++
		if first[i] == second[i] {
			same++
		}
	}
	return ratio(same, n), CohenKappa(first, second), n
}
