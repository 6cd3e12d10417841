package agreement

// Missing marks a cell where the rater gave no answer (item not in the
// rater's packet, or skipped).
const Missing = -1

// Table holds nominal ratings, one row per item and one column per rater.
// Each cell is a category index in 0..K−1 or Missing.
type Table struct {
	K       int     // number of categories; 2 for present/absent criteria
	Ratings [][]int // Ratings[item][rater]
}

// NewTable validates ratings against k categories and returns the Table.
// Rows must all have the same length. The slice is not copied.
func NewTable(ratings [][]int, k int) (Table, error) {
	if k < 2 {
		return Table{}, &argError{Arg: "k", Index: -1, Reason: "need at least 2 categories"}
	}
	for i, row := range ratings {
		if len(row) != len(ratings[0]) {
			return Table{}, &shapeError{Item: i, Got: len(row), Want: len(ratings[0])}
		}
		for r, v := range row {
			if v != Missing && (v < 0 || v >= k) {
				return Table{}, &cellError{Item: i, Rater: r, Value: v, K: k}
			}
		}
	}
	return Table{K: k, Ratings: ratings}, nil
}

// Items returns the number of items (rows).
func (t Table) Items() int { return len(t.Ratings) }

// Raters returns the number of raters (columns).
func (t Table) Raters() int {
	if len(t.Ratings) == 0 {
		return 0
	}
	return len(t.Ratings[0])
}

// Column returns rater r's answers, one per item.
func (t Table) Column(r int) []int {
	col := make([]int, len(t.Ratings))
	for i, row := range t.Ratings {
		col[i] = row[r]
	}
	return col
}
