package headmodel

import "fmt"

// ShellError reports an invalid Sphere: Field is "Radii" or "Sigma" and
// Index the offending shell (innermost 0).
type ShellError struct {
	Field string
	Index int
	Value float64
	Msg   string
}

func (e *ShellError) Error() string {
	return fmt.Sprintf("headmodel: shell %d %s = %g: %s", e.Index, e.Field, e.Value, e.Msg)
}

// LengthError reports a slice whose length does not match the electrodes.
type LengthError struct {
	Field     string
	Got, Want int
}

func (e *LengthError) Error() string {
	return fmt.Sprintf("headmodel: %s has %d values, want %d", e.Field, e.Got, e.Want)
}

// ElectrodeError reports an unusable electrode position (zero vector, NaN).
type ElectrodeError struct {
	Index int
	Pos   Vec3
}

func (e *ElectrodeError) Error() string {
	return fmt.Sprintf("headmodel: electrode %d at %v is not a usable scalp position", e.Index, e.Pos)
}

// MapError reports a voltage map that cannot be fitted.
type MapError struct {
	Msg string
}

func (e *MapError) Error() string { return "headmodel: " + e.Msg }
