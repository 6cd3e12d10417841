package detect

import (
	"math"
	"testing"
)

// triangle returns n samples of zeros with a triangular transient of height
// a peaking at sample p, rising over r and falling over f samples.
func triangle(n, p, r, f int, a float64) []float32 {
	x := make([]float32, n)
	for i := p - r; i <= p+f; i++ {
		d := float64(i - p)
		if d < 0 {
			x[i] = float32(a * (1 + d/float64(r)))
		} else {
			x[i] = float32(a * (1 - d/float64(f)))
		}
	}
	return x
}

// TestC1Duration checks the main-phase duration and sharpness of triangles
// of known shape, and their class by the IFCN durations: spike 20 to < 70 ms,
// sharp wave 70–200 ms (Kane et al. 2017). Sharpness (pointedness) has the
// closed form (h/R + h/F)/(2 − 2cos(πh/D)) for a triangle (rise R, fall F,
// duration D = R + F, second-difference step h = D/6, h < R, F): the
// triangle's second difference over that of a sine half-wave of length D.
func TestC1Duration(t *testing.T) {
	const fs = 1000.0 // 1 ms samples make the durations exact
	for _, c := range []struct {
		r, f  int // ms
		spike bool
	}{
		{10, 30, true},  // 40 ms: spike
		{20, 45, true},  // 65 ms: spike
		{25, 50, false}, // 75 ms: sharp wave
		{40, 120, false},
		{60, 130, false}, // 190 ms: sharp wave
	} {
		x := triangle(2000, 1000, c.r, c.f, -100)
		tr := &trace{x: x, lo: 0, hi: len(x), fs: fs}
		ph := mainPhase(x, 1000, -1, 200, 1)
		d, sharp, _, _ := spiky(tr, ph, &scratch{})
		if want := float64(c.r + c.f); math.Abs(d-want) > 1e-9 {
			t.Errorf("R=%d F=%d: duration %g ms, want %g", c.r, c.f, d, want)
		}
		if (d < 70) != c.spike || d < 20 || d > 200 {
			t.Errorf("R=%d F=%d: duration %g ms classed wrongly", c.r, c.f, d)
		}
		// triangle: −Δ²x/A = h/R + h/F; sine half-wave: 2 − 2cos(πh/D)
		D := float64(c.r + c.f)
		h := math.Max(2, math.Round(D/6))
		want := (h/float64(c.r) + h/float64(c.f)) / (2 - 2*math.Cos(math.Pi*h/D))
		if math.Abs(sharp-want) > 1e-6*want {
			t.Errorf("R=%d F=%d: sharpness %g, want %g", c.r, c.f, sharp, want)
		}
		// c3 on a triangle: 20–80 % transition durations 0.6R and 0.6F,
		// ratio F/R (closed form); the band-limited interpolation between
		// samples is exact on the straight flanks up to its kernel's
		// truncation near the corners, 0.03 % here
		asym, rise, fall := asymmetry(tr, ph, &scratch{})
		if want := float64(max(c.r, c.f)) / float64(min(c.r, c.f)); math.Abs(asym-want) > 1e-3*want {
			t.Errorf("R=%d F=%d: asymmetry %g, want %g", c.r, c.f, asym, want)
		}
		if rise != float64(c.r) || fall != float64(c.f) {
			t.Errorf("R=%d F=%d: rise/fall %g/%g ms", c.r, c.f, rise, fall)
		}
	}
}

// TestC2Sinusoid checks the dominant background rhythm on a pure sinusoid:
// for f Hz the compared half-period is 500/f ms exactly when f sits on a
// Welch bin (0.5 Hz steps, closed form), and the log ratio is taken against
// it. The main phase is the half-wave around a crest.
func TestC2Sinusoid(t *testing.T) {
	const fs = 256.0
	for _, f := range []float64{2, 6, 10.5, 21} {
		x := make([]float32, 20*256)
		for i := range x {
			x[i] = float32(20 * math.Cos(2*math.Pi*f*float64(i)/fs))
		}
		half := 500 / f
		p := 10 * 256
		n := int(math.Round(half / 1000 * fs))
		ph := phase{peak: p, left: p - n/2, right: p - n/2 + n, sign: 1, amp: 20}
		tr := &trace{x: x, lo: 0, hi: len(x), fs: fs}
		lr, got := durationRatio(tr, ph, &scratch{})
		if math.Abs(got-half) > 1e-9 {
			t.Errorf("%g Hz: half-period %g ms, want %g", f, got, half)
		}
		// a sinusoid's main phase is followed by a full opposite phase
		// (r = 1 ≥ phaseFloor), so the duration compared is base to base
		if r := oppositePhase(tr, ph, &scratch{}); r < phaseFloor {
			t.Fatalf("%g Hz: opposite phase %g", f, r)
		}
		if want := math.Abs(math.Log(float64(n) / fs * 1000 / half)); math.Abs(lr-want) > 1e-9 {
			t.Errorf("%g Hz: log ratio %g, want %g", f, lr, want)
		}
	}
}
