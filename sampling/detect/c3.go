package detect

import "math"

// asymLevels are the shares of the peak's height above the local baseline,
// counted down from the peak, at which asymmetry compares the widths of the
// two sides.
var asymLevels = [...]float64{0.5, 0.6, 0.7, 0.8}

// asymmetry measures criterion 3, asymmetric waveform (Kane et al. 2017:
// "a sharply rising ascending phase and a more slowly decaying descending
// phase, or vice versa"):
//
//	c3 = exp |(1/4) Σ_l ln(w_fall(l) / w_rise(l))| ≥ 1,  l ∈ {0.5, 0.6, 0.7, 0.8}
//
// the geometric mean of the flank width ratio over four levels, folded so
// that either direction counts. w_rise(l) and w_fall(l) are the times from
// the peak to where each side of it first falls to L = b + (1 − l)·(x[p] −
// b), in the peak's polarity, linearly interpolated between samples and
// searched up to returnMaxS (1 s) away, that bound taken when a side never
// gets there (the decay of a pop); b is the local baseline, the median of
// the preBaseS before the main phase's left base (as oppositePhase and
// waveDuration). For a triangle, or the squared ramps ((t+R)/R)²,
// ((F−t)/F)² of sampling/synth, rising from and falling to the baseline,
// every level's ratio, and so c3, equals F/R; an overshoot past the
// baseline after the fall does not change it (TestAsymmetryOvershoot).
// FEATURES.md (c3) says why four levels, and why shares of the height
// above the baseline. Also returns the two base-to-base half-wave
// durations (ms). NaN when the baseline is not defined (too near the
// trace's start) or the peak is not above it.
func asymmetry(t *trace, ph phase, sc *scratch) (ratio, riseMS, fallMS float64) {
	riseMS = float64(ph.peak-ph.left) / t.fs * 1000
	fallMS = float64(ph.right-ph.peak) / t.fs * 1000
	b, ok := localBaseline(t, ph, sc)
	if !ok {
		return math.NaN(), riseMS, fallMS
	}
	top := ph.sign * (float64(t.x[ph.peak]) - b)
	if !(top > 0) {
		return math.NaN(), riseMS, fallMS
	}
	n := int(math.Round(returnMaxS * t.fs))
	var sum float64
	for _, l := range asymLevels {
		level := (1 - l) * top
		r, f := levelWidth(t, ph, b, -1, n, level), levelWidth(t, ph, b, +1, n, level)
		sum += math.Log(f / r)
	}
	return math.Exp(math.Abs(sum / float64(len(asymLevels)))), riseMS, fallMS
}

// levelWidth returns the time, in samples, from the peak to where the trace
// in direction dir first falls to level above the baseline b (in the
// peak's polarity), linearly interpolated between samples; n (or the
// distance to the trace's end) when it does not within n samples. c2's
// return (waveDuration) and c3's levels are both read with it.
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
