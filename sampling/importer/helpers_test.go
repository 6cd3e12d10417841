package importer

import (
	"errors"
	"math"
	"os"
	"path/filepath"
	"testing"
	"time"

	"github.com/quorate-eeg/quorate/sampling/archive"
	"github.com/quorate-eeg/quorate/sampling/candidate"
)

// night is an overnight recording that crosses midnight: 22:30 + 8 h.
var night = time.Date(2024, 3, 1, 22, 30, 0, 0, time.UTC)

func testRecordings() []archive.Recording {
	return []archive.Recording{
		{RecordingID: "rec-aaaa", SubjectKey: "subj-1", Root: 0, Path: "ward1/PT01_night.edf", StartTime: night, DurationS: 8 * 3600, SampleRatesHz: []float64{256}},
		{RecordingID: "rec-bbbb", SubjectKey: "subj-2", Root: 0, Path: "ward1/pt02.edf", StartTime: night, DurationS: 600, SampleRatesHz: []float64{200, 500}},
		{RecordingID: "rec-cccc", SubjectKey: "subj-3", Root: 0, Path: "ward2/pt02.edf", StartTime: night, DurationS: 600, SampleRatesHz: []float64{256}},
		{RecordingID: "rec-dddd", SubjectKey: "subj-4", Root: 0, Path: "bids/sub-07/eeg/sub-07_task-sleep_run-1_eeg.edf", StartTime: night, DurationS: 3600, SampleRatesHz: []float64{256}},
	}
}

// stubMeasure stands in for the feature measurer: one row per onset, onset kept.
func stubMeasure(rec archive.Recording, onsets []float64) ([]candidate.Row, []string, error) {
	rows := make([]candidate.Row, len(onsets))
	for i, o := range onsets {
		rows[i] = candidate.Row{OnsetS: o, C1Sharpness: math.NaN(), Score: math.NaN()}
	}
	return rows, nil, nil
}

func writeFile(t testing.TB, dir, name, content string) string {
	t.Helper()
	p := filepath.Join(dir, name)
	if err := os.MkdirAll(filepath.Dir(p), 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(p, []byte(content), 0o644); err != nil {
		t.Fatal(err)
	}
	return p
}

func as[T error](t *testing.T, err error) T {
	t.Helper()
	var target T
	if !errors.As(err, &target) {
		t.Fatalf("error %v (%T), want %T", err, err, target)
	}
	return target
}

func near(a, b, tol float64) bool { return math.Abs(a-b) <= tol }
