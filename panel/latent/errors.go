package latent

import "fmt"

// CellError reports a rating outside 0..K−1 that is not Missing.
type CellError struct {
	Item, Rater int
	Value, K    int
}

func (e *CellError) Error() string {
	return fmt.Sprintf("latent: item %d, rater %d: class %d outside [0,%d)", e.Item, e.Rater, e.Value, e.K)
}

// ShapeError reports an item row whose length differs from the first row's.
type ShapeError struct {
	Item      int
	Got, Want int
}

func (e *ShapeError) Error() string {
	return fmt.Sprintf("latent: item %d has %d ratings, want %d", e.Item, e.Got, e.Want)
}

// OptionError reports an invalid Options field.
type OptionError struct {
	Field  string
	Reason string
}

func (e *OptionError) Error() string {
	return fmt.Sprintf("latent: option %s: %s", e.Field, e.Reason)
}
