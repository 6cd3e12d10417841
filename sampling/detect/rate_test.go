package detect

import (
	"context"
	"math"
	"slices"
	"testing"

	"github.com/quorate-eeg/quorate/sampling/candidate"
)

// TestRateInvariance checks that the same waveforms sampled at a higher
// rate give the same candidates and features: a generated recording (256
// Hz) interpolated band-limited to 512 and 1024 Hz is the same signal on a
// finer grid, and a candidate's features describe the waveform, not the
// grid (common practice: clinical recordings are stored at 200–2048 Hz).
// Before recordings were decimated to about designRate, 27 % of the rows
// at 512 Hz moved or changed channel and c3's AUC fell from 0.94 to 0.85
// (TestCandidateQuality with QUORATE_DIAG_UPSAMPLE=2, seeds 3–6).
func TestRateInvariance(t *testing.T) {
	in := inputOf(generated(t, 1, 10))
	base, _, err := Detect(context.Background(), in, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if len(base) < 50 {
		t.Fatalf("only %d rows at 256 Hz", len(base))
	}
	for _, k := range []int{2, 4} {
		rows, _, err := Detect(context.Background(), upsampled(in, k), Options{})
		if err != nil {
			t.Fatal(err)
		}
		matched := 0
		var worst [6][]float64
		for _, a := range base {
			i := slices.IndexFunc(rows, func(b candidate.Row) bool {
				return b.PeakChannel == a.PeakChannel && math.Abs(b.OnsetS-a.OnsetS) <= 0.002
			})
			if i < 0 {
				continue
			}
			matched++
			b := rows[i]
			for c, d := range []float64{b.C1Sharpness - a.C1Sharpness, b.C2DurationLogRatio - a.C2DurationLogRatio,
				b.C3Asymmetry - a.C3Asymmetry, b.C4SlowWaveRatio - a.C4SlowWaveRatio, b.C5Disruption - a.C5Disruption,
				b.C6DipoleGOF - a.C6DipoleGOF} {
				if !math.IsNaN(d) {
					worst[c] = append(worst[c], math.Abs(d))
				}
			}
		}
		if len(rows) < len(base)*97/100 || len(rows) > len(base)*103/100 || matched < len(base)*97/100 {
			t.Errorf("%d Hz: %d rows, %d of the %d at 256 Hz at the same channel within 2 ms", 256*k, len(rows), matched, len(base))
		}
		for c, d := range worst {
			slices.Sort(d)
			// the anti-aliasing low-pass removes the band above 102 Hz
			// the 256 Hz samples held, which the features hardly read
			if q := d[len(d)*9/10]; q > 0.03 {
				t.Errorf("%d Hz: c%d differs from 256 Hz by more than %.3f on a tenth of the matched rows, want ≤ 0.03", 256*k, c+1, q)
			}
		}
		for _, r := range rows[:3] {
			if want := candidate.EventID(in.RecordingID, "builtin", int64(math.Round(r.OnsetS*256*float64(k)))); r.EventID != want {
				t.Errorf("%d Hz: event id %s at %.4f s, want %s (the sample index at the recording's rate)", 256*k, r.EventID, r.OnsetS, want)
			}
		}
	}
}
