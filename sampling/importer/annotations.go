package importer

import (
	"context"
	"fmt"
	"math"
	"path/filepath"
	"regexp"

	"github.com/quorate-eeg/quorate/sampling/archive"
	"github.com/quorate-eeg/quorate/sampling/edf"
)

// recordingPath is where an indexed recording lives on disk.
func recordingPath(roots []string, rec archive.Recording) (string, error) {
	if int(rec.Root) < 0 || int(rec.Root) >= len(roots) {
		return "", &optionError{Field: "Roots", Value: fmt.Sprint(len(roots), " roots"),
			Want: fmt.Sprintf("the archive roots of the index; recording %s is under root %d", rec.RecordingID, rec.Root)}
	}
	return filepath.Join(roots[rec.Root], filepath.FromSlash(rec.Path)), nil
}

// readAnnotations selects the EDF+ annotations of recording i whose text pattern
// matches, and counts those it leaves out. Onsets are the annotations' own: seconds from the header start time (Kemp &
// Olivan 2003, section 2.2.2). Files without an annotation signal give no events.
func readAnnotations(ctx context.Context, roots []string, recs []archive.Recording, i int, pattern *regexp.Regexp) ([]event, int, error) {
	p, err := recordingPath(roots, recs[i])
	if err != nil {
		return nil, 0, err
	}
	rd, err := edf.Open(p)
	if err != nil {
		return nil, 0, err
	}
	defer rd.Close()
	var evs []event
	skipped := 0
	for a, err := range rd.AllAnnotations() {
		if err != nil {
			return nil, 0, err
		}
		if err := ctx.Err(); err != nil {
			return nil, 0, err
		}
		if !pattern.MatchString(a.Text) {
			skipped++
			continue
		}
		evs = append(evs, event{file: p, line: int(a.Record) + 1, rec: i,
			onsetField: "annotation", onset: fmt.Sprintf("%q at %g s", a.Text, a.Onset),
			format: OnsetSeconds, seconds: a.Onset, numeric: true, score: math.NaN()})
	}
	return evs, skipped, nil
}
