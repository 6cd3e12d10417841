package agreement

// Totals are weighted sums over items of the per-item quantities shared by
// observed agreement, Fleiss' kappa, Gwet's AC1 and Krippendorff's alpha.
// Every field is a plain sum, so Totals of disjoint item sets add; the
// cluster bootstrap relies on this.
type Totals struct {
	K int

	// Rated is Σ w_i over items with n_i ≥ 1, and Share[k] is
	// Σ w_i n_ik/n_i over the same items; Share[k]/Rated is the category
	// prevalence π_k of Fleiss (1971) and Gwet (2008).
	Rated float64
	Share []float64

	// Pairable is Σ w_i over items with n_i ≥ 2, and Agree is
	// Σ w_i Σ_k n_ik(n_ik−1)/(n_i(n_i−1)) over the same items.
	Pairable, Agree float64

	// Values[k] is Σ w_i n_ik and Coincide is Σ w_i Σ_k n_ik(n_ik−1)/(n_i−1),
	// both over items with n_i ≥ 2: the margins n_c and the diagonal sum of
	// Krippendorff's (2011) coincidence matrix.
	Values   []float64
	Coincide float64
}

func newTotals(k int) Totals {
	return Totals{K: k, Share: make([]float64, k), Values: make([]float64, k)}
}

func (t *Totals) addItem(row []int32, w float64) {
	var n, same int64
	for _, v := range row {
		n += int64(v)
		same += int64(v) * int64(v-1)
	}
	if n == 0 {
		return
	}
	t.Rated += w
	inv := w / float64(n)
	for k, v := range row {
		t.Share[k] += inv * float64(v)
	}
	if n < 2 {
		return
	}
	t.Pairable += w
	t.Agree += w * float64(same) / float64(n*(n-1))
	for k, v := range row {
		t.Values[k] += w * float64(v)
	}
	t.Coincide += w * float64(same) / float64(n-1)
}

// addScaled adds m·o to t.
func (t *Totals) addScaled(o *Totals, m float64) {
	t.Rated += m * o.Rated
	t.Pairable += m * o.Pairable
	t.Agree += m * o.Agree
	t.Coincide += m * o.Coincide
	for k := range t.Share {
		t.Share[k] += m * o.Share[k]
		t.Values[k] += m * o.Values[k]
	}
}

func (t *Totals) reset() {
	t.Rated, t.Pairable, t.Agree, t.Coincide = 0, 0, 0, 0
	clear(t.Share)
	clear(t.Values)
}
