package detect

import (
	"errors"
	"fmt"
)

// OptionError reports an invalid option: Field is the Options field (or the
// Cutoffs key) and Value its offending value.
type OptionError struct {
	Field string
	Value any
	Msg   string
}

func (e *OptionError) Error() string {
	return fmt.Sprintf("detect: option %s = %v: %s", e.Field, e.Value, e.Msg)
}

// ErrOption is matched by errors.Is on a OptionError.
var ErrOption = errors.New("detect: unusable option")

// Unwrap gives ErrOption.
func (e *OptionError) Unwrap() error { return ErrOption }

// RecordingError reports a recording that could not be processed at all. It
// names the recording and, when known, the file and the stage that failed.
type RecordingError struct {
	RecordingID string
	Path        string
	Stage       string // "open", "channels", "montage", "filter", "read", "write"
	Err         error
}

func (e *RecordingError) Error() string {
	return fmt.Sprintf("detect: recording %s (%s): %s: %v", e.RecordingID, e.Path, e.Stage, e.Err)
}

func (e *RecordingError) Unwrap() error { return e.Err }
