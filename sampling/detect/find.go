package detect

import (
	"math"
	"slices"
	"sort"
)

// detection is one channel's candidate peak.
type detection struct {
	deriv int
	ph    phase
	z     float64 // matched response in its background scales
	amp   float64 // main-phase amplitude in broadband background scales
	point float64 // pointedness of the apex
}

// Main-phase duration limits of a sharp transient: 20 ms, the shortest
// spike, to 200 ms, the longest sharp wave (Kane et al. 2017).
const (
	minPhaseS = 0.020
	maxPhaseS = 0.200
)

// minPoint is the least pointedness of a detection: a third more curved at
// the apex than a sine half-wave of the same duration. Rounded background
// waves score about 1 or less; the finder stays liberal (a cos² bump, 1.87,
// passes) but ignores the bulk of the ongoing rhythm.
var minPoint = 1.33

// minAmpZ is the least main-phase amplitude in broadband background scales.
var minAmpZ = 1.0

// rankPointCap caps the pointedness that enters an event's ranking, so a
// cusp of a few samples on a small wave does not outrank a large transient.
const rankPointCap = 4.0

// rank orders detections when events are merged: amplitude in background
// scales times capped pointedness, so a sharp transient anchors its event
// rather than a larger rounded background wave on another channel nearby.
func (d detection) rank() float64 { return d.z * min(d.point, rankPointCap) }

// examine measures the extremum at i (of the given sign) of derivation d's
// trace x: its main phase, matched response z (zAt), broadband amplitude
// and pointedness. pass reports whether it is a detection: z ≥ thr, a main
// phase of 20–200 ms at least minAmpZ broadband scales high, and a pointed
// apex. sc is the broadband background scale at i.
func examine(x []float32, d, i int, sign, fs, thr, sc, z float64) (det detection, pass bool) {
	maxN := int(math.Ceil(maxPhaseS * fs))
	ph := mainPhase(x, i, sign, maxN, 0.25*sc)
	det = detection{deriv: d, ph: ph, z: z, amp: ph.amp / sc, point: pointedness(x, 0, len(x), ph)}
	n := float64(ph.right - ph.left)
	pass = z >= thr && n >= minPhaseS*fs && n <= maxPhaseS*fs && det.amp >= minAmpZ && det.point >= minPoint
	return det, pass
}

// findChannel appends to dets the detections (see examine) among the
// extrema of x in [from, to). scaleAt gives the broadband background scale
// at a sample, zAt the matched response of a sign at a sample.
func findChannel(dets []detection, d int, x []float32, from, to int, fs, thr float64, scaleAt func(i int) float64, zAt func(i int, sign float64) float64) []detection {
	for i := max(from, 1); i < min(to, len(x)-1); i++ {
		ok, sign := isExtremum(x, i)
		if !ok {
			continue
		}
		// the matched response first: it rejects most extrema for the
		// cost of a few loads
		z := zAt(i, sign)
		if !(z >= thr) {
			continue
		}
		sc := scaleAt(i)
		if !(sc > 0) {
			continue
		}
		if det, pass := examine(x, d, i, sign, fs, thr, sc, z); pass {
			dets = append(dets, det)
		}
	}
	return dets
}

// cluster is one event: its strongest detection and every detection merged
// into it.
type cluster struct {
	best    detection
	members []int // derivation indexes, ascending, distinct
}

// merge groups detections whose peaks lie within tol samples of a stronger
// detection's peak, strongest first: each event is anchored on its largest
// detection (by background scales), and weaker detections nearby on any
// channel, including the same one, join it rather than starting their own.
func merge(dets []detection, tol int) []cluster {
	if len(dets) == 0 {
		return nil
	}
	byTime := make([]int, len(dets))
	for i := range byTime {
		byTime[i] = i
	}
	sort.SliceStable(byTime, func(a, b int) bool { return dets[byTime[a]].ph.peak < dets[byTime[b]].ph.peak })
	byZ := slices.Clone(byTime)
	sort.SliceStable(byZ, func(a, b int) bool { return dets[byZ[a]].rank() > dets[byZ[b]].rank() })
	times := make([]int, len(byTime))
	for k, i := range byTime {
		times[k] = dets[i].ph.peak
	}
	taken := make([]bool, len(dets))
	var out []cluster
	for _, i := range byZ {
		if taken[i] {
			continue
		}
		c := cluster{best: dets[i]}
		t := dets[i].ph.peak
		k := sort.SearchInts(times, t-tol)
		for ; k < len(times) && times[k] <= t+tol; k++ {
			j := byTime[k]
			if taken[j] {
				continue
			}
			taken[j] = true
			c.members = append(c.members, dets[j].deriv)
		}
		slices.Sort(c.members)
		c.members = slices.Compact(c.members)
		out = append(out, c)
	}
	sort.SliceStable(out, func(a, b int) bool { return out[a].best.ph.peak < out[b].best.ph.peak })
	return out
}

// Reach of an event's complex around its anchoring peak: an IED's main
// phase may be followed by an opposite-polarity overshoot and an after-going
// slow wave lasting up to several hundred ms (Kane et al. 2017, "spike-and-
// slow-wave complex"), each of which can pass the detection tests on its
// own. A weaker event within complexAfterS after a stronger one, or within
// complexBeforeS before it, is taken to be part of the stronger one's
// complex and is not reported separately, so the panel does not rate one
// discharge twice (common practice: non-maximum suppression).
var (
	complexBeforeS = 0.0
	complexAfterS  = 0.400
)

// suppress drops, strongest first (by rank), each event whose anchoring
// peak lies within before samples before, or after samples after, the peak
// of a stronger event kept. out is in onset order, as cl.
func suppress(cl []cluster, before, after int) []cluster {
	order := make([]int, len(cl))
	for i := range order {
		order[i] = i
	}
	sort.SliceStable(order, func(a, b int) bool { return cl[order[a]].best.rank() > cl[order[b]].best.rank() })
	keep := make([]bool, len(cl))
	var kept []int // peaks of kept events
	for _, i := range order {
		p := cl[i].best.ph.peak
		ok := true
		for _, q := range kept {
			if p >= q-before && p <= q+after {
				ok = false
				break
			}
		}
		if ok {
			keep[i] = true
			kept = append(kept, p)
		}
	}
	out := cl[:0]
	for i, c := range cl {
		if keep[i] {
			out = append(out, c)
		}
	}
	return out
}
