package importer

import (
	"math"
	"strconv"
	"strings"
)

// event is one imported row before it is tied to a recording and a time.
type event struct {
	file string
	line int

	recField string // column the recording key came from
	recKey   string // recording key as written; "" when rec is fixed
	rec      int    // index into Options.Recordings when fixed, else -1
	recWhy   string // why there is no recording, when rec < 0 and recKey == ""

	onsetField string
	onset      string // as written
	format     OnsetFormat
	seconds    float64 // when numeric
	numeric    bool

	channel string
	score   float64 // NaN when the file gives none
}

// cell returns row field i, or "" for a missing column (i < 0).
func cell(f []string, i int) string {
	if i < 0 || i >= len(f) {
		return ""
	}
	return f[i]
}

// parseScore reads an optional score: NaN when missing.
func parseScore(s string) (float64, bool) {
	if isNA(s) {
		return math.NaN(), true
	}
	v, err := strconv.ParseFloat(s, 64)
	if err != nil || math.IsInf(v, 0) || math.IsNaN(v) {
		return 0, false
	}
	return v, true
}

// parseSeconds reads a finite decimal number of seconds with a dot separator.
func parseSeconds(s string) (float64, bool) {
	if strings.ContainsAny(s, "_xXpP") {
		return 0, false // Go syntax (digit separators, hex floats) that a spreadsheet never writes
	}
	v, err := strconv.ParseFloat(s, 64)
	if err != nil || math.IsInf(v, 0) || math.IsNaN(v) {
		return 0, false
	}
	return v, true
}
