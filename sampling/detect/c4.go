package detect

import "math"

// Geometry of the after-going slow wave measure, s.
const (
	slowWinS  = 0.4 // the slow-wave window after the main phase
	slowBaseS = 0.2 // the baseline window before it
	slowHopS  = 0.05
)

// slowWave measures criterion 4, an associated after-going slow wave (Kane et
// al. 2017):
//
//	a(u) = mean(x[u+g … u+g+W]) − mean(x[u−B … u])
//	e    = sign · min(sign·a(left), sign·(mean(x[right … right+W]) − x[right]))
//	c4   = e / sqrt(mean over background u of a(u)²)
//
// with W = 400 ms, B = 200 ms, g the main-phase duration (so a(left) is the
// mean of the 400 ms after the main phase minus the mean of the 200 ms before
// it) and sign the peak's polarity: an after-going slow wave has the polarity
// of the spike, so the signed mean is large and positive. The denominator is
// the root mean square of the same statistic with the same geometry at every
// 50 ms within the background ranges (trace.background): c4 is how many
// background standard deviations the post-event mean departs from what the
// background does on its own, a matched, tuning-free null. A plain 1–4 Hz
// band power was not used because the main phase of a sharp wave has much of
// its own energy there and rings into the window after it.
//
// The second term of the minimum asks for a wave of its own: after a
// spike the main phase ends at the opposite phase's trough and the slow
// wave rises from there, so the window's mean lies well above the right
// base and the first term is the smaller; the slow return of a pop or any
// monophasic wave lies above the pre-event baseline too, but keeps falling
// from the point where the main phase ended, so its window mean lies below
// that point and it is not counted as an after-going slow wave. (g = right
// − left, so both windows start at the right base.) Unit: background
// standard deviations of the same statistic; FEATURES.md (c4) gives the
// figures the second term was adopted on. NaN when the background holds no
// full geometry.
func slowWave(t *trace, ph phase, sc *scratch) float64 {
	W, B := int(math.Round(slowWinS*t.fs)), int(math.Round(slowBaseS*t.fs))
	g := ph.right - ph.left
	hop := max(1, int(math.Round(slowHopS*t.fs)))
	lo := max(t.lo, ph.peak-int(bgSpanS*t.fs)-B-g-W)
	hi := min(t.hi, ph.peak+int(bgSpanS*t.fs)+g+W+1)
	// prefix sums over [lo, hi)
	sc.cum = append(sc.cum[:0], 0)
	var s float64
	for _, v := range t.x[lo:hi] {
		s += float64(v)
		sc.cum = append(sc.cum, s)
	}
	mean := func(a, b int) float64 { return (sc.cum[b-lo] - sc.cum[a-lo]) / float64(b-a) }
	stat := func(u int) (float64, bool) {
		if u-B < lo || u+g+W > hi {
			return 0, false
		}
		return mean(u+g, u+g+W) - mean(u-B, u), true
	}
	ev, ok := stat(ph.left)
	if !ok {
		return math.NaN()
	}
	if own := mean(ph.right, ph.right+W) - float64(t.x[ph.right]); ph.sign*own < ph.sign*ev {
		ev = own
	}
	var ss float64
	k := 0
	for _, r := range t.background(ph.peak) {
		// the whole geometry must lie in the range
		for u := r[0] + B; u+g+W <= r[1]; u += hop {
			if a, ok := stat(u); ok {
				ss += a * a
				k++
			}
		}
	}
	if k == 0 || ss == 0 {
		return math.NaN()
	}
	return ph.sign * ev / math.Sqrt(ss/float64(k))
}
