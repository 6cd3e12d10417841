package detect

import (
	"math"
	"testing"
)

// TestAsymmetryGridInvariant checks c3 against a closed form on a waveform
// sampled at 256 Hz with its apex at four places between samples: a
// half-Gaussian rise of σ_r = 6 ms and fall of σ_f = 15 ms reaches level l
// of its height σ√(−2 ln l) from the apex, so both 20–80 % transition
// durations are 1.126σ and c3 = σ_f/σ_r = 2.5 wherever the samples fall (a
// waveform's asymmetry is the waveform's, not the grid's; common practice).
// Read from the peak sample, as c3 was before, the ratio moved with the
// grid.
func TestAsymmetryGridInvariant(t *testing.T) {
	const fs, sr, sf = 256.0, 0.006, 0.015
	var got []float64
	for _, d := range []float64{0, 0.25, 0.5, 0.75} {
		x := make([]float32, 2*int(fs))
		apex := float64(fs) + d // samples
		for i := range x {
			u := (float64(i) - apex) / fs
			s := sr
			if u > 0 {
				s = sf
			}
			x[i] = float32(100 * math.Exp(-u*u/(2*s*s)))
		}
		p := int(math.Round(apex))
		ph := mainPhase(x, p, 1, int(math.Ceil(maxPhaseS*fs)), 0)
		c3, _, _ := asymmetry(&trace{x: x, lo: 0, hi: len(x), fs: fs}, ph, &scratch{})
		got = append(got, c3)
		if math.Abs(c3-2.5) > 0.03*2.5 {
			t.Errorf("apex %.2f samples after the grid: c3 %.3f, want 2.5 (closed form) within 3 %%", d, c3)
		}
	}
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, v := range got {
		lo, hi = min(lo, v), max(hi, v)
	}
	if hi-lo > 0.05 {
		t.Errorf("c3 %.3f at the four grid phases: spread %.3f, want ≤ 0.05", got, hi-lo)
	}
}
