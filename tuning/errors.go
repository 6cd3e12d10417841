package tuning

import (
	"errors"
	"fmt"
	"strings"
)

// Sentinels of this package's errors, for errors.Is: every error it returns for
// unusable input matches one of them.
var (
	ErrSingleClass = errors.New("tuning: the reference standard has one class only")
	ErrUnknownIDs  = errors.New("tuning: reference ids unknown to the study")
)

// InputError reports an event whose field cannot be used.
type InputError struct {
	Index   int    // position in Options.Events
	EventID string // the event's id, if any
	Field   string
	Msg     string
}

func (e *InputError) Error() string {
	if e.Index < 0 { // an option, not an event
		return fmt.Sprintf("tuning: %s: %s", e.Field, e.Msg)
	}
	return fmt.Sprintf("tuning: event %d (%s): %s: %s", e.Index, e.EventID, e.Field, e.Msg)
}

// ErrInput is matched by errors.Is on a InputError.
var ErrInput = errors.New("tuning: unusable event")

// Unwrap gives ErrInput.
func (e *InputError) Unwrap() error { return ErrInput }

// Sentinels of the missing inputs, wrapped by NoDataError.
var (
	ErrNoEvents    = errors.New("no events to tune on")
	ErrNoReference = errors.New("no event has a reference standard")
)

// NoDataError reports that there is nothing to tune on; Err, when set, is the
// sentinel naming the missing input (ErrNoEvents, ErrNoReference).
type NoDataError struct {
	Msg string
	Err error
}

func (e *NoDataError) Error() string { return "tuning: " + e.Msg }
func (e *NoDataError) Unwrap() error { return e.Err }

// singleClassError reports a reference standard with only one class, for
// which no sensitivity/specificity pair and no ROC curve exist.
type singleClassError struct {
	Reference string
	Class     string // "IED" or "not IED": the only class present
	N         int    // events with a reference
}

func (e *singleClassError) Error() string {
	return fmt.Sprintf("tuning: every one of the %d events with a reference (%s) is %s: no ROC curve or operating point is possible; rate events of both classes", e.N, e.Reference, e.Class)
}

// Unwrap gives ErrSingleClass, for errors.Is.
func (e *singleClassError) Unwrap() error { return ErrSingleClass }

// ReferenceError reports a field of an external reference file that cannot be
// read, in the manner of encoding/csv's ParseError.
type ReferenceError struct {
	File  string
	Row   int // 1-based line, header is row 1; 0 when not tied to a row
	Field string
	Msg   string
}

func (e *ReferenceError) Error() string {
	if e.Row == 0 {
		return fmt.Sprintf("tuning: reference %s: %s: %s", e.File, e.Field, e.Msg)
	}
	return fmt.Sprintf("tuning: reference %s, row %d, field %s: %s", e.File, e.Row, e.Field, e.Msg)
}

// ErrReference is matched by errors.Is on a ReferenceError.
var ErrReference = errors.New("tuning: unreadable external reference")

// Unwrap gives ErrReference.
func (e *ReferenceError) Unwrap() error { return ErrReference }

// unknownIDsError lists ids of an external reference file that match no event
// or subject of the study.
type unknownIDsError struct {
	File   string
	Column string // "event_id" or "subject_key"
	IDs    []string
}

func (e *unknownIDsError) Error() string {
	const show = 10
	ids := e.IDs
	more := ""
	if len(ids) > show {
		more = fmt.Sprintf(" and %d more", len(ids)-show)
		ids = ids[:show]
	}
	return fmt.Sprintf("tuning: reference %s: %d unknown %s value(s): %s%s", e.File, len(e.IDs), e.Column, strings.Join(ids, ", "), more)
}

// Unwrap gives ErrUnknownIDs, for errors.Is.
func (e *unknownIDsError) Unwrap() error { return ErrUnknownIDs }
