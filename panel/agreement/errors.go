package agreement

import (
	"errors"
	"fmt"
)

// Sentinels of this package's errors, for errors.Is: every error it returns for
// unusable input matches one of them.
var (
	ErrInput = errors.New("agreement: unusable input")
)

// cellError reports a rating outside 0..K−1 that is not Missing.
type cellError struct {
	Item, Rater int // position in the table, 0-based
	Value       int // the offending rating
	K           int // number of categories in the table
}

func (e *cellError) Error() string {
	return fmt.Sprintf("agreement: item %d, rater %d: category %d outside [0,%d)", e.Item, e.Rater, e.Value, e.K)
}

// Unwrap gives ErrInput, for errors.Is.
func (e *cellError) Unwrap() error { return ErrInput }

// shapeError reports an item row whose length differs from the first row's.
type shapeError struct {
	Item      int // row index
	Got, Want int // row length found and expected
}

func (e *shapeError) Error() string {
	return fmt.Sprintf("agreement: item %d has %d ratings, want %d", e.Item, e.Got, e.Want)
}

// Unwrap gives ErrInput, for errors.Is.
func (e *shapeError) Unwrap() error { return ErrInput }

// argError reports an invalid argument to an estimator or to Bootstrap.
type argError struct {
	Arg    string // argument name
	Index  int    // element index for slice arguments, −1 otherwise
	Reason string
}

func (e *argError) Error() string {
	if e.Index >= 0 {
		return fmt.Sprintf("agreement: %s[%d]: %s", e.Arg, e.Index, e.Reason)
	}
	return fmt.Sprintf("agreement: %s: %s", e.Arg, e.Reason)
}

// Unwrap gives ErrInput, for errors.Is.
func (e *argError) Unwrap() error { return ErrInput }
