package detect

import "math"

// spiky measures criterion 1, a di- or triphasic wave with spiky
// morphology (Kane et al. 2017: "di- or tri-phasic waves with sharp or spiky
// morphology (i.e. pointed peak)"):
//
//	duration  D = (right − left)/fs, the main phase between its turning points, ms
//	point     P = pointedness of the apex (see pointedness): the curvature at
//	          the peak per unit amplitude, relative to that of a sine half-wave
//	          of the same duration D; 1 for a sine, 4.15 for the cusp of two
//	          symmetric squared ramps
//	opposite  r = the opposite-polarity phase after the main phase relative to
//	          the main phase (see oppositePhase)
//	spikiness S = sqrt(P · q), q = max(0, 1 − |1 − r|)
//	phases    the number of consecutive half-waves at least 20 % of A high,
//	          the main phase included, within 300 ms on either side
//
// with A the main-phase amplitude (the lower of the two half-wave heights).
// S, the headline, needs both halves of the definition: a pointed apex and a
// second phase of the other polarity. Pointedness alone ranks a pop's
// one-sample step, the most pointed apex there is, above every discharge;
// a monophasic wave has q = 0 whatever its apex. q falls again for r > 1,
// to 0 at r = 2, because an "opposite phase" larger than the main phase
// means the main phase is a wiggle riding on a larger wave, not the
// discharge itself: the zero-phase filter's ringing just before a pop's
// step is the commonest case (FEATURES.md, c1, gives the figures). The
// geometric mean keeps S scale-free (unit none), like P and q, and lets
// neither half dominate.
// Relating the curvature to the duration makes P scale-free too: a short
// wave is not counted as sharp merely for being short (that is criterion
// 2's business), only a peak more pointed than a rounded wave of its length
// is.
func spiky(t *trace, ph phase, sc *scratch) (durMS, point, spike float64, phases int) {
	durMS = float64(ph.right-ph.left) / t.fs * 1000
	point = pointedness(t.x, t.lo, t.hi, ph)
	if math.IsNaN(point) {
		return durMS, point, math.NaN(), 1
	}
	spike = spikiness(point, oppositePhase(t, ph, sc))
	phases = 1 + countPhases(t, ph.left, -1, ph) + countPhases(t, ph.right, +1, ph)
	return durMS, point, spike, phases
}

// spikiness combines pointedness p and opposite-phase ratio r into
// sqrt(p · q), q = max(0, 1 − |1 − r|): q = r up to r = 1 and falls back to
// 0 at r = 2. 0 when either is not positive, NaN when either is.
func spikiness(p, r float64) float64 {
	if math.IsNaN(p) || math.IsNaN(r) {
		return math.NaN()
	}
	q := 1 - math.Abs(1-r)
	if !(p > 0) || !(q > 0) {
		return 0
	}
	return math.Sqrt(p * q)
}

// oppMaxS caps the stretch after the main phase searched for the opposite
// phase, s: the second phase of a di- or triphasic wave adjoins the first,
// while a window as long as a 200–400 ms blink's own duration finds a
// background wave of the other polarity by chance (common practice).
const oppMaxS = 0.1

// preBaseS is the stretch before the main phase whose median is the local
// baseline of oppositePhase, s.
const preBaseS = 0.3

// oppositePhase returns the largest excursion of the polarity opposite to
// the peak's within one main-phase duration D, at most oppMaxS, after the
// main phase's right base (the base included), over the height of the peak,
// both measured from the local baseline b, the median of the preBaseS
// before the left base:
//
//	r = max_{i ∈ [right, right+min(D, 100 ms)]} (−sign·(x[i] − b)) / (sign·(x[p] − b))
//
// The baseline is taken before the event on purpose: a pop's or a blink's
// slow return lifts any median that reaches after the peak, and a median
// ignores the event's own
// samples only if it stays clear of them. Only the phase after the main one
// is looked for: it is present in both the di- and the triphasic form, and
// the stretch before the step of a pop holds only background. NaN when the
// peak is not above the baseline or the trace is too short.
func oppositePhase(t *trace, ph phase, sc *scratch) float64 {
	D := min(ph.right-ph.left, int(math.Round(oppMaxS*t.fs)))
	b, ok := localBaseline(t, ph, sc)
	if !ok || ph.right+D >= t.hi {
		return math.NaN()
	}
	top := ph.sign * (float64(t.x[ph.peak]) - b)
	if !(top > 0) {
		return math.NaN()
	}
	opp := 0.0
	for _, v := range t.x[ph.right : ph.right+D+1] {
		opp = max(opp, -ph.sign*(float64(v)-b))
	}
	return opp / top
}

// localBaseline returns the median of the preBaseS before the main phase's
// left base, the baseline c1's opposite phase, c2's return and c3's levels
// are measured from; ok is false when that stretch starts before t.lo.
func localBaseline(t *trace, ph phase, sc *scratch) (b float64, ok bool) {
	a := ph.left - int(math.Round(preBaseS*t.fs))
	if a < t.lo {
		return 0, false
	}
	sc.med = append(sc.med[:0], t.x[a:ph.left]...)
	return median32(sc.med), true
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
