package draw

import (
	"errors"
	"fmt"
	"strings"
)

// Sentinels of this package's errors, for errors.Is: every error it returns for
// unusable input matches one of them.
var (
	ErrInput = errors.New("draw: unusable input")
	ErrPhase = errors.New("draw: the earlier draw does not fit the design")
)

// columnError reports a stratification column absent from the frame.
type columnError struct {
	Column    string
	Available []string // sorted names of all columns in the frame
}

func (e *columnError) Error() string {
	return fmt.Sprintf("draw: unknown column %q (available: %s)", e.Column, strings.Join(e.Available, ", "))
}

// Unwrap gives ErrInput, for errors.Is.
func (e *columnError) Unwrap() error { return ErrInput }

// lengthError reports a frame column whose length differs from the ID column.
type lengthError struct {
	Column    string
	Got, Want int
}

func (e *lengthError) Error() string {
	return fmt.Sprintf("draw: column %q has %d rows, want %d", e.Column, e.Got, e.Want)
}

// Unwrap gives ErrInput, for errors.Is.
func (e *lengthError) Unwrap() error { return ErrInput }

// duplicateIDError reports an event ID found on two rows.
type duplicateIDError struct {
	ID         string
	Row, Other int
}

func (e *duplicateIDError) Error() string {
	return fmt.Sprintf("draw: event ID %q on rows %d and %d", e.ID, e.Other, e.Row)
}

// Unwrap gives ErrInput, for errors.Is.
func (e *duplicateIDError) Unwrap() error { return ErrInput }

// specError reports a stratum specification that cannot be applied.
type specError struct {
	Column string
	Msg    string
}

func (e *specError) Error() string {
	return fmt.Sprintf("draw: stratum spec %q: %s", e.Column, e.Msg)
}

// Unwrap gives ErrInput, for errors.Is.
func (e *specError) Unwrap() error { return ErrInput }

// parseError reports a malformed strata string; Pos is the byte offset of
// the offending field.
type parseError struct {
	Pos   int
	Field string
	Err   error
}

func (e *parseError) Error() string {
	return fmt.Sprintf("draw: strata string, field %q at offset %d: %v", e.Field, e.Pos, e.Err)
}

// Is makes errors.Is(err, ErrInput) true.
func (e *parseError) Is(target error) bool { return target == ErrInput }

func (e *parseError) Unwrap() error { return e.Err }

// sizeError reports a requested sample larger than the population that can
// be drawn from. Cap is the per-subject cap in force (0 when none), and
// Available is Σ N'_h, the size after capping.
type sizeError struct {
	N, Available, Population, Cap int
}

func (e *sizeError) Error() string {
	if e.Cap > 0 && e.Available < e.Population {
		return fmt.Sprintf("draw: n=%d impossible with a per-subject cap of %d: only %d of %d units remain after capping", e.N, e.Cap, e.Available, e.Population)
	}
	return fmt.Sprintf("draw: n=%d exceeds the population size %d", e.N, e.Available)
}

// Unwrap gives ErrInput, for errors.Is.
func (e *sizeError) Unwrap() error { return ErrInput }

// allocationError reports an allocation that cannot be carried out.
type allocationError struct {
	Stratum string // empty when the problem is not tied to one stratum
	Msg     string
}

func (e *allocationError) Error() string {
	if e.Stratum == "" {
		return "draw: allocation: " + e.Msg
	}
	return fmt.Sprintf("draw: allocation, stratum %q: %s", e.Stratum, e.Msg)
}

// Unwrap gives ErrInput, for errors.Is.
func (e *allocationError) Unwrap() error { return ErrInput }

// phaseError reports a previous draw that does not fit the current design:
// an unknown event, a stratum that changed, or a unit outside the thinned
// stratum (different seed or cap).
type phaseError struct {
	EventID string
	Msg     string
}

func (e *phaseError) Error() string {
	return fmt.Sprintf("draw: top-up, event %q: %s", e.EventID, e.Msg)
}

// Unwrap gives ErrPhase, for errors.Is.
func (e *phaseError) Unwrap() error { return ErrPhase }

// Warning is a non-fatal remark about a draw (an empty bin, a stratum taken
// whole).
type Warning struct {
	Stratum string // stratum label or, for bin warnings, the bin label
	Msg     string
}

func (w Warning) String() string { return w.Stratum + ": " + w.Msg }
