package importer

import (
	"errors"
	"fmt"
	"strconv"
)

// Sentinels of this package's errors, for errors.Is: every error it returns for
// unusable input matches one of them.
var (
	ErrInput = errors.New("importer: unusable input")
)

// mappingError reports a malformed part of a column-mapping flag
// (recording=COL,onset=COL,...).
type mappingError struct {
	Spec  string // the whole flag value
	Part  string // the comma-separated part at fault, as written
	Index int    // 0-based position of Part in Spec's parts
	Want  string
}

func (e *mappingError) Error() string {
	return fmt.Sprintf("malformed mapping %q: part %d %q: want %s", e.Spec, e.Index+1, e.Part, e.Want)
}

// Unwrap gives ErrInput, for errors.Is.
func (e *mappingError) Unwrap() error { return ErrInput }

// optionError reports an Options field that cannot be used.
type optionError struct {
	Field string // Options field name
	Value string
	Want  string
}

func (e *optionError) Error() string {
	return fmt.Sprintf("importer: option %s = %s: want %s", e.Field, strconv.Quote(e.Value), e.Want)
}

// Unwrap gives ErrInput, for errors.Is.
func (e *optionError) Unwrap() error { return ErrInput }

// columnError reports a file whose header lacks a needed column or breaks a column rule;
// the whole file is refused.
type columnError struct {
	File   string
	Column string // the column looked for, or the header cell at fault
	Want   string
}

func (e *columnError) Error() string {
	return fmt.Sprintf("%s: header, column %q: want %s", e.File, e.Column, e.Want)
}

// Unwrap gives ErrInput, for errors.Is.
func (e *columnError) Unwrap() error { return ErrInput }

// readError reports a file that could not be read as a table at all (for example a
// quoted field never closed); Line is 1-based, 0 when unknown.
type readError struct {
	File string
	Line int
	Err  error
}

func (e *readError) Error() string {
	if e.Line > 0 {
		return fmt.Sprintf("%s:%d: %v", e.File, e.Line, e.Err)
	}
	return fmt.Sprintf("%s: %v", e.File, e.Err)
}

// Is makes errors.Is(err, ErrInput) true.
func (e *readError) Is(target error) bool { return target == ErrInput }

func (e *readError) Unwrap() error { return e.Err }

// ExistsError reports an earlier import of the same source that Replace was not set to
// overwrite.
type ExistsError struct {
	Dir string
}

func (e *ExistsError) Error() string {
	return fmt.Sprintf("%s already holds an import of this source", e.Dir)
}

// ErrExists is matched by errors.Is on a ExistsError.
var ErrExists = errors.New("importer: an import of this source exists")

// Unwrap gives ErrExists.
func (e *ExistsError) Unwrap() error { return ErrExists }

// measureError reports a Measure function that broke its contract or failed.
type measureError struct {
	RecordingID string
	Err         error
}

func (e *measureError) Error() string {
	return fmt.Sprintf("measuring imported events in %s: %v", e.RecordingID, e.Err)
}

// Is makes errors.Is(err, ErrInput) true.
func (e *measureError) Is(target error) bool { return target == ErrInput }

func (e *measureError) Unwrap() error { return e.Err }

// Rejection is one input row that was not imported, and why. It satisfies error so a
// caller can report it like one.
type Rejection struct {
	File  string
	Line  int    // 1-based line of the row (the header is line 1); for an EDF+ annotation, its 1-based data record
	Field string // column (or "annotation") at fault
	Value string // the value as read
	Want  string // what was expected
}

func (r Rejection) Error() string {
	return fmt.Sprintf("%s:%d: %s %s: want %s", r.File, r.Line, r.Field, strconv.Quote(r.Value), r.Want)
}
