package detect

import "math"

// spiky measures criterion 1, spiky morphology (Kane et al. 2017: "sharp or
// spiky morphology (i.e. pointed peak)"):
//
//	duration  D = (right − left)/fs, the main phase between its turning points, ms
//	sharpness P = pointedness of the apex (see pointedness): the curvature at
//	          the peak per unit amplitude, relative to that of a sine half-wave
//	          of the same duration D; 1 for a sine, 4.15 for the cusp of two
//	          symmetric squared ramps
//	phases    the number of consecutive half-waves at least 20 % of A high,
//	          the main phase included, within 300 ms on either side
//
// with A the main-phase amplitude (the lower of the two half-wave heights).
// Relating the curvature to the duration makes P scale-free: a short wave is
// not counted as sharp merely for being short (that is criterion 2's
// business), only a peak more pointed than a rounded wave of its length is.
func spiky(t *trace, ph phase) (durMS, sharp float64, phases int) {
	durMS = float64(ph.right-ph.left) / t.fs * 1000
	sharp = pointedness(t.x, t.lo, t.hi, ph)
	if math.IsNaN(sharp) {
		return durMS, sharp, 1
	}
	phases = 1 + countPhases(t, ph.left, -1, ph) + countPhases(t, ph.right, +1, ph)
	return durMS, sharp, phases
}

// countPhases counts the half-waves beyond the turning point at start, in
// direction dir, that are at least 20 % of the main phase high, stopping at
// the first smaller one or 300 ms from the peak.
func countPhases(t *trace, start, dir int, ph phase) int {
	limit := int(0.3 * t.fs)
	floor := 0.2 * ph.amp
	sign := -ph.sign // the next half-wave rises towards the opposite polarity
	n, at := 0, start
	for n < 4 {
		q := mainPhaseDir(t.x, at, -sign, dir, t.lo, t.hi, limit-abs(at-ph.peak))
		if q < 0 {
			break
		}
		if math.Abs(float64(t.x[q])-float64(t.x[at])) < floor {
			break
		}
		n++
		at, sign = q, -sign
	}
	return n
}

// mainPhaseDir follows the trace from the turning point at i in direction
// dir while it moves towards polarity sign, and returns the next turning
// point, or −1 if the walk runs out of room (n samples or the trace ends).
func mainPhaseDir(x []float32, i int, sign float64, dir, lo, hi, n int) int {
	start := sign * float64(x[i])
	best, bi := start, i
	for j, k := i+dir, 0; j >= lo && j < hi && k < n; j, k = j+dir, k+1 {
		v := sign * float64(x[j])
		if v > best {
			best, bi = v, j
			continue
		}
		if best-v > turnTol*(best-start) && bi != i {
			return bi
		}
	}
	return -1
}

func abs(i int) int {
	if i < 0 {
		return -i
	}
	return i
}
