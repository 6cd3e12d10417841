package detect

import (
	"math"
	"os"
	"path/filepath"
	"testing"
	"time"

	"github.com/quorate-eeg/quorate/sampling/edf"
)

// TestDiscontinuous checks that EDF+D segments are processed separately and
// that onsets are in seconds from the recording start (Kemp & Olivan 2003,
// §2.2.4: each record's onset is its time-keeping annotation): a transient
// 15 s into a segment that starts at 100 s is reported at 115 s.
func TestDiscontinuous(t *testing.T) {
	labels := []string{"Fp1", "F3", "C3", "P3", "O1", "Fp2", "F4", "C4", "P4", "O2", "Cz"}
	const fs, secs = 256, 30
	sigs := make([]edf.Signal, len(labels))
	for i, l := range labels {
		sigs[i] = edf.Signal{Label: l, PhysDim: "uV", PhysMin: -3200, PhysMax: 3200, DigMin: -32768, DigMax: 32767, SamplesPerRecord: fs}
	}
	path := filepath.Join(t.TempDir(), "d.edf")
	f, err := os.Create(path)
	if err != nil {
		t.Fatal(err)
	}
	w, err := edf.NewWriter(f, edf.WriterHeader{Format: edf.EDFPlusD, Start: time.Date(2022, 3, 2, 9, 0, 0, 0, time.UTC), RecordDuration: 1, NumRecords: 2 * secs, Signals: sigs})
	if err != nil {
		t.Fatal(err)
	}
	data := make([][]float32, len(labels))
	for seg, start := range []float64{0, 100} {
		for c := range labels {
			data[c] = noise(uint64(100*seg+c), fs*secs, 20)
		}
		if seg == 1 {
			// a spike on C3 with a smaller field on its neighbours
			for c, g := range map[int]float64{2: 1, 1: 0.6, 3: 0.6, 10: 0.4} {
				for i, v := range triangle(fs*secs, fs*15, 4, 9, -300*g) {
					data[c][i] += v
				}
			}
		}
		rec := make([][]float32, len(labels))
		for r := range secs {
			for c := range labels {
				rec[c] = data[c][r*fs : (r+1)*fs]
			}
			if err := w.WriteRecordAt(start+float64(r), rec); err != nil {
				t.Fatal(err)
			}
		}
	}
	if err := w.Close(); err != nil {
		t.Fatal(err)
	}
	f.Close()
	r, err := edf.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer r.Close()
	s, _ := (&Options{}).settings()
	rows, warns, err := detectFileRows(s, r, "d")
	if err != nil {
		t.Fatal(err, warns)
	}
	hit := false
	for _, row := range rows {
		if math.Abs(row.OnsetS-115) < 0.01 && row.PeakChannel == "C3" && row.Polarity == "negative" {
			hit = true
		}
		if row.OnsetS > 30 && row.OnsetS < 100 {
			t.Errorf("event in the gap at %g s", row.OnsetS)
		}
	}
	if !hit {
		t.Errorf("no C3 negative event at 115 s among %d rows", len(rows))
	}
}
