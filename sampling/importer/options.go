package importer

import (
	"regexp"

	"github.com/quorate-eeg/quorate/sampling/archive"
	"github.com/quorate-eeg/quorate/sampling/candidate"
)

// Input kinds.
const (
	KindCSV            = "csv"             // delimited text, delimiter sniffed unless given
	KindTSV            = "tsv"             // tab-separated text
	KindBIDS           = "bids"            // BIDS events.tsv
	KindEDFAnnotations = "edf-annotations" // EDF+/BDF+ annotations of the archive recordings
)

// MeasureFunc measures the six criterion features of recording rec at the given onsets
// (seconds from the recording start, ascending). It returns one row per onset, in the
// order given, and notes worth showing the user (for example why a feature is NaN).
type MeasureFunc func(rec archive.Recording, onsets []float64) ([]candidate.Row, []string, error)

// Options configure Run.
type Options struct {
	// Files are the event files (csv, tsv, bids). For edf-annotations they optionally
	// name the recordings to read, by any key Run accepts for a recording; empty means
	// every recording.
	Files     []string
	Kind      string
	Delimiter rune    // csv: 0 sniffs it from the header line
	Mapping   Mapping // csv, tsv; for bids only Recording, Channel and Score apply
	// Pattern selects BIDS rows by trial_type and EDF+ annotations by text (Go regexp
	// syntax, unanchored, case-insensitive unless CaseSensitive).
	Pattern       string
	CaseSensitive bool
	// Recording ties every row of the single file in Files to one recording (any key a
	// recording column accepts).
	Recording string
	// BIDSRecordings maps BIDS entities ("sub-01", "sub-01_ses-night") to recording keys;
	// the most specific mapping that a file name holds applies.
	BIDSRecordings map[string]string
	// Source names the detector: rows get Source "import:"+Source. Lower-case letters,
	// digits, '.', '_' and '-', starting with a letter or digit, at most 64 characters.
	Source     string
	Recordings []archive.Recording // the archive index
	Roots      []string            // archive roots the index's paths are relative to (edf-annotations)
	Measure    MeasureFunc
	OutDir     string // the study's candidates/ folder
	Replace    bool   // overwrite an earlier import of the same source
}

var safeSource = regexp.MustCompile(`^[a-z0-9][a-z0-9._-]{0,63}$`)

// Result summarises an import.
type Result struct {
	Source   string // "import:<name>"
	Dir      string // OutDir/import=<name>
	Read     int    // rows or annotations selected for import
	Skipped  int    // rows or annotations the pattern left out
	Merged   int    // events merged into another within one sample of the same recording
	Kept     int    // candidate rows written
	Rejected []Rejection
	Files    []string // tables written, one per recording, in recording_id order
	Rejects  string   // path of rejected.csv
	Notes    []string // Measure's notes, prefixed with the recording id
}
