package headmodel

import (
	"errors"
	"fmt"
)

// Sentinels of this package's errors, for errors.Is: every error it returns for
// unusable input matches one of them.
var (
	ErrInput = errors.New("headmodel: unusable input")
)

// shellError reports an invalid Sphere: Field is "Radii" or "Sigma" and
// Index the offending shell (innermost 0).
type shellError struct {
	Field string
	Index int
	Value float64
	Msg   string
}

func (e *shellError) Error() string {
	return fmt.Sprintf("headmodel: shell %d %s = %g: %s", e.Index, e.Field, e.Value, e.Msg)
}

// Unwrap gives ErrInput, for errors.Is.
func (e *shellError) Unwrap() error { return ErrInput }

// lengthError reports a slice whose length does not match the electrodes.
type lengthError struct {
	Field     string
	Got, Want int
}

func (e *lengthError) Error() string {
	return fmt.Sprintf("headmodel: %s has %d values, want %d", e.Field, e.Got, e.Want)
}

// Unwrap gives ErrInput, for errors.Is.
func (e *lengthError) Unwrap() error { return ErrInput }

// electrodeError reports an unusable electrode position (zero vector, NaN).
type electrodeError struct {
	Index int
	Pos   Vec3
}

func (e *electrodeError) Error() string {
	return fmt.Sprintf("headmodel: electrode %d at %v is not a usable scalp position", e.Index, e.Pos)
}

// Unwrap gives ErrInput, for errors.Is.
func (e *electrodeError) Unwrap() error { return ErrInput }

// mapError reports a voltage map that cannot be fitted.
type mapError struct {
	Msg string
}

func (e *mapError) Error() string { return "headmodel: " + e.Msg }

// Unwrap gives ErrInput, for errors.Is.
func (e *mapError) Unwrap() error { return ErrInput }
