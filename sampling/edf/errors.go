package edf

import (
	"errors"
	"fmt"
	"strconv"
)

// FieldError reports a header field, or a part of a data record, that does
// not meet the specification. Offset is the byte offset in the file (or, for
// ParseTAL, in the slice given to it).
type FieldError struct {
	File   string // file name as given by the caller
	Field  string // field name as worded in the EDF specification
	Signal int    // 0-based signal index, or -1 for fixed-header fields
	Offset int64  // byte offset of the field
	Value  string // offending content, quoted in Error
	Want   string // what the specification requires
}

func (e *FieldError) Error() string {
	name := e.File
	if name == "" {
		name = "edf"
	}
	sig := ""
	if e.Signal >= 0 {
		sig = fmt.Sprintf(" of signal %d", e.Signal)
	}
	return fmt.Sprintf("%s: %s field %q%s at byte %d: got %s, want %s",
		name, fieldKind(e.Field), e.Field, sig, e.Offset, strconv.Quote(e.Value), e.Want)
}

// ErrFormat is matched by errors.Is on a FieldError.
var ErrFormat = errors.New("edf: not as the specification requires")

// Unwrap gives ErrFormat.
func (e *FieldError) Unwrap() error { return ErrFormat }

func fieldKind(field string) string {
	switch field {
	case "annotation", "time-keeping annotation", "data record":
		return "data"
	}
	return "header"
}
