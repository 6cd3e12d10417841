package detect

import "math"

// Post-event window of the disruption measure, s after the peak.
const (
	postFromS = 0.3
	postToS   = 1.0
)

// floorBlockS is the length of the blocks, s, whose quietest one estimates
// the channel's floor (see disruption); blocks overlap by half.
const floorBlockS = 0.5

// disruption measures criterion 5, disruption of the surrounding background
// (Kane et al. 2017), as post-event attenuation of the background above the
// channel's floor:
//
//	c5 = −½ ln( (msd(post) − φ) / (msd(bg) − φ) )
//
// with msd the mean square of the first difference Δx over [p+0.3 s,
// p+1.0 s] (post) and over the background ranges of trace.background (bg),
// and φ the floor: the smallest msd of the half-overlapping 0.5 s blocks of
// the background ranges within specSpanS (16 s) of the peak. Each
// difference is bounded below by φ/100, so a window at the floor reads a
// large but finite value.
//
// The first difference weighs the faster background activity, which
// attenuation suppresses, and largely ignores the after-going slow wave
// that may still overlap the start of the window. It also weighs the part
// of the trace no cerebral event changes — amplifier and electrode noise,
// flat in spectrum, so under Δx as large as the fast background — and an
// attenuation of the cerebral background by a half can then hardly move
// the total. The quietest half-second of the surrounding 32 s bounds that
// floor from above (it holds the floor plus the least background), and the
// ratio is taken of what lies above it: relative to the channel's own
// floor rather than to a generator's noise level. FEATURES.md (c5) gives
// the figures the floor and the window were chosen on.
//
// c5 is positive when activity after the event is lower than around it: 0.3
// means the excess over the floor is 45 % lower in power. It is signed on
// purpose, so the tuner can use it with one direction; the other kind of
// disruption, new low-voltage fast activity, shows as a negative value but
// is not what the default cutoff looks for. The window ends at 1.0 s
// because an attenuation is deepest soon after the after-going slow wave
// and then recovers. NaN when either window is empty, no floor block fits
// or the background is flat.
func disruption(t *trace, ph phase) float64 {
	a := ph.peak + int(math.Round(postFromS*t.fs))
	b := min(ph.peak+int(math.Round(postToS*t.fs)), t.hi-1)
	if b-a < 2 {
		return math.NaN()
	}
	msd := func(a, b int) float64 {
		var s float64
		for i := a; i < b; i++ {
			d := float64(t.x[i+1]) - float64(t.x[i])
			s += d * d
		}
		return s
	}
	ps, pn := msd(a, b), b-a
	var bs float64
	var bn int
	for _, r := range t.background(ph.peak) {
		if r[1]-r[0] < 2 {
			continue
		}
		bs, bn = bs+msd(r[0], r[1]-1), bn+r[1]-1-r[0]
	}
	if bn == 0 || bs == 0 || ps == 0 {
		return math.NaN()
	}
	blk := int(math.Round(floorBlockS * t.fs))
	fl := math.Inf(1)
	for _, r := range t.backgroundSpan(ph.peak, specSpanS) {
		for s := r[0]; s+blk < r[1]; s += blk / 2 {
			fl = min(fl, msd(s, s+blk)/float64(blk))
		}
	}
	if math.IsInf(fl, 1) {
		return math.NaN()
	}
	post := max(ps/float64(pn)-fl, fl/100)
	bg := max(bs/float64(bn)-fl, fl/100)
	return -0.5 * math.Log(post/bg)
}
