package edf

import (
	"math"
	"os"
	"path/filepath"
	"testing"
	"time"
)

// fixtureSample is the closed form of testdata/edf/make_vhdr.py: the
// digital value of sample n of channel c before conversion (resolution
// 0.5 uV). Python's round() rounds half to even.
func fixtureSample(c, n int) float64 {
	freqs := []float64{1, 2, 5, 10}
	return math.RoundToEven(1000*math.Sin(2*math.Pi*freqs[c]*float64(n)/250)) + 100*float64(c)
}

// TestIndependentFixture reads EDF and BDF files written by biosig-tools
// 2.5.0 (save2gdf), an independent open-source implementation; see
// testdata/edf/README.md for the commands. Samples must equal the
// generating closed form within one digital step of the file's scaling
// (biosig quantises by truncation, so not within half a step)
// (EDF) or exactly (BDF, whose scaling biosig chose as 0.5 uV per step).
func TestIndependentFixture(t *testing.T) {
	for _, c := range []struct {
		file   string
		format Format
		exact  bool
	}{
		{"small.edf", EDFPlusC, false},
		{"small.bdf", BDFPlusC, true},
	} {
		r, err := Open(filepath.Join("..", "..", "testdata", "edf", c.file))
		if err != nil {
			t.Fatal(err)
		}
		h := r.Header()
		if h.Format != c.format {
			t.Errorf("%s: format %v, want %v", c.file, h.Format, c.format)
		}
		if want := time.Date(2024, 3, 5, 10, 11, 11, 0, time.UTC); !h.Start.Equal(want) {
			t.Errorf("%s: start %v, want %v", c.file, h.Start, want)
		}
		wantNames := []string{"Fp1", "T7", "Cz", "ECG"}
		wantKinds := []ChannelKind{EEG, EEG, EEG, ECG}
		wantLabels := []string{"EEG Fp1-REF", "T3", "Cz", "ECG"}
		if len(h.Signals) != 4 {
			t.Fatalf("%s: %d signals", c.file, len(h.Signals))
		}
		for i, s := range h.Signals {
			if s.Label != wantLabels[i] || s.Name != wantNames[i] || s.Kind != wantKinds[i] || s.PhysDim != "uV" {
				t.Errorf("%s: signal %d %q → %q %v %q", c.file, i, s.Label, s.Name, s.Kind, s.PhysDim)
			}
			if rate := s.SampleRate(h.RecordDuration); math.Abs(rate-250) > 1e-9 {
				t.Errorf("%s: signal %d rate %v, want 250", c.file, i, rate)
			}
		}
		if d := h.Duration(); math.Abs(d-4) > 1e-9 {
			t.Errorf("%s: duration %v, want 4 s", c.file, d)
		}
		spr := h.Signals[0].SamplesPerRecord
		buf := make([]float32, 1000)
		for ch := 0; ch < 4; ch++ {
			n, err := r.ReadSignal(ch, 0, buf)
			if err != nil || n != 1000 || int64(n) != r.NumRecords()*int64(spr) {
				t.Fatalf("%s: read %d samples: %v", c.file, n, err)
			}
			step := math.Abs(h.Signals[ch].Gain())
			for k, got := range buf {
				want := 0.5 * fixtureSample(ch, k)
				d := math.Abs(float64(got) - want)
				// biosig truncates rather than rounds when quantising
				// (sample 6 of channel 3 sits one step below its value),
				// so the bound is one whole step, plus float32 rounding.
				ulp := float64(math.Nextafter32(float32(want), float32(math.Inf(1))) - float32(want))
				if (c.exact && d != 0) || d > step+2*ulp {
					t.Fatalf("%s: channel %d sample %d: %v, want %v (step %v)", c.file, ch, k, got, want, step)
				}
			}
		}
		s, err := os.Open(filepath.Join("..", "..", "testdata", "edf", c.file))
		if err != nil {
			t.Fatal(err)
		}
		st, _ := s.Stat()
		sum, err := Inspect(s, st.Size(), c.file)
		s.Close()
		if err != nil {
			t.Fatal(err)
		}
		if len(sum.EEG) != 3 || len(sum.EEGRates) != 1 || sum.EEGRates[0] != 250 || sum.Duration != 4 {
			t.Errorf("%s: summary %+v", c.file, sum)
		}
		r.Close()
	}
}
