package detect

import (
	"math"

	"gonum.org/v1/gonum/dsp/fourier"
)

// trace is the conditioned peak-channel trace an event is measured on.
type trace struct {
	x      []float32
	lo, hi int // the conditioned, usable part of x
	fs     float64
	// stLo, stHi bound the event's vigilance state within [lo, hi) when
	// the recording's annotations give one (stHi > stLo); see sameState.
	stLo, stHi int
}

// sameState returns t confined to the event's vigilance state, or t itself
// when no state is known.
func (t *trace) sameState() *trace {
	if t.stHi <= t.stLo {
		return t
	}
	c := *t
	c.lo, c.hi = max(t.lo, t.stLo), min(t.hi, t.stHi)
	return &c
}

// Background reference around a peak at p, in seconds: [p−5, p−0.5] before
// it and [p+2, p+5] after it. The gap after the peak leaves out the
// after-going slow wave and any post-event attenuation, which may last more
// than a second, so that c2, c4 and c5 compare the event with the activity
// it interrupts and not with itself. c2's spectrum reaches further, to
// specSpanS (16 s) each side: its dominant rhythm is an argmax over
// periodogram bins, and from 7.5 s of data it wandered between near-equal
// peaks (FEATURES.md, c2).
const (
	bgSpanS     = 5.0
	bgPreGapS   = 0.5
	bgPostGapS  = 2.0
	specSpanS   = 16.0                          // reach of c2's background spectrum, s each side
	contextNeed = max(bgSpanS, specSpanS) + 0.5 // seconds of conditioned context each side
)

// background returns the background ranges around p as half-open sample
// intervals inside the usable part of t.
func (t *trace) background(p int) [][2]int { return t.backgroundSpan(p, bgSpanS) }

// backgroundSpan is background reaching span s on each side instead of
// bgSpanS.
func (t *trace) backgroundSpan(p int, span float64) [][2]int {
	s := func(sec float64) int { return int(math.Round(sec * t.fs)) }
	r := [][2]int{
		{max(p-s(span), t.lo), min(p-s(bgPreGapS), t.hi)},
		{max(p+s(bgPostGapS), t.lo), min(p+s(span), t.hi)},
	}
	out := r[:0]
	for _, v := range r {
		if v[1] > v[0] {
			out = append(out, v)
		}
	}
	return out
}

// scratch is per-worker space for feature computation.
type scratch struct {
	fftN int
	fft  *fourier.FFT
	rfft *rfft // nil unless fftN is a power of two
	seg  []float64
	win  []float64
	psd  []float64
	co   []complex128
	cum  []float64
	med  []float32
	vc   virtualScratch
}

// measures are the feature values of one event before they go into a Row.
type measures struct {
	durMS, sharp      float64 // sharp is the headline: spikiness
	point             float64
	phases            int
	logRatio, bgMS    float64
	asym, riseMS, fMS float64
	slow              float64
	disrupt           float64
}

// measure measures an event on its peak derivation's trace t, and
// criterion 3 on the virtual channel of all derivations xs (virtualChannel,
// with the window's background covariances bc; the peak derivation when
// there is none).
func measure(t *trace, ph phase, xs [][]float32, bc *blockCov, sc *scratch) measures {
	var m measures
	m.durMS, m.point, m.sharp, m.phases = spiky(t, ph, sc)
	m.logRatio, m.bgMS = durationRatio(t, ph, sc)
	if yt, yph, ok := virtualChannel(xs, t, ph, bc, &sc.vc); ok {
		m.asym, m.riseMS, m.fMS = asymmetry(yt, yph, sc)
	} else {
		m.asym, m.riseMS, m.fMS = asymmetry(t, ph, sc)
	}
	m.slow = slowWave(t, ph, sc)
	m.disrupt = disruption(t, ph)
	return m
}
