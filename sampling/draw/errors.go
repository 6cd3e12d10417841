package draw

import (
	"fmt"
	"strings"
)

// ColumnError reports a stratification column absent from the frame.
type ColumnError struct {
	Column    string
	Available []string // sorted names of all columns in the frame
}

func (e *ColumnError) Error() string {
	return fmt.Sprintf("draw: unknown column %q (available: %s)", e.Column, strings.Join(e.Available, ", "))
}

// LengthError reports a frame column whose length differs from the ID column.
type LengthError struct {
	Column    string
	Got, Want int
}

func (e *LengthError) Error() string {
	return fmt.Sprintf("draw: column %q has %d rows, want %d", e.Column, e.Got, e.Want)
}

// DuplicateIDError reports an event ID found on two rows.
type DuplicateIDError struct {
	ID         string
	Row, Other int
}

func (e *DuplicateIDError) Error() string {
	return fmt.Sprintf("draw: event ID %q on rows %d and %d", e.ID, e.Other, e.Row)
}

// SpecError reports a stratum specification that cannot be applied.
type SpecError struct {
	Column string
	Msg    string
}

func (e *SpecError) Error() string {
	return fmt.Sprintf("draw: stratum spec %q: %s", e.Column, e.Msg)
}

// ParseError reports a malformed strata string; Pos is the byte offset of
// the offending field.
type ParseError struct {
	Pos   int
	Field string
	Err   error
}

func (e *ParseError) Error() string {
	return fmt.Sprintf("draw: strata string, field %q at offset %d: %v", e.Field, e.Pos, e.Err)
}

func (e *ParseError) Unwrap() error { return e.Err }

// SizeError reports a requested sample larger than the population that can
// be drawn from. Cap is the per-subject cap in force (0 when none), and
// Available is Σ N'_h, the size after capping.
type SizeError struct {
	N, Available, Population, Cap int
}

func (e *SizeError) Error() string {
	if e.Cap > 0 && e.Available < e.Population {
		return fmt.Sprintf("draw: n=%d impossible with a per-subject cap of %d: only %d of %d units remain after capping", e.N, e.Cap, e.Available, e.Population)
	}
	return fmt.Sprintf("draw: n=%d exceeds the population size %d", e.N, e.Available)
}

// AllocationError reports an allocation that cannot be carried out.
type AllocationError struct {
	Stratum string // empty when the problem is not tied to one stratum
	Msg     string
}

func (e *AllocationError) Error() string {
	if e.Stratum == "" {
		return "draw: allocation: " + e.Msg
	}
	return fmt.Sprintf("draw: allocation, stratum %q: %s", e.Stratum, e.Msg)
}

// PhaseError reports a previous draw that does not fit the current design:
// an unknown event, a stratum that changed, or a unit outside the thinned
// stratum (different seed or cap).
type PhaseError struct {
	EventID string
	Msg     string
}

func (e *PhaseError) Error() string {
	return fmt.Sprintf("draw: top-up, event %q: %s", e.EventID, e.Msg)
}

// Warning is a non-fatal remark about a draw (an empty bin, a stratum taken
// whole).
type Warning struct {
	Stratum string // stratum label or, for bin warnings, the bin label
	Msg     string
}

func (w Warning) String() string { return w.Stratum + ": " + w.Msg }
