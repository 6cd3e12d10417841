package detect

// phase is the main phase of a transient on one trace: the peak sample, the
// turning points that bound it on either side, and the peak's sign.
type phase struct {
	peak, left, right int     // sample indexes into the trace
	sign              float64 // +1 for a positive peak, −1 for a negative one
	amp               float64 // mean height of the two half-waves, physical units
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

// mainPhase walks outwards from the extremum at p of trace x to the base of
// the main phase on both sides, at most maxN samples each way. A flank ends
// at the first of: a turning point (the trace reverses by more than turnTol
// of the height reached so far, and by at least floor, physical units, so
// that noise on a flat trace is not a phase), or the point where its slope
// has fallen to flatFrac of its steepest.
func mainPhase(x []float32, p int, sign float64, maxN int, floor float64) phase {
	ph := phase{peak: p, sign: sign}
	top := sign * float64(x[p])
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
				if drop < flatFrac*steep {
					break
				}
				continue
			}
			if v-best > max(turnTol*(top-best), floor) {
				break
			}
		}
		return bi
	}
	ph.left, ph.right = walk(-1), walk(+1)
	ph.amp = top - sign*(float64(x[ph.left])+float64(x[ph.right]))/2
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
