package detect

import "math"

// transitionLevels are the reference levels, as shares of the apex's
// height above the local baseline, between which asymmetry times each
// flank: 20 % and 80 %, IEEE Std 181-2011's alternative to 10 % and 90 %,
// which keeps off both the rounded apex (the conditioning low-pass) and the
// base, where the background and a pre-phase or overshoot meet the flank.
var transitionLevels = [2]float64{0.2, 0.8}

// asymmetry measures criterion 3, asymmetric waveform (Kane et al. 2017:
// "a sharply rising ascending phase and a more slowly decaying descending
// phase, or vice versa"):
//
//	c3 = exp |ln(T_fall / T_rise)| ≥ 1
//
// with T_rise and T_fall the transition durations of the two flanks
// between the 20 % and 80 % reference levels (IEEE Std 181-2011), levels L
// = b + l·(x(t*) − b), folded so that either direction counts. t* and x(t*)
// are the apex, b the local baseline (the median of the preBaseS before
// the main phase's left base, as oppositePhase and waveDuration). Each
// level is searched outward from the apex up to returnMaxS (1 s), that
// bound taken when a side never gets there (the decay of a pop).
//
// The apex and the crossings are read between samples, on the trace's
// band-limited interpolation (trace.at; the conditioned trace holds nothing
// above 70 Hz): the apex to 1/32 of a sample within one of the peak sample,
// each crossing bracketed on the samples and refined by bisection. A
// spike's flank spans one to four samples at 256 Hz, and a transition
// duration between two crossings does not depend on where the apex fell
// between samples, as a width measured from the peak sample does: the same
// waveform sampled on a grid moved by half a sample reads the same
// (TestAsymmetryGridInvariant; FEATURES.md, c3).
//
// For a triangle, or the squared ramps ((t+R)/R)², ((F−t)/F)² of
// sampling/synth, rising from and falling to the baseline, c3 equals F/R;
// an overshoot past the baseline after the fall does not change it
// (TestAsymmetryOvershoot). Also returns the two base-to-base half-wave
// durations (ms). NaN when the baseline is not defined (too near the
// trace's start) or the apex is not above it.
func asymmetry(t *trace, ph phase, sc *scratch) (ratio, riseMS, fallMS float64) {
	riseMS = float64(ph.peak-ph.left) / t.fs * 1000
	fallMS = float64(ph.right-ph.peak) / t.fs * 1000
	b, ok := localBaseline(t, ph, sc)
	if !ok {
		return math.NaN(), riseMS, fallMS
	}
	u, v := t.apex(ph.peak, ph.sign)
	top := ph.sign * (v - b)
	if !(top > 0) {
		return math.NaN(), riseMS, fallMS
	}
	n := int(math.Round(returnMaxS * t.fs))
	at := func(l float64, dir int) float64 { return t.crossing(u, dir, ph.sign, b, l*top, n) }
	lo, hi := transitionLevels[0], transitionLevels[1]
	rise := at(hi, -1) - at(lo, -1)
	fall := at(lo, +1) - at(hi, +1)
	return math.Exp(math.Abs(math.Log(fall / rise))), riseMS, fallMS
}

// levelWidth returns the time, in samples, from the peak to where the trace
// in direction dir first falls to level above the baseline b (in the
// peak's polarity), linearly interpolated between samples; n (or the
// distance to the trace's end) when it does not within n samples. c2's
// return (waveDuration) is read with it.
func levelWidth(t *trace, ph phase, b float64, dir, n int, level float64) float64 {
	top := ph.sign * (float64(t.x[ph.peak]) - b)
	prev := top
	k := 1
	for i := ph.peak + dir; i >= t.lo && i < t.hi && k <= n; i, k = i+dir, k+1 {
		v := ph.sign * (float64(t.x[i]) - b)
		if v <= level {
			return float64(k-1) + (prev-level)/(prev-v)
		}
		prev = v
	}
	return float64(k - 1)
}
