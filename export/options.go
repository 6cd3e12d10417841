package export

import (
	"github.com/quorate-eeg/quorate/internal/progress"
	"github.com/quorate-eeg/quorate/panel/consensus"
	"github.com/quorate-eeg/quorate/sampling/archive"
	"github.com/quorate-eeg/quorate/sampling/candidate"
)

// Formats are the values Options.Format accepts.
var Formats = []string{"parquet", "csv", "bids"}

// Defaults for the epoch options.
const (
	DefaultEpochWindowS = 10.0
	DefaultEpochMontage = "common-average"
)

// DrawInfo is one drawn unit as the draw recorded it. Controls (background epochs) are
// not candidates, so their recording, subject and onset are carried here; for
// candidates those fields may be left empty and are taken from the candidate row.
type DrawInfo struct {
	EventID, Stratum, Kind string // Kind is "candidate" or "control"
	Pi, Weight             float64
	Phase                  int

	RecordingID, SubjectKey string  // controls only
	OnsetS                  float64 // controls only: the start of the background epoch
}

// OPDecision is a tuned operating point's decision per event id.
type OPDecision struct {
	Rule string
	// Headline is what to expect of the rule on new recordings, in words
	// (operating-point.json's "headline"); empty when not given.
	Headline string
	Decision map[string]bool
}

// Options configure one export.
type Options struct {
	To      string // the export folder
	Format  string // parquet, csv or bids
	Replace bool   // move an earlier export (a folder holding MarkerFile) aside; never deleted
	// Protect are folders an export never moves or writes into: the archive roots
	// and the study.
	Protect []string

	Epochs       bool
	EpochWindowS float64 // window length in seconds, centred on the event; 0 → 10
	EpochMontage string  // common-average (default) or referential

	// ShiftDates moves every date of a subject by DateShiftDays[subject key] days;
	// without it dates are reduced to the year (see EXPORT.md).
	ShiftDates    bool
	DateShiftDays map[string]int

	// Comments includes the raters' free-text comments in the ratings table. Off by
	// default: free text can carry anything, including names.
	Comments bool

	Recordings     []archive.Recording
	ArchiveRoots   []string // Recording.Root indexes it; Recording.Path is relative
	Candidates     []candidate.Row
	Draw           []DrawInfo
	Ratings        []consensus.Rating
	Consensus      []consensus.Event
	External       map[string]*bool // optional external reference per event id
	OperatingPoint *OPDecision

	Progress func(total int, desc string) progress.Bar
}

// Result lists what an export wrote.
type Result struct {
	Dir        string   // the export folder
	MovedAside string   // where a replaced folder went, "" if none
	Files      []string // written files, relative to Dir, sorted
	Events     int
	Ratings    int
	Recordings int
	Epochs     int // event × channel rows of epochs.parquet
	Padded     int // epochs that reach past a recording's ends
}
