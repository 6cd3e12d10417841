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
// at a sample; b holds x's hat responses and their scales (bank.prepare,
// over blocks of length block from start), from which the matched response
// z of an extremum is read (bank.z). Most extrema of the background cannot
// reach the threshold: z ≥ thr needs some hat with sign·response ≥
// thr·scale, which is checked first, by multiplication against limits
// computed once per block, with a margin of 1e-9 for rounding; only where
// it passes is z computed, exactly, so the detections are those of
// computing z at every extremum.
func findChannel(dets []detection, d int, x []float32, from, to int, fs, thr float64, scaleAt func(i int) float64, b *bank, start, block int) []detection {
	var buf [8]float64
	lim := buf[:0]
	if len(b.hats) > len(buf) {
		lim = make([]float64, 0, len(b.hats))
	}
	lim = lim[:len(b.hats)]
	tt := thr * (1 - 1e-9)
	next := math.MinInt // first sample past the block whose limits lim holds
	setLim := func(i int) {
		bi := max(i-start, 0) / block
		next = start + (bi+1)*block
		for k := range lim {
			sc := b.scale[k]
			lim[k] = tt * sc[min(bi, len(sc)-1)]
			if !(thr > 0) {
				lim[k] = math.Inf(-1)
			}
		}
	}
	// test examines an extremum that may reach thr, with the exact z
	test := func(i int, sign float64) {
		z := b.z(i, sign, start, block)
		if !(z >= thr) {
			return
		}
		sc := scaleAt(i)
		if !(sc > 0) {
			return
		}
		if det, pass := examine(x, d, i, sign, fs, thr, sc, z); pass {
			dets = append(dets, det)
		}
	}
	// slow is the search over [lo, hi), extremum by extremum
	slow := func(lo, hi int) {
		for i := lo; i < hi; i++ {
			ok, sign := isExtremum(x, i)
			if !ok {
				continue
			}
			if i >= next {
				setLim(i)
			}
			if b.mayReach(i, sign, lim) {
				test(i, sign)
			}
		}
	}
	lo, hi := max(from, 1), min(to, len(x)-1)
	flo, fhi := b.sweepRange(lo, hi, len(lim))
	if flo >= fhi {
		slow(lo, hi)
		return dets
	}
	slow(lo, flo)
	b.sweep4(x, flo, fhi, lim, &next, setLim, test)
	slow(fhi, hi)
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

// One discharge, one event. An IED's main phase may be followed by an
// opposite-polarity overshoot and an after-going slow wave, the whole
// complex lasting up to about 500 ms (spike or sharp wave ≤ 200 ms, Kane et
// al. 2017, and its slow wave), and each phase, on the peak channel or a
// neighbour, can pass the detection tests on its own. So, strongest event
// first (by rank), every weaker event within complexBeforeS before or
// complexAfterS after it joins its complex and is not reported on its own
// (non-maximum suppression with a refractory period; common practice). The
// complex is reported at its earliest event that shares a derivation with
// the strongest, lies at most complexLeadS before it and has at least
// complexFrac of its rank: a sharp wave's overshoot can outrank the wave
// (its apex is narrower), and the discharge begins with its main phase.
// An earlier event of the same field with between complexKeepFrac and
// complexFrac of the strongest's rank is reported as well: whether it is
// the main phase or a background wave before it is left to the panel.
// FEATURES.md (finder) gives the figures these were chosen on.
var (
	complexBeforeS  = 0.500
	complexAfterS   = 0.500
	complexLeadS    = 0.200
	complexFrac     = 0.6
	complexKeepFrac = 0.4
)

// complexes groups cl (onset order) into discharges as described above and
// returns the reported events, in onset order. before and after are the
// complex's reach around its strongest event, in samples; frac the share
// of its rank an earlier event needs to stand for it; fs the rate.
func complexes(cl []cluster, before, after int, frac, fs float64) []cluster {
	order := make([]int, len(cl))
	for i := range order {
		order[i] = i
	}
	sort.SliceStable(order, func(a, b int) bool { return cl[order[a]].best.rank() > cl[order[b]].best.rank() })
	taken := make([]bool, len(cl))
	var out []cluster
	var mine []int // this complex's events
	for _, s := range order {
		if taken[s] {
			continue
		}
		t := cl[s].best.ph.peak
		lo := sort.Search(len(cl), func(i int) bool { return cl[i].best.ph.peak >= t-before })
		top := frac * cl[s].best.rank()
		lead := int(complexLeadS * fs)
		rep := -1
		mine = mine[:0]
		for i := lo; i < len(cl) && cl[i].best.ph.peak <= t+after; i++ {
			if taken[i] {
				continue
			}
			taken[i] = true
			mine = append(mine, i)
			if rep < 0 && (i == s || eligible(cl[i], cl[s], top, lead)) {
				rep = i
			}
		}
		out = append(out, cl[rep])
		if rep == s && complexKeepFrac < frac {
			// an earlier phase too weak to stand for the complex but not
			// clearly background is reported as well: which of the two is
			// the discharge's main phase is then the panel's call
			for _, i := range mine {
				if i < s && eligible(cl[i], cl[s], complexKeepFrac*cl[s].best.rank(), lead) {
					out = append(out, cl[i])
					break
				}
			}
		}
	}
	sort.SliceStable(out, func(a, b int) bool { return out[a].best.ph.peak < out[b].best.ph.peak })
	return out
}

// eligible reports whether e, earlier than the strongest event s of its
// complex, may stand for the complex: it shares a derivation with s, lies
// at most lead samples before it and reaches a rank of top.
func eligible(e, s cluster, top float64, lead int) bool {
	return e.best.ph.peak >= s.best.ph.peak-lead && e.best.rank() >= top && shares(e.members, s.members)
}

// shares reports whether two ascending index lists have an element in common.
func shares(a, b []int) bool {
	for i, j := 0, 0; i < len(a) && j < len(b); {
		switch {
		case a[i] == b[j]:
			return true
		case a[i] < b[j]:
			i++
		default:
			j++
		}
	}
	return false
}
