package detect

import "math"

// asymmetry measures criterion 3, asymmetric waveform (Kane et al. 2017:
// typically a sharply rising ascending phase and a more slowly decaying
// descending phase):
//
//	c3 = max(s_rise, s_fall) / min(s_rise, s_fall) ≥ 1
//
// with s_rise and s_fall the steepest sample-to-sample slopes (absolute
// first differences) on the rising flank [left, peak] and the falling flank
// [peak, right]. Steepest slopes sit near the apex, where the transient
// dominates the background, so the ratio is less sensitive to where noise
// puts the turning points than a ratio of half-wave durations; for a
// triangle, or the squared ramps ((t+R)/R)², ((F−t)/F)², it equals F/R.
// Either direction counts, so the measure is ≥ 1 by construction. Also
// returns the two half-wave durations (ms). NaN when a flank is flat.
func asymmetry(t *trace, ph phase) (ratio, riseMS, fallMS float64) {
	riseMS = float64(ph.peak-ph.left) / t.fs * 1000
	fallMS = float64(ph.right-ph.peak) / t.fs * 1000
	steepest := func(a, b int) float64 {
		var m float64
		for i := a; i < b; i++ {
			m = max(m, math.Abs(float64(t.x[i+1])-float64(t.x[i])))
		}
		return m
	}
	r, f := steepest(ph.left, ph.peak), steepest(ph.peak, ph.right)
	if !(r > 0) || !(f > 0) {
		return math.NaN(), riseMS, fallMS
	}
	return max(r, f) / min(r, f), riseMS, fallMS
}
