package detect

import (
	"context"
	"testing"

	"github.com/quorate-eeg/quorate/sampling/archive"
)

// A changed detection setting once left every recording "already done" with the
// candidates of the old setting; a recording detected under other settings is detected
// again, one detected under the same settings is resumed.
func TestRunRedoesChangedSettings(t *testing.T) {
	dir := t.TempDir()
	const fs, n = 256, 256 * 20
	labels := []string{"Fp1", "F3", "C3", "P3", "O1"}
	data := make([][]float32, len(labels))
	for i := range data {
		data[i] = noise(uint64(30+i), n, 30)
	}
	writeEDF(t, dir, "a.edf", labels, data, fs, nil)
	writeEDF(t, dir, "b.edf", labels, data, fs, nil)
	recs := []archive.Recording{{RecordingID: "a", Path: "a.edf"}, {RecordingID: "b", Path: "b.edf"}}
	out := t.TempDir()
	o := Options{Recordings: recs, Roots: []string{dir}, OutDir: out}
	if res, err := Run(context.Background(), o); err != nil || res.Processed != 2 {
		t.Fatalf("first run: %+v %v", res, err)
	}
	if res, err := Run(context.Background(), o); err != nil || res.Skipped != 2 || res.Processed != 0 {
		t.Fatalf("same settings: %+v %v, want both resumed", res, err)
	}
	o.ThresholdMAD = 6
	if res, err := Run(context.Background(), o); err != nil || res.Redone != 2 || res.Processed != 2 || res.Skipped != 0 {
		t.Fatalf("threshold changed: %+v %v, want both detected again", res, err)
	}
	o.Cutoffs = map[string]float64{"c3_asymmetry": 1.9}
	if res, err := Run(context.Background(), o); err != nil || res.Redone != 2 {
		t.Fatalf("cutoff changed: %+v %v, want both detected again", res, err)
	}
	o.Workers = 3 // not a detection setting
	if res, err := Run(context.Background(), o); err != nil || res.Skipped != 2 {
		t.Fatalf("workers changed: %+v %v, want both resumed", res, err)
	}
}
