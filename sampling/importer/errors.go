package importer

import (
	"fmt"
	"strconv"
)

// MappingError reports a malformed part of a column-mapping flag
// (recording=COL,onset=COL,...).
type MappingError struct {
	Spec  string // the whole flag value
	Part  string // the comma-separated part at fault, as written
	Index int    // 0-based position of Part in Spec's parts
	Want  string
}

func (e *MappingError) Error() string {
	return fmt.Sprintf("malformed mapping %q: part %d %q: want %s", e.Spec, e.Index+1, e.Part, e.Want)
}

// OptionError reports an Options field that cannot be used.
type OptionError struct {
	Field string // Options field name
	Value string
	Want  string
}

func (e *OptionError) Error() string {
	return fmt.Sprintf("importer: option %s = %s: want %s", e.Field, strconv.Quote(e.Value), e.Want)
}

// ColumnError reports a file whose header lacks a needed column or breaks a column rule;
// the whole file is refused.
type ColumnError struct {
	File   string
	Column string // the column looked for, or the header cell at fault
	Want   string
}

func (e *ColumnError) Error() string {
	return fmt.Sprintf("%s: header, column %q: want %s", e.File, e.Column, e.Want)
}

// ReadError reports a file that could not be read as a table at all (for example a
// quoted field never closed); Line is 1-based, 0 when unknown.
type ReadError struct {
	File string
	Line int
	Err  error
}

func (e *ReadError) Error() string {
	if e.Line > 0 {
		return fmt.Sprintf("%s:%d: %v", e.File, e.Line, e.Err)
	}
	return fmt.Sprintf("%s: %v", e.File, e.Err)
}

func (e *ReadError) Unwrap() error { return e.Err }

// ExistsError reports an earlier import of the same source that Replace was not set to
// overwrite.
type ExistsError struct {
	Dir string
}

func (e *ExistsError) Error() string {
	return fmt.Sprintf("%s already holds an import of this source", e.Dir)
}

// MeasureError reports a Measure function that broke its contract or failed.
type MeasureError struct {
	RecordingID string
	Err         error
}

func (e *MeasureError) Error() string {
	return fmt.Sprintf("measuring imported events in %s: %v", e.RecordingID, e.Err)
}

func (e *MeasureError) Unwrap() error { return e.Err }

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
