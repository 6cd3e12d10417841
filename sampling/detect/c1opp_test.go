package detect

import (
	"math"
	"testing"
)

// TestOppositePhase checks the opposite-phase ratio and spikiness on
// piecewise-linear waves of known geometry on a flat baseline: a triangle
// of height a followed by an opposite triangle of height o·a has r = o
// exactly, a monophasic triangle r = 0 and spikiness 0, and spikiness is
// √(P·min(r, 1/r)) with P the triangle's closed-form pointedness (see
// TestC1Duration). Closed forms (construction).
func TestOppositePhase(t *testing.T) {
	const fs = 1000.0
	for _, o := range []float64{0, 0.2, 0.45, 1.6} {
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
		want := math.Sqrt(point * min(o, 1/o))
		if o == 0 {
			want = 0
		}
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
		if got := waveDuration(tr, ph, &scratch{}); math.Abs(got-want) > 0.01*tau {
			t.Errorf("τ=%g: %g samples, want %g", tau, got, want)
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
