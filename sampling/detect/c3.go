package detect

import "math"

// asymLevel is the share of the lower flank's height below the peak at
// which asymmetry compares the two flanks' widths.
const asymLevel = 0.7

// asymmetry measures criterion 3, asymmetric waveform (Kane et al. 2017:
// "a sharply rising ascending phase and a more slowly decaying descending
// phase, or vice versa"):
//
//	c3 = max(w_rise, w_fall) / min(w_rise, w_fall) ≥ 1
//
// with w_rise and w_fall the widths of the two flanks at one level, L =
// x[p] − 0.7·min(h_rise, h_fall), h the height of each flank (peak to its
// base): the time from the peak to where each flank crosses L, linearly
// interpolated between samples. For a triangle, or the squared ramps
// ((t+R)/R)², ((F−t)/F)² of sampling/synth, with equal bases, it equals F/R
// at any level. One level for both flanks, set by the lower one, keeps a
// symmetric wave whose fall runs on into an overshoot at 1: half of each
// flank's own height (the measure used before) put the falling flank's
// level lower by half the overshoot and read a symmetric IED with a 40 %
// overshoot as 1.5. The upper part of a flank is where the transient
// dominates the background, and 0.7 rather than 0.5 averages over more
// samples of a short flank. Either direction counts, so the measure is ≥ 1
// by construction. Also returns the two base-to-base half-wave durations
// (ms). NaN when a flank never reaches L.
func asymmetry(t *trace, ph phase) (ratio, riseMS, fallMS float64) {
	riseMS = float64(ph.peak-ph.left) / t.fs * 1000
	fallMS = float64(ph.right-ph.peak) / t.fs * 1000
	top := ph.sign * float64(t.x[ph.peak])
	h := min(top-ph.sign*float64(t.x[ph.left]), top-ph.sign*float64(t.x[ph.right]))
	level := top - asymLevel*h
	r, f := flankWidth(t, ph, ph.left, -1, level), flankWidth(t, ph, ph.right, +1, level)
	if !(r > 0) || !(f > 0) {
		return math.NaN(), riseMS, fallMS
	}
	return max(r, f) / min(r, f), riseMS, fallMS
}

// flankWidth returns the time, in samples, from the peak to where the flank
// towards base (direction dir) first falls to level (in the peak's
// polarity), linearly interpolated between samples; NaN if it does not
// before the base.
func flankWidth(t *trace, ph phase, base, dir int, level float64) float64 {
	prev := ph.sign * float64(t.x[ph.peak])
	for i, k := ph.peak+dir, 1; i != base+dir; i, k = i+dir, k+1 {
		v := ph.sign * float64(t.x[i])
		if v <= level {
			return float64(k-1) + (prev-level)/(prev-v)
		}
		prev = v
	}
	return math.NaN()
}
