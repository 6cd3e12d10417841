package export

import (
	"fmt"
	"strconv"
	"strings"
)

// FormatError reports an unknown export format.
type FormatError struct {
	Got     string
	Allowed []string
}

func (e *FormatError) Error() string {
	return fmt.Sprintf("export: format %q: want one of %s", e.Got, strings.Join(e.Allowed, ", "))
}

// OptionError reports an invalid option value.
type OptionError struct {
	Option string
	Value  string
	Want   string
}

func (e *OptionError) Error() string {
	return fmt.Sprintf("export: %s %q: want %s", e.Option, e.Value, e.Want)
}

// NotEmptyError reports an export folder that already holds files.
type NotEmptyError struct{ Dir string }

func (e *NotEmptyError) Error() string {
	return fmt.Sprintf("export: %s exists and is not empty", e.Dir)
}

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

// ReferenceError reports a drawn event that cannot be placed in a recording.
type ReferenceError struct {
	EventID string
	Field   string // the missing link: "candidate", "recording_id", "date shift", …
	Value   string
}

func (e *ReferenceError) Error() string {
	return fmt.Sprintf("export: event %s: %s %q not found", e.EventID, e.Field, e.Value)
}

// EpochError reports a recording whose samples could not be read for an epoch.
type EpochError struct {
	EventID     string
	RecordingID string
	Err         error
}

func (e *EpochError) Error() string {
	return fmt.Sprintf("export: epochs: event %s, recording %s: %v", e.EventID, e.RecordingID, e.Err)
}

func (e *EpochError) Unwrap() error { return e.Err }

func formatFloat(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }
