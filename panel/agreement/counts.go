package agreement

// Counts holds, for each item, how many raters chose each category (n_ik in
// Fleiss 1971). Missing cells are not counted, so n_i = Σ_k n_ik is the number
// of raters who answered item i.
type Counts struct {
	K int
	N []int32 // item-major: N[i*K+k] = n_ik
}

// Counts tallies the table's ratings per item and category.
func (t Table) Counts() *Counts {
	c := &Counts{K: t.K, N: make([]int32, len(t.Ratings)*t.K)}
	for i, row := range t.Ratings {
		base := i * t.K
		for _, v := range row {
			if v != Missing {
				c.N[base+v]++
			}
		}
	}
	return c
}

// CountsFromRows builds Counts from rows already in count form, as published
// tables such as Fleiss (1971, Table 1) are printed. Each row has K entries.
func CountsFromRows(rows [][]int) (*Counts, error) {
	if len(rows) == 0 {
		return &Counts{K: 0}, nil
	}
	k := len(rows[0])
	c := &Counts{K: k, N: make([]int32, len(rows)*k)}
	for i, row := range rows {
		if len(row) != k {
			return nil, &shapeError{Item: i, Got: len(row), Want: k}
		}
		for j, v := range row {
			if v < 0 {
				return nil, &cellError{Item: i, Rater: j, Value: v, K: k}
			}
			c.N[i*k+j] = int32(v)
		}
	}
	return c, nil
}

// Items returns the number of items.
func (c *Counts) Items() int {
	if c.K == 0 {
		return 0
	}
	return len(c.N) / c.K
}

// Row returns item i's category counts (aliasing c.N).
func (c *Counts) Row(i int) []int32 { return c.N[i*c.K : (i+1)*c.K] }

// Totals returns the weighted sums over items that the count-based
// coefficients need. weights may be nil (all items weigh 1); otherwise it has
// one non-negative entry per item. Integer weights are equivalent to repeating
// items, which is how the bootstrap uses them.
func (c *Counts) Totals(weights []float64) Totals {
	if weights != nil && len(weights) != c.Items() {
		panic("agreement: weights length mismatch")
	}
	t := newTotals(c.K)
	for i := range c.Items() {
		w := 1.0
		if weights != nil {
			w = weights[i]
		}
		if w != 0 {
			t.addItem(c.Row(i), w)
		}
	}
	return t
}
