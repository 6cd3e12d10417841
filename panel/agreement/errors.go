package agreement

import "fmt"

// CellError reports a rating outside 0..K−1 that is not Missing.
type CellError struct {
	Item, Rater int // position in the table, 0-based
	Value       int // the offending rating
	K           int // number of categories in the table
}

func (e *CellError) Error() string {
	return fmt.Sprintf("agreement: item %d, rater %d: category %d outside [0,%d)", e.Item, e.Rater, e.Value, e.K)
}

// ShapeError reports an item row whose length differs from the first row's.
type ShapeError struct {
	Item      int // row index
	Got, Want int // row length found and expected
}

func (e *ShapeError) Error() string {
	return fmt.Sprintf("agreement: item %d has %d ratings, want %d", e.Item, e.Got, e.Want)
}

// ArgError reports an invalid argument to an estimator or to Bootstrap.
type ArgError struct {
	Arg    string // argument name
	Index  int    // element index for slice arguments, −1 otherwise
	Reason string
}

func (e *ArgError) Error() string {
	if e.Index >= 0 {
		return fmt.Sprintf("agreement: %s[%d]: %s", e.Arg, e.Index, e.Reason)
	}
	return fmt.Sprintf("agreement: %s: %s", e.Arg, e.Reason)
}
