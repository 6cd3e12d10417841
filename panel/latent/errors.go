package latent

import (
	"errors"
	"fmt"
)

// Sentinels of this package's errors, for errors.Is: every error it returns for
// unusable input matches one of them.
var (
	ErrInput = errors.New("latent: unusable input")
)

// cellError reports a rating outside 0..K−1 that is not Missing.
type cellError struct {
	Item, Rater int
	Value, K    int
}

func (e *cellError) Error() string {
	return fmt.Sprintf("latent: item %d, rater %d: class %d outside [0,%d)", e.Item, e.Rater, e.Value, e.K)
}

// Unwrap gives ErrInput, for errors.Is.
func (e *cellError) Unwrap() error { return ErrInput }

// shapeError reports an item row whose length differs from the first row's.
type shapeError struct {
	Item      int
	Got, Want int
}

func (e *shapeError) Error() string {
	return fmt.Sprintf("latent: item %d has %d ratings, want %d", e.Item, e.Got, e.Want)
}

// Unwrap gives ErrInput, for errors.Is.
func (e *shapeError) Unwrap() error { return ErrInput }

// optionError reports an invalid Options field.
type optionError struct {
	Field  string
	Reason string
}

func (e *optionError) Error() string {
	return fmt.Sprintf("latent: option %s: %s", e.Field, e.Reason)
}

// Unwrap gives ErrInput, for errors.Is.
func (e *optionError) Unwrap() error { return ErrInput }
