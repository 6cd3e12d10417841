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
	z     float64 // main-phase amplitude in background scales
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
const minPoint = 1.33

// rankPointCap caps the pointedness that enters an event's ranking, so a
// cusp of a few samples on a small wave does not outrank a large transient.
const rankPointCap = 4.0

// rank orders detections when events are merged: amplitude in background
// scales times capped pointedness, so a sharp transient anchors its event
// rather than a larger rounded background wave on another channel nearby.
func (d detection) rank() float64 { return d.z * min(d.point, rankPointCap) }

// findChannel appends to dets the extrema of x in [from, to) whose main
// phase lasts 20–200 ms and is at least thr background scales high.
// scaleAt gives the background scale at a sample.
func findChannel(dets []detection, d int, x []float32, from, to int, fs, thr float64, scaleAt func(i int) float64) []detection {
	maxN := int(math.Ceil(maxPhaseS * fs))
	minLen, maxLen := minPhaseS*fs, maxPhaseS*fs
	for i := max(from, 1); i < min(to, len(x)-1); i++ {
		ok, sign := isExtremum(x, i)
		if !ok {
			continue
		}
		sc := scaleAt(i)
		if !(sc > 0) {
			continue
		}
		ph := mainPhase(x, i, sign, maxN, 0.25*sc)
		n := float64(ph.right - ph.left)
		if n < minLen || n > maxLen || ph.amp < thr*sc {
			continue
		}
		pt := pointedness(x, 0, len(x), ph)
		if !(pt >= minPoint) {
			continue
		}
		dets = append(dets, detection{deriv: d, ph: ph, z: ph.amp / sc, point: pt})
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
