package detect

import (
	"math"
	"testing"
)

// TestOppositePhase checks the opposite-phase ratio and spikiness on
// piecewise-linear waves of known geometry on a flat baseline: a triangle
// of height a followed by an opposite triangle of height o·a has r = o
// exactly, a monophasic triangle r = 0 and spikiness 0, and spikiness is
// √(P·max(0, 1 − |1 − r|)) with P the triangle's closed-form pointedness
// (see TestC1Duration): r = 1.6 gives √(0.4 P), r = 2.5 gives 0. Closed
// forms (construction).
func TestOppositePhase(t *testing.T) {
	const fs = 1000.0
	for _, o := range []float64{0, 0.2, 0.45, 1.6, 2.5} {
		x := triangle(2000, 1000, 20, 40, -100)
		// opposite phase: a positive triangle of height 100·o over the
		// 30 ms after the fall; the fall continues into it, so the main
		// phase's right base is its apex (1055), or the end of the fall
		// (1040) without it
		if o > 0 {
			for i := 1040; i <= 1070; i++ {
				x[i] = float32(100 * o * (1 - math.Abs(float64(i-1055))/15))
			}
		}
		tr := &trace{x: x, lo: 0, hi: len(x), fs: fs}
		ph := mainPhase(x, 1000, -1, 200, 1)
		right := 1040
		if o > 0 {
			right = 1055
		}
		if ph.left != 980 || ph.right != right {
			t.Fatalf("o=%g: main phase %d–%d, want 980–%d", o, ph.left, ph.right, right)
		}
		r := oppositePhase(tr, ph, &scratch{})
		if math.Abs(r-o) > 1e-6 {
			t.Errorf("o=%g: ratio %g", o, r)
		}
		_, point, s, _ := spiky(tr, ph, &scratch{})
		want := math.Sqrt(point * max(0, 1-math.Abs(1-o)))
		if math.Abs(s-want) > 1e-6 {
			t.Errorf("o=%g: spikiness %g, want %g", o, s, want)
		}
	}
}

// TestWaveDuration checks criterion 2's duration on an exponential return
// (one-sample step, decay e^(−t/τ)): its width at a tenth of the height is
// τ ln 10 after the step (closed form), longer than the walk to the base,
// and on a triangle, which starts and ends at the baseline, the base-to-base
// duration is kept.
func TestWaveDuration(t *testing.T) {
	const fs = 1000.0
	for _, tau := range []float64{30, 80, 200} {
		x := make([]float32, 4000)
		for i := 2000; i < len(x); i++ {
			x[i] = float32(100 * math.Exp(-float64(i-2000)/tau))
		}
		tr := &trace{x: x, lo: 0, hi: len(x), fs: fs}
		ph := phase{peak: 2000, left: 1999, right: 2010, sign: 1, amp: 100}
		// left: the step from 0 to 100 in one sample crosses 10 at 0.9
		// samples before the peak
		want := tau*math.Log(10) + 0.9
		got := waveDuration(tr, ph, &scratch{})
		if math.Abs(got-want) > 0.01*tau {
			t.Errorf("τ=%g: %g samples, want %g", tau, got, want)
		}
		// monophasic (no opposite phase), so criterion 2 compares this
		// width, not the walk to the base, with the background
		if lr, half := durationRatio(tr, ph, &scratch{}); math.Abs(lr-math.Abs(math.Log(got/fs*1000/half))) > 1e-9 {
			t.Errorf("τ=%g: log ratio %g against %g ms, want the width's", tau, lr, half)
		}
	}
	x := triangle(2000, 1000, 20, 40, -100)
	tr := &trace{x: x, lo: 0, hi: len(x), fs: fs}
	ph := mainPhase(x, 1000, -1, 200, 1)
	if got := waveDuration(tr, ph, &scratch{}); got != 60 {
		t.Errorf("triangle: %g samples, want 60", got)
	}
}

// TestEventMap checks the regression map: channels that carry the
// reference waveform scaled by gains g_c plus a constant offset return g_c
// exactly (least squares recovers an exact linear relation), and a channel
// orthogonal to the reference over the window returns 0.
func TestEventMap(t *testing.T) {
	n := 64
	ref := make([]float32, n)
	for i := range ref {
		ref[i] = float32(math.Sin(2 * math.Pi * float64(i) / float64(n)))
	}
	gains := []float64{1, -0.5, 0.25, 2}
	car := make([][]float32, len(gains)+1)
	for c, g := range gains {
		car[c] = make([]float32, n)
		for i := range ref {
			car[c][i] = float32(g*float64(ref[i]) + 3)
		}
	}
	car[len(gains)] = make([]float32, n)
	for i := range ref {
		car[len(gains)][i] = float32(math.Cos(2 * math.Pi * float64(i) / float64(n)))
	}
	m := eventMap(car, []int{0, 1, 2, 3, 4}, ref, 0, n-1, nil)
	for c, g := range append(gains, 0) {
		if math.Abs(m[c]-g) > 1e-5 {
			t.Errorf("channel %d: %g, want %g", c, m[c], g)
		}
	}
}

// TestAsymmetryOvershoot checks criterion 3 on a symmetric triangle (R = F
// = 30 samples, height 100 on a zero baseline) whose fall runs on into an
// opposite triangle of height 45: the sides are compared where they fall to
// shares of the peak's height above the baseline (50–20), which both reach
// before the overshoot, 0.5–0.8 × 30 samples from the peak, so the ratio is
// 1 (construction); widths at half of each flank's own height, the rule of
// an earlier round, read 15 against 30 × 72.5/100 = 21.75, a ratio of
// 1.45. A triangle with F/R = 2 and the same overshoot reads 2.
func TestAsymmetryOvershoot(t *testing.T) {
	for _, c := range []struct {
		r, f int
		want float64
	}{{30, 30, 1}, {20, 40, 2}} {
		x := triangle(2000, 1000, c.r, c.f, -100)
		for i := 1000 + c.f; i <= 1000+c.f+30; i++ {
			x[i] = float32(45 * (1 - math.Abs(float64(i-1000-c.f-15))/15))
		}
		ph := mainPhase(x, 1000, -1, 200, 1)
		if ph.right != 1000+c.f+15 {
			t.Fatalf("R=%d F=%d: right base %d, want the overshoot's apex %d", c.r, c.f, ph.right, 1000+c.f+15)
		}
		got, _, _ := asymmetry(&trace{x: x, lo: 0, hi: len(x), fs: 1000}, ph, &scratch{})
		if math.Abs(got-c.want) > 1e-3*c.want { // the interpolation near the corners, as in TestC1Duration
			t.Errorf("R=%d F=%d: asymmetry %g, want %g", c.r, c.f, got, c.want)
		}
	}
}

// TestMainPhaseAmplitudeSign checks the main phase's amplitude, the lower of
// its two half-wave heights, on a triangle riding on an offset: a peak of
// −100 from bases at +20 and +50 has half-waves of 120 and 150, so 120, and
// the same wave turned over has the same (polarity does not change a
// wave's height; common practice). Until 2026-12-05 a negative peak read
// |x[p]| − min(bases), 80 here: every surface-negative discharge on a
// non-zero base had a wrong amplitude, pointedness and c1.
func TestMainPhaseAmplitudeSign(t *testing.T) {
	x := make([]float32, 400)
	for i := range x {
		switch {
		case i <= 180:
			x[i] = 20
		case i >= 230:
			x[i] = 50
		case i > 200:
			x[i] = float32(-100 + 150*float64(i-200)/30)
		default:
			x[i] = float32(-100 + 120*float64(200-i)/20)
		}
	}
	neg := make([]float32, len(x))
	for i, v := range x {
		neg[i] = -v
	}
	a := mainPhase(x, 200, -1, 200, 1)
	b := mainPhase(neg, 200, +1, 200, 1)
	if a.left != 180 || a.right != 230 || math.Abs(a.amp-120) > 1e-9 {
		t.Errorf("negative peak: bases %d, %d, amplitude %g, want 180, 230, 120", a.left, a.right, a.amp)
	}
	if a.left != b.left || a.right != b.right || a.amp != b.amp {
		t.Errorf("turned over: bases %d, %d, amplitude %g; as recorded %d, %d, %g", b.left, b.right, b.amp, a.left, a.right, a.amp)
	}
}
