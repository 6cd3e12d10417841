package detect

import "math"

// phase is the main phase of a transient on one trace: the peak sample, the
// turning points that bound it on either side, and the peak's sign.
type phase struct {
	peak, left, right int     // sample indexes into the trace
	sign              float64 // +1 for a positive peak, −1 for a negative one
	amp               float64 // height of the lower of the two half-waves, physical units
}

// turnTol is the reversal, as a fraction of the half-wave height reached so
// far, that ends a half-wave: smaller wiggles riding on the flank do not count
// as turning points (common practice: hysteresis on turning points).
const turnTol = 0.15

// flatFrac is the slope, as a fraction of the flank's steepest slope so far,
// at which a flank counts as having reached its base: a transient that
// starts from the background with zero slope (Kane et al. 2017 describe the
// main phase from baseline to baseline) ends there, even when slow background
// activity keeps the trace moving the same way (common practice).
const flatFrac = 0.1

// flatFrom is the share of the prominence a flank must have descended before
// a flattening slope may end it: a background wiggle high on the flank
// briefly flattens the slope, but only the approach to the base flattens it
// after most of the height is gone (common practice).
const flatFrom = 0.5

// prominence returns the topographic prominence of the extremum at p
// (SciPy's peak_prominences definition, window ±maxN samples): the height of
// sign·x[p] above the higher of the lowest points on either side, each side
// searched until the trace rises above the peak or the window ends.
func prominence(x []float32, p int, sign float64, maxN int) float64 {
	top := sign * float64(x[p])
	low := func(step int) float64 {
		m := top
		for j, n := p+step, 0; j >= 0 && j < len(x) && n < maxN; j, n = j+step, n+1 {
			v := sign * float64(x[j])
			if v > top {
				break
			}
			m = min(m, v)
		}
		return m
	}
	return top - max(low(-1), low(+1))
}

// mainPhase walks outwards from the extremum at p of trace x to the base of
// the main phase on both sides, at most maxN samples each way. A flank ends
// at the first of: a turning point (the trace reverses by more than turnTol
// of the peak's prominence, and by at least floor, physical units, so that
// noise on a flat trace is not a phase), or, once half the prominence has
// been descended, the point where its slope has fallen to flatFrac of its
// steepest. Scaling the hysteresis by the prominence, not by the height
// reached so far, keeps background ripples riding on the flank from ending
// the phase early.
func mainPhase(x []float32, p int, sign float64, maxN int, floor float64) phase {
	ph := phase{peak: p, sign: sign}
	top := sign * float64(x[p])
	hyst := max(turnTol*prominence(x, p, sign, maxN), floor)
	walk := func(step int) int {
		best, bi := top, p
		prev, steep := top, 0.0
		for j, n := p+step, 0; j >= 0 && j < len(x) && n < maxN; j, n = j+step, n+1 {
			v := sign * float64(x[j])
			drop := prev - v
			prev = v
			if v < best {
				best, bi = v, j
				steep = max(steep, drop)
				if top-best >= flatFrom*hyst/turnTol && drop < flatFrac*steep {
					break
				}
				continue
			}
			if v-best > hyst {
				break
			}
		}
		return bi
	}
	ph.left, ph.right = walk(-1), walk(+1)
	ph.amp = top - max(sign*float64(x[ph.left]), sign*float64(x[ph.right]))
	return ph
}

// isExtremum reports whether x[i] is a local maximum (sign +1) or minimum
// (sign −1) in the plateau-tolerant sense: not exceeded by its left
// neighbour, strictly above its right one.
func isExtremum(x []float32, i int) (bool, float64) {
	if i <= 0 || i >= len(x)-1 {
		return false, 0
	}
	a, b, c := x[i-1], x[i], x[i+1]
	switch {
	case b >= a && b > c:
		return true, 1
	case b <= a && b < c:
		return true, -1
	}
	return false, 0
}

// pointStep is the curvature step of pointedness as a fraction of the
// main-phase duration: short enough that a cusp and a rounded apex differ
// several-fold, long enough to span more than the low-pass smoothing of the
// apex on all but the briefest spikes.
const pointStep = 1.0 / 6

// pointedness is the apex curvature of the main phase relative to that of a
// sine half-wave of the same base-to-base duration D and height A:
//
//	P = −sign·(x[p−h] − 2x[p] + x[p+h]) / A  ÷  (2 − 2cos(πh/D)),
//
// h = max(2, round(D/6)) samples. A sine half-wave scores 1 whatever its
// length, a triangle of duration D (step h = D/6) 2.49, a cos² bump 1.87, the
// cusp of two squared ramps ((t+R)/R)², ((F−t)/F)² with R = F = D/2 4.15: a
// scale-free measure of a pointed peak (Kane et al. 2017, criterion 1) that
// does not grow merely because a wave is short. NaN when the step leaves the
// trace or the amplitude is not positive.
func pointedness(x []float32, lo, hi int, ph phase) float64 {
	D := ph.right - ph.left
	h := max(2, int(math.Round(float64(D)*pointStep)))
	p := ph.peak
	if p-h < lo || p+h >= hi || !(ph.amp > 0) || D <= h {
		return math.NaN()
	}
	d2 := float64(x[p-h]) - 2*float64(x[p]) + float64(x[p+h])
	return -ph.sign * d2 / ph.amp / (2 - 2*math.Cos(math.Pi*float64(h)/float64(D)))
}
