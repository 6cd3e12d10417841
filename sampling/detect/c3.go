package detect

import "math"

// asymLevels are the shares of the lower flank's height below the peak at
// which asymmetry compares the two flanks' widths.
var asymLevels = [...]float64{0.5, 0.6, 0.7, 0.8}

// asymmetry measures criterion 3, asymmetric waveform (Kane et al. 2017:
// "a sharply rising ascending phase and a more slowly decaying descending
// phase, or vice versa"):
//
//	c3 = exp |(1/4) Σ_l ln(w_fall(l) / w_rise(l))| ≥ 1,  l ∈ {0.5, 0.6, 0.7, 0.8}
//
// the geometric mean of the flank width ratio over four levels, folded so
// that either direction counts. w_rise(l) and w_fall(l) are the widths of
// the two flanks at one level, L = x[p] − l·min(h_rise, h_fall), h the
// height of each flank (peak to its base): the time from the peak to where
// each flank crosses L, linearly interpolated between samples. For a
// triangle, or the squared ramps ((t+R)/R)², ((F−t)/F)² of sampling/synth,
// with equal bases, every level's ratio, and so c3, equals F/R. One level
// set by the lower flank, for both flanks, keeps a symmetric wave whose
// fall runs on into an overshoot at 1: half of each flank's own height (the
// measure used before) put the falling flank's level lower by half the
// overshoot and read a symmetric IED with a 40 % overshoot as 1.5. The
// upper part of a flank is where the transient dominates the background; a
// spike's upper flank spans one to four samples at 256 Hz, and averaging
// the log ratio over four levels averages the background's and the
// sampling grid's error over more crossings than one level does. Also
// returns the two base-to-base half-wave durations (ms). NaN when a flank
// never reaches a level.
func asymmetry(t *trace, ph phase) (ratio, riseMS, fallMS float64) {
	riseMS = float64(ph.peak-ph.left) / t.fs * 1000
	fallMS = float64(ph.right-ph.peak) / t.fs * 1000
	top := ph.sign * float64(t.x[ph.peak])
	h := min(top-ph.sign*float64(t.x[ph.left]), top-ph.sign*float64(t.x[ph.right]))
	var sum float64
	for _, l := range asymLevels {
		level := top - l*h
		r, f := flankWidth(t, ph, ph.left, -1, level), flankWidth(t, ph, ph.right, +1, level)
		if !(r > 0) || !(f > 0) {
			return math.NaN(), riseMS, fallMS
		}
		sum += math.Log(f / r)
	}
	return math.Exp(math.Abs(sum / float64(len(asymLevels)))), riseMS, fallMS
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
