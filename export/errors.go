package export

import (
	"errors"
	"fmt"
	"strconv"
	"strings"
)

// Sentinels of this package's errors, for errors.Is: every error it returns for
// unusable input matches one of them.
var (
	ErrOption    = errors.New("export: unusable option")
	ErrNotEmpty  = errors.New("export: folder not empty")
	ErrNotExport = errors.New("export: folder is not an earlier export")
	ErrReference = errors.New("export: broken link between tables")
)

// formatError reports an unknown export format.
type formatError struct {
	Got     string
	Allowed []string
}

func (e *formatError) Error() string {
	return fmt.Sprintf("export: format %q: want one of %s", e.Got, strings.Join(e.Allowed, ", "))
}

// Unwrap gives ErrOption, for errors.Is.
func (e *formatError) Unwrap() error { return ErrOption }

// optionError reports an invalid option value.
type optionError struct {
	Option string
	Value  string
	Want   string
}

func (e *optionError) Error() string {
	return fmt.Sprintf("export: %s %q: want %s", e.Option, e.Value, e.Want)
}

// Unwrap gives ErrOption, for errors.Is.
func (e *optionError) Unwrap() error { return ErrOption }

// notEmptyError reports an export folder that already holds files.
type notEmptyError struct{ Dir string }

func (e *notEmptyError) Error() string {
	return fmt.Sprintf("export: %s exists and is not empty", e.Dir)
}

// Unwrap gives ErrNotEmpty, for errors.Is.
func (e *notEmptyError) Unwrap() error { return ErrNotEmpty }

// The inputs an export cannot do without, as MissingStepError names them.
const (
	InputIndex     = "archive index"
	InputDraw      = "draw"
	InputRatings   = "ratings"
	InputConsensus = "consensus"
)

// MissingStepError reports that an earlier study step has not produced its table yet.
type MissingStepError struct {
	Table string // what is missing: InputIndex, InputDraw, InputRatings, InputConsensus
}

func (e *MissingStepError) Error() string {
	return fmt.Sprintf("export: nothing to export: no %s yet", e.Table)
}

// ErrMissingInput is matched by errors.Is on a MissingStepError.
var ErrMissingInput = errors.New("export: an input table is missing")

// Unwrap gives ErrMissingInput.
func (e *MissingStepError) Unwrap() error { return ErrMissingInput }

// referenceError reports a drawn event that cannot be placed in a recording.
type referenceError struct {
	EventID string
	Field   string // the missing link: "candidate", "recording_id", "date shift", …
	Value   string
}

func (e *referenceError) Error() string {
	return fmt.Sprintf("export: event %s: %s %q not found", e.EventID, e.Field, e.Value)
}

// Unwrap gives ErrReference, for errors.Is.
func (e *referenceError) Unwrap() error { return ErrReference }

// epochError reports a recording whose samples could not be read for an epoch.
type epochError struct {
	EventID     string
	RecordingID string
	Err         error
}

func (e *epochError) Error() string {
	return fmt.Sprintf("export: epochs: event %s, recording %s: %v", e.EventID, e.RecordingID, e.Err)
}

// Is makes errors.Is(err, ErrReference) true.
func (e *epochError) Is(target error) bool { return target == ErrReference }

func (e *epochError) Unwrap() error { return e.Err }

func formatFloat(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }
