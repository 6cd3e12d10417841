package edf

import (
	"bytes"
	"strings"
	"testing"
	"time"
)

// TestInspect checks the index summary of a written file: EEG names after
// NormalizeLabel, one rate, annotation count, warnings for the ECG channel
// and an unknown label, and a flat physical range.
func TestInspect(t *testing.T) {
	sigs := append(testSignals(), Signal{Label: "DC01", PhysMin: -1, PhysMax: 1, SamplesPerRecord: 256},
		Signal{Label: "Cz", PhysMin: -100, PhysMax: 100, SamplesPerRecord: 128})
	b := writeFile(t, EDFPlusC, sigs, 5, nil, map[int64][]Annotation{0: {{Onset: 0.5, Text: "a"}}, 3: {{Onset: 3.1, Text: "b"}, {Onset: 3.2, Text: "c"}}})
	s, err := Inspect(bytes.NewReader(b), int64(len(b)), "x.edf")
	if err != nil {
		t.Fatal(err)
	}
	if s.Format != EDFPlusC || s.NumRecords != 5 || s.RecordDuration != 1 || s.Duration != 5 || s.Annotations != 3 || s.Discontinuities != 0 {
		t.Errorf("summary %+v", s)
	}
	if !s.Start.Equal(time.Date(2024, 3, 5, 10, 11, 12, 0, time.UTC)) {
		t.Errorf("start %v", s.Start)
	}
	if strings.Join(s.EEG, ",") != "Fp1,T7,Cz" {
		t.Errorf("EEG %v", s.EEG)
	}
	if len(s.EEGRates) != 2 || s.EEGRates[0] != 128 || s.EEGRates[1] != 256 {
		t.Errorf("rates %v", s.EEGRates)
	}
	all := strings.Join(s.Warnings, "\n")
	for _, w := range []string{"non-EEG channels ignored: ECG (ECG)", "unknown labels, not treated as EEG: DC01", "different rates"} {
		if !strings.Contains(all, w) {
			t.Errorf("warnings lack %q:\n%s", w, all)
		}
	}
}

// TestInspectPlainEDF checks that EDF (no annotation signal) reads no
// data records at all: Inspect on a file whose data area is unreadable
// still succeeds.
func TestInspectPlainEDF(t *testing.T) {
	b := writeFile(t, EDF, testSignals(), 2, nil, nil)
	r := &headerOnly{b: b, limit: 1280}
	s, err := Inspect(r, int64(len(b)), "p.edf")
	if err != nil {
		t.Fatal(err)
	}
	if s.Duration != 2 || s.Annotations != 0 || len(s.EEG) != 2 {
		t.Errorf("summary %+v", s)
	}
}

// headerOnly fails reads beyond limit.
type headerOnly struct {
	b     []byte
	limit int64
}

func (h *headerOnly) ReadAt(p []byte, off int64) (int, error) {
	if off+int64(len(p)) > h.limit {
		panic("data record read")
	}
	return copy(p, h.b[off:]), nil
}
