package detect

import (
	"math"
	"testing"

	"github.com/quorate-eeg/quorate/sampling/signal"
)

// TestC2SameState checks that criterion 2's background spectrum keeps to
// the event's vigilance state: 20 s of a 10 Hz rhythm, then 20 s of a 5 Hz
// rhythm of the same amplitude, and a crest 3 s into the second. Within
// the state the dominant rhythm is 5 Hz, half-period 100 ms (closed form);
// across the change the two have equal power and f·P(f) favours 10 Hz
// (half-period 50 ms).
func TestC2SameState(t *testing.T) {
	const fs = 256.0
	x := make([]float32, 40*256)
	for i := range x {
		f := 10.0
		if i >= 20*256 {
			f = 5
		}
		x[i] = float32(20 * math.Cos(2*math.Pi*f*float64(i)/fs))
	}
	p := 23 * 256 // a crest of the 5 Hz rhythm
	n := int(math.Round(0.1 * fs))
	ph := phase{peak: p, left: p - n/2, right: p - n/2 + n, sign: 1, amp: 20}
	whole := &trace{x: x, lo: 0, hi: len(x), fs: fs}
	if _, half := durationRatio(whole, ph, &scratch{}); half != 50 {
		t.Errorf("across the change: half-period %g ms, want 50 (the 10 Hz rhythm)", half)
	}
	state := &trace{x: x, lo: 0, hi: len(x), fs: fs, stLo: 20 * 256, stHi: len(x)}
	if _, half := durationRatio(state, ph, &scratch{}); half != 100 {
		t.Errorf("within the state: half-period %g ms, want 100 (the 5 Hz rhythm)", half)
	}
	// a state too short for one 2 s segment falls back to the whole span
	brief := &trace{x: x, lo: 0, hi: len(x), fs: fs, stLo: p - 100, stHi: p + 100}
	if _, half := durationRatio(brief, ph, &scratch{}); half != 50 {
		t.Errorf("brief state: half-period %g ms, want the whole span's 50", half)
	}
}

// TestC2LargerWave checks criterion 2 on a pop anchored on the ringing lobe
// that the zero-phase low-pass puts just before its step: the duration is
// the pop's, as when anchored on its own peak. The pop is a step decaying
// as e^(−t/τ), τ = 50 ms, through the conditioning's 70 Hz low-pass
// (fourth-order Butterworth, forward–backward), over a faint 10 Hz
// background rhythm; its tenth-height width is τ ln 10 = 115 ms (closed
// form) plus the smoothed step, within 8 ms.
func TestC2LargerWave(t *testing.T) {
	const fs, tau = 256.0, 0.050
	x := make([]float64, 40*256)
	step := 20 * 256
	for i := range x {
		x[i] = 0.5 * math.Cos(2*math.Pi*10*float64(i)/fs)
		if i >= step {
			x[i] += 100 * math.Exp(-float64(i-step)/fs/tau)
		}
	}
	sos, err := signal.Butterworth(signal.LowPass, 4, fs, 70)
	if err != nil {
		t.Fatal(err)
	}
	if err := signal.FiltFilt(sos, x); err != nil {
		t.Fatal(err)
	}
	x32 := make([]float32, len(x))
	for i, v := range x {
		x32[i] = float32(v)
	}
	tr := &trace{x: x32, lo: 0, hi: len(x32), fs: fs}
	maxN := int(math.Ceil(maxPhaseS * fs))
	top := step
	for i := step - 3; i <= step+3; i++ {
		if x32[i] > x32[top] {
			top = i
		}
	}
	lobe := step - 1
	for i := step - 4; i < step; i++ {
		if x32[i] < x32[lobe] {
			lobe = i
		}
	}
	if x32[lobe] >= -0.5 {
		t.Fatalf("no ringing lobe before the step (%g): the fixture does not test re-anchoring", x32[lobe])
	}
	onLobe := mainPhase(x32, lobe, -1, maxN, 0)
	onPop := mainPhase(x32, top, 1, maxN, 0)
	if r := oppositePhase(tr, onLobe, &scratch{}); !(r > 1+turnTol) {
		t.Fatalf("opposite phase of the lobe %g: the pop should be the larger wave", r)
	}
	lrLobe, half := durationRatio(tr, onLobe, &scratch{})
	lrPop, _ := durationRatio(tr, onPop, &scratch{})
	if math.Abs(lrLobe-lrPop) > 1e-9 {
		t.Errorf("anchored on the lobe %g, on the pop %g: want the same", lrLobe, lrPop)
	}
	d := half * math.Exp(lrPop) // the duration compared, ms (the pop is longer than T/2)
	if want := tau * 1000 * math.Ln10; math.Abs(d-want) > 8 {
		t.Errorf("pop duration %g ms, want τ ln 10 = %g ms", d, want)
	}
}
