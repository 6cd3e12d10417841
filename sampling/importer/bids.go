package importer

import (
	"fmt"
	"io"
	"path/filepath"
	"regexp"
	"slices"
	"strings"
)

// entity is one key-label pair of a BIDS file name, e.g. sub-01.
type entity struct{ key, label string }

// bidsEntities splits a BIDS file name such as sub-01_ses-night_task-rest_run-1_events.tsv
// into its entities (BIDS Specification, "Filename structure" and Appendix "Entities":
// key-label pairs joined by underscores, then the suffix and extension). The suffix and
// extension are dropped; a part without a hyphen ends the entities.
func bidsEntities(name string) []entity {
	base := filepath.Base(name)
	if i := strings.IndexByte(base, '.'); i >= 0 {
		base = base[:i]
	}
	var out []entity
	for _, p := range strings.Split(base, "_") {
		k, v, ok := strings.Cut(p, "-")
		if !ok || k == "" || v == "" {
			break
		}
		out = append(out, entity{k, v})
	}
	return out
}

func entityString(es []entity) string {
	s := make([]string, len(es))
	for i, e := range es {
		s[i] = e.key + "-" + e.label
	}
	return strings.Join(s, "_")
}

// mapBIDS picks the recording key that a mapping gives a file: a mapping key such as
// "sub-01" or "sub-01_ses-night" applies to every file whose name holds all its
// entities, and the most specific key wins. Two equally specific keys that both apply
// and name different recordings are refused.
func mapBIDS(file string, m map[string]string) (key, why string) {
	have := bidsEntities(file)
	best, bestN, tie := "", -1, ""
	keys := make([]string, 0, len(m))
	for k := range m {
		keys = append(keys, k)
	}
	slices.Sort(keys) // deterministic messages
	for _, k := range keys {
		want := bidsEntities(k)
		if len(want) == 0 {
			continue
		}
		all := true
		for _, w := range want {
			if !slices.Contains(have, w) {
				all = false
				break
			}
		}
		switch {
		case !all:
		case len(want) > bestN:
			best, bestN, tie = k, len(want), ""
		case len(want) == bestN && m[k] != m[best]:
			tie = k
		}
	}
	if tie != "" {
		return "", fmt.Sprintf("one mapping for %s; %q and %q both apply", entityString(have), best, tie)
	}
	if bestN < 0 {
		return "", ""
	}
	return m[best], ""
}

// readBIDS reads a BIDS events.tsv file (BIDS Specification, "Modality agnostic
// files", "Task events"): tab-separated with a header line; onset and duration are the
// first two columns, in that order, both in seconds; onset is seconds from the first
// data point of the recording; duration is zero, positive or n/a; "n/a" marks a missing
// value. pattern, when not nil, keeps only rows whose trial_type it matches; fixed,
// when ≥ 0, is the recording of every row. recCol names an optional per-row recording
// column. Returns the events, the rejections and the number of rows skipped by pattern.
func readBIDS(r io.Reader, file string, m Mapping, pattern *regexp.Regexp, fixed int, recKey, recWhy string) ([]event, []Rejection, int, error) {
	t, err := readTable(r, file, '\t')
	if err != nil {
		return nil, nil, 0, err
	}
	// BIDS Specification, "Task events": onset "must appear first", duration "second".
	for i, want := range []string{"onset", "duration"} {
		if len(t.header) <= i || t.header[i] != want {
			return nil, nil, 0, &columnError{File: file, Column: cell(t.header, i),
				Want: fmt.Sprintf("%q as column %d (BIDS task events: onset first, duration second)", want, i+1)}
		}
	}
	typeCol := -1
	if pattern != nil {
		if typeCol, err = t.need("trial_type", "trial_type (the pattern selects on it)"); err != nil {
			return nil, nil, 0, err
		}
	}
	recCol, err := t.optional(m.Recording, "recording", "recording")
	if err != nil {
		return nil, nil, 0, err
	}
	chanCol, err := t.optional(m.Channel, "channel", "channel")
	if err != nil {
		return nil, nil, 0, err
	}
	scoreCol, err := t.optional(m.Score, "score", "score")
	if err != nil {
		return nil, nil, 0, err
	}
	var evs []event
	var rej []Rejection
	skipped := 0
	for _, row := range t.rows {
		f := row.fields
		reject := func(col int, want string) {
			rej = append(rej, Rejection{File: file, Line: row.line, Field: cell(t.header, col), Value: cell(f, col), Want: want})
		}
		if len(f) != len(t.header) {
			rej = append(rej, Rejection{File: file, Line: row.line, Field: "row", Value: fmt.Sprint(len(f), " fields"),
				Want: fmt.Sprintf("%d tab-separated fields, as in the header", len(t.header))})
			continue
		}
		if typeCol >= 0 && !pattern.MatchString(f[typeCol]) {
			skipped++
			continue
		}
		if isNA(f[0]) {
			reject(0, "an onset in seconds; onset is REQUIRED in BIDS task events")
			continue
		}
		sec, ok := parseSeconds(f[0])
		if !ok {
			reject(0, "an onset in seconds (a decimal number with a dot)")
			continue
		}
		if d, ok := parseSeconds(f[1]); !isNA(f[1]) && (!ok || d < 0) {
			reject(1, "a duration in seconds that is zero, positive or n/a")
			continue
		}
		score, ok := parseScore(cell(f, scoreCol))
		if !ok {
			reject(scoreCol, "a score: a decimal number (dot separator) or n/a")
			continue
		}
		ev := event{file: file, line: row.line, rec: fixed, recKey: recKey, recWhy: recWhy,
			onsetField: "onset", onset: f[0], format: OnsetSeconds, seconds: sec, numeric: true,
			channel: cell(f, chanCol), score: score}
		if isNA(ev.channel) {
			ev.channel = ""
		}
		if recCol >= 0 && !isNA(f[recCol]) {
			ev.rec, ev.recField, ev.recKey, ev.recWhy = -1, t.header[recCol], f[recCol], ""
		}
		if ev.rec < 0 && ev.recField == "" {
			ev.recField = "recording"
		}
		evs = append(evs, ev)
	}
	return evs, rej, skipped, nil
}
