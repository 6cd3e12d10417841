package importer

import (
	"strings"
)

// OnsetFormat says how an onset cell is written.
type OnsetFormat string

const (
	// OnsetAuto reads a plain number as seconds and anything holding ':' as a clock time.
	OnsetAuto OnsetFormat = ""
	// OnsetSeconds is seconds from the recording start (a decimal with a dot).
	OnsetSeconds OnsetFormat = "seconds"
	// OnsetClock is a time of day HH:MM:SS[.fff] or an RFC 3339 date-time, resolved
	// against the recording's start time.
	OnsetClock OnsetFormat = "clock"
)

// Mapping names the columns of a CSV/TSV event file. Column names are matched without
// regard to case or surrounding spaces. Empty fields take the defaults: "recording",
// "onset", and "channel" and "score" when the file has such columns.
//
// A recording cell is matched, in this order, against: the recording_id; the path
// relative to its archive root (either slash); the cell's file name against the
// recordings' file names, ignoring case; the same without extensions. The first of
// these that matches anything decides, and a cell matching several recordings there is
// rejected as ambiguous rather than guessed.
type Mapping struct {
	Recording   string
	Onset       string
	Channel     string
	Score       string
	OnsetFormat OnsetFormat
}

// mappingKeys are the keys ParseMapping accepts, in the order they are documented.
var mappingKeys = []string{"recording", "onset", "channel", "score", "onset-format"}

// ParseMapping parses a column mapping:
//
//	recording=COL,onset=COL,channel=COL,score=COL[,onset-format=seconds|clock]
//
// Every part is optional and may come in any order, but each key at most once; spaces
// around parts, keys and values are ignored. Column names cannot contain commas. A
// malformed part is a *mappingError naming it.
func ParseMapping(spec string) (Mapping, error) {
	var m Mapping
	if strings.TrimSpace(spec) == "" {
		return m, nil
	}
	seen := map[string]bool{}
	for i, part := range strings.Split(spec, ",") {
		bad := func(want string) error { return &mappingError{Spec: spec, Part: part, Index: i, Want: want} }
		p := strings.TrimSpace(part)
		if p == "" {
			return m, bad("KEY=VALUE, not an empty part")
		}
		k, v, ok := strings.Cut(p, "=")
		k, v = strings.ToLower(strings.TrimSpace(k)), strings.TrimSpace(v)
		if !ok {
			return m, bad("KEY=VALUE with KEY one of " + strings.Join(mappingKeys, ", "))
		}
		if seen[k] {
			return m, bad("each key once; " + k + " is given twice")
		}
		seen[k] = true
		if v == "" {
			return m, bad("a column name after " + k + "=")
		}
		switch k {
		case "recording":
			m.Recording = v
		case "onset":
			m.Onset = v
		case "channel":
			m.Channel = v
		case "score":
			m.Score = v
		case "onset-format":
			switch OnsetFormat(strings.ToLower(v)) {
			case OnsetSeconds, OnsetClock:
				m.OnsetFormat = OnsetFormat(strings.ToLower(v))
			default:
				return m, bad("onset-format=seconds or onset-format=clock")
			}
		default:
			return m, bad("a key among " + strings.Join(mappingKeys, ", ") + ", not " + k)
		}
	}
	return m, nil
}
