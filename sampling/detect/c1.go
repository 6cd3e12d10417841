package detect

import "math"

// sharpStepS is the step of the second difference that measures curvature at
// the peak. 10 ms spans a few samples at common EEG rates, so the measure
// reflects the shape of the apex rather than sample-to-sample noise, and is
// short against the 20 ms shortest spike.
const sharpStepS = 0.010

// spiky measures criterion 1, spiky morphology (Kane et al. 2017):
//
//	duration  D = (right − left)/fs, the main phase between its turning points, ms
//	sharpness S = −sign · (x[p−h] − 2x[p] + x[p+h]) / (h/fs)² / A,   1/s²
//	phases    the number of consecutive half-waves at least 20 % of A high,
//	          the main phase included, within 300 ms on either side
//
// with A the main-phase amplitude (mean height of the two half-waves) and h
// the sample count nearest sharpStepS. S is the curvature at the peak per
// unit of amplitude: for a triangle with rise R and fall F (seconds, both
// longer than h) it is (1/R + 1/F)/h exactly, for a smooth cos² bump of
// length T it is about 2π²/T². Normalising by A rather than |x(p)| keeps a
// baseline offset out of the measure.
func spiky(t *trace, ph phase) (durMS, sharp float64, phases int) {
	durMS = float64(ph.right-ph.left) / t.fs * 1000
	h := max(1, int(math.Round(sharpStepS*t.fs)))
	p := ph.peak
	if p-h < t.lo || p+h >= t.hi || !(ph.amp > 0) {
		return durMS, math.NaN(), 1
	}
	hs := float64(h) / t.fs
	d2 := (float64(t.x[p-h]) - 2*float64(t.x[p]) + float64(t.x[p+h])) / (hs * hs)
	sharp = -ph.sign * d2 / ph.amp
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
