package detect

import "math"

// hat is a zero-mean "Mexican hat" made of boxes: the mean of the 2h+1
// samples centred on i minus the mean of the 3(2h+1) samples centred on i.
// It is the box approximation of a Gaussian second derivative that Bay et
// al. (2008, "SURF: speeded up robust features", Comput Vis Image Underst
// 110:346–359) compute from an integral image (a running sum, Crow 1984,
// "Summed-area tables for texture mapping", SIGGRAPH Comput Graph
// 18(3):207–212), so each scale costs a few operations per sample whatever
// its width. Zero mean and symmetric, its gain rises as f² from zero
// frequency, which suppresses the slow, high-power part of a 1/f background.
type hat struct {
	h      int     // half-width of the centre box, samples
	ic, is float64 // 1/(2h+1) and 1/(2·outer+1), the boxes' mean weights
}

// newHat returns the hat of centre half-width h.
func newHat(h int) hat {
	k := hat{h: h}
	k.ic, k.is = 1/float64(2*h+1), 1/float64(2*k.outer()+1)
	return k
}

// outer is the half-width of the surround, 3h+1, so that the surround is
// three centre boxes wide.
func (k hat) outer() int { return 3*k.h + 1 }

// runningSum sets cum[i] to the sum of x[:i], for i = 0 … len(x).
// The sum is carried in a register rather than read back from cum, which
// would put a store-to-load forwarding on every step of the chain.
func runningSum(cum []float64, x []float32) {
	cum = cum[:len(x)+1]
	var s float64
	cum[0] = 0
	for i, v := range x {
		s += float64(v)
		cum[i+1] = s
	}
}

// at is the hat's response at i, computed from the running sum cum of a
// trace len(cum)−1 long (runningSum), and 0 where the surround leaves the
// trace. The finder needs the response only on the blocks' sampling grid
// and at extrema, so it is read where needed rather than stored.
func (k hat) at(cum []float64, i int) float32 {
	h, o := k.h, k.outer()
	if i < o || i >= len(cum)-1-o {
		return 0
	}
	c := (cum[i+h+1] - cum[i-h]) * k.ic
	s := (cum[i+o+1] - cum[i-o]) * k.is
	return float32(c - s)
}

// hatsFor returns the hats for a sampling rate: centre boxes about 12, 25,
// 50 and 100 ms wide, so that main phases of 20–200 ms base to base (Kane
// et al. 2017: spike 20–70 ms, sharp wave 70–200 ms) each find a scale
// near their own (the scales are an octave apart). Scales collapsing to the same width at
// low rates are kept once.
func hatsFor(fs float64) []hat {
	var out []hat
	for _, wS := range []float64{0.0125, 0.025, 0.050, 0.100} {
		h := max(1, int(math.Round((wS*fs-1)/2)))
		if len(out) > 0 && out[len(out)-1].h == h {
			continue
		}
		out = append(out, newHat(h))
	}
	return out
}

// bank is one derivation's running sum over a conditioned window, from which
// every hat's response is read (hat.at), and the robust background scale of
// each response per 1 s block.
type bank struct {
	hats  []hat
	scale [][]float64 // background scale per hat and block
	med   []float64
	cum   []float64
	tmp   []float32
	mid   []float32 // median32Near's scratch
}

// A block's median |response| is found by median32Near within a bracket
// around halfNormalMedian times the block's mean |response|: for a normal
// response the median of |r| is Φ⁻¹(3/4)·σ = 0.6745σ and its mean
// √(2/π)·σ = 0.7979σ, a ratio of 0.845 (Johnson, Kotz & Balakrishnan 1994,
// Continuous Univariate Distributions 1, §13.2: the half-normal; from
// memory). On the generated recordings 97 % of blocks have their median
// within ×/÷ nearSpan of that guess, and a fifth of the values lie inside.
const (
	halfNormalMedian = 0.845
	nearSpan         = 1.25
)

// prepare computes the running sum of x and, over the blocks of
// length block from start to end, their background scales: madToSD times
// the median over blocks b−h … b+h of each block's median |r|. The response
// has zero mean under a stationary background, so its median absolute value
// is the MAD about zero; it is taken on every max(2, hat.h/2)-th sample,
// since the response is smooth over its own width, and selected within a
// bracket guessed from the block's mean |response| (median32Near: the same
// value as a selection over all of them).
func (b *bank) prepare(x []float32, start, end, block, h int) {
	n := len(x)
	if cap(b.cum) < n+1 {
		b.cum = make([]float64, n+1)
	}
	b.cum = b.cum[:n+1]
	runningSum(b.cum, x)
	for len(b.scale) < len(b.hats) {
		b.scale = append(b.scale, nil)
	}
	for k, hk := range b.hats {
		stride := max(2, hk.h/2)
		b.med = b.med[:0]
		for s := start; s < end; s += block {
			e := min(s+block, end)
			if e-s < block/2 && len(b.med) > 0 {
				b.med = append(b.med, b.med[len(b.med)-1])
				continue
			}
			b.tmp = b.tmp[:0]
			var s0, s1 float32 // two partial sums, so that the adds overlap
			i := s
			if o := hk.outer(); s >= o && e-1 < len(b.cum)-1-o {
				// the whole block clear of the trace's ends: hat.at's
				// arithmetic without its test, |r| by clearing the sign
				// bit (math.Abs's own way), into a slice sized once
				cnt := (e - s + stride - 1) / stride
				if cap(b.tmp) < cnt {
					b.tmp = make([]float32, cnt)
				}
				t := b.tmp[:cnt]
				cum, hh, ic, is := b.cum, hk.h, hk.ic, hk.is
				k := 0
				for ; i+stride < e; i += 2 * stride {
					j := i + stride
					u := float32((cum[i+hh+1]-cum[i-hh])*ic - (cum[i+o+1]-cum[i-o])*is)
					v := float32((cum[j+hh+1]-cum[j-hh])*ic - (cum[j+o+1]-cum[j-o])*is)
					u = math.Float32frombits(math.Float32bits(u) &^ (1 << 31))
					v = math.Float32frombits(math.Float32bits(v) &^ (1 << 31))
					s0, s1 = s0+u, s1+v
					t[k], t[k+1] = u, v
					k += 2
				}
				if i < e {
					u := float32((cum[i+hh+1]-cum[i-hh])*ic - (cum[i+o+1]-cum[i-o])*is)
					u = math.Float32frombits(math.Float32bits(u) &^ (1 << 31))
					s0 += u
					t[k] = u
				}
				b.tmp = t
			} else {
				for ; i+stride < e; i += 2 * stride {
					u := float32(math.Abs(float64(hk.at(b.cum, i))))
					v := float32(math.Abs(float64(hk.at(b.cum, i+stride))))
					s0, s1 = s0+u, s1+v
					b.tmp = append(b.tmp, u, v)
				}
				if i < e {
					u := float32(math.Abs(float64(hk.at(b.cum, i))))
					s0 += u
					b.tmp = append(b.tmp, u)
				}
			}
			if cap(b.mid) < len(b.tmp) {
				b.mid = make([]float32, len(b.tmp))
			}
			g := halfNormalMedian * (s0 + s1) / float32(len(b.tmp))
			b.med = append(b.med, median32Near(b.tmp, g/nearSpan, g*nearSpan, b.mid))
		}
		b.scale[k] = slidingScale(b.med, h, b.scale[k])
	}
}

// z is the largest response at sample i, of the given sign, over the hats,
// each in its own background scales; block and start locate i's block as
// in prepare.
func (b *bank) z(i int, sign float64, start, block int) float64 {
	z := math.Inf(-1)
	bi := max(i-start, 0) / block
	for k := range b.hats {
		sc := b.scale[k]
		s := sc[min(bi, len(sc)-1)]
		if s > 0 {
			z = max(z, sign*float64(b.hats[k].at(b.cum, i))/s)
		}
	}
	return z
}

// mayReach reports whether some hat's response at i, of the given sign,
// reaches its limit lim[k] (findChannel's rejection test). With the usual
// four hats and i clear of the trace's ends it reads them in one
// expression, each response computed exactly as hat.at computes it;
// otherwise hat by hat.
func (b *bank) mayReach(i int, sign float64, lim []float64) bool {
	if len(b.hats) == 4 && len(lim) == 4 {
		cum := b.cum
		h0, h1, h2, h3 := b.hats[0], b.hats[1], b.hats[2], b.hats[3]
		if o := max(h0.outer(), h1.outer(), h2.outer(), h3.outer()); i >= o && i < len(cum)-1-o {
			r0 := float32((cum[i+h0.h+1]-cum[i-h0.h])*h0.ic - (cum[i+3*h0.h+2]-cum[i-3*h0.h-1])*h0.is)
			r1 := float32((cum[i+h1.h+1]-cum[i-h1.h])*h1.ic - (cum[i+3*h1.h+2]-cum[i-3*h1.h-1])*h1.is)
			r2 := float32((cum[i+h2.h+1]-cum[i-h2.h])*h2.ic - (cum[i+3*h2.h+2]-cum[i-3*h2.h-1])*h2.is)
			r3 := float32((cum[i+h3.h+1]-cum[i-h3.h])*h3.ic - (cum[i+3*h3.h+2]-cum[i-3*h3.h-1])*h3.is)
			return sign*float64(r0) >= lim[0] || sign*float64(r1) >= lim[1] ||
				sign*float64(r2) >= lim[2] || sign*float64(r3) >= lim[3]
		}
	}
	for k, l := range lim {
		if sign*float64(b.hats[k].at(b.cum, i)) >= l {
			return true
		}
	}
	return false
}

// sweepRange returns the part [flo, fhi) of [lo, hi) that sweep4 can
// search: four hats, four limits, and every hat's surround inside the
// running sum (where mayReach reads the four in one expression). It is
// empty otherwise.
func (b *bank) sweepRange(lo, hi, nlim int) (flo, fhi int) {
	if len(b.hats) != 4 || nlim != 4 {
		return 0, 0
	}
	h0, h1, h2, h3 := b.hats[0], b.hats[1], b.hats[2], b.hats[3]
	o := max(h0.outer(), h1.outer(), h2.outer(), h3.outer())
	return max(lo, o), min(hi, len(b.cum)-1-o)
}

// sweep4 is findChannel's search over [lo, hi) (a sweepRange): it calls
// test(i, sign) at each extremum i of x (isExtremum) where some hat's
// response of the extremum's sign reaches its limit lim[k] (mayReach),
// in increasing i, calling setLim(i) first whenever i ≥ *next. The
// extrema of a stretch of samples are first gathered without branches
// (the extremum test is true at about a third of the samples in no order
// a branch predictor can follow), then the four responses of each are
// computed, each exactly as hat.at computes it, and tested against the
// limits. The calls are those of the extremum-by-extremum search
// (TestFindChannelMatchesExactZ).
func (b *bank) sweep4(x []float32, lo, hi int, lim []float64, next *int, setLim func(int), test func(int, float64)) {
	cum := b.cum
	h0, h1, h2, h3 := b.hats[0], b.hats[1], b.hats[2], b.hats[3]
	a0, c0, e0, g0, ic0, is0 := h0.h+1, h0.h, 3*h0.h+2, 3*h0.h+1, h0.ic, h0.is
	a1, c1, e1, g1, ic1, is1 := h1.h+1, h1.h, 3*h1.h+2, 3*h1.h+1, h1.ic, h1.is
	a2, c2, e2, g2, ic2, is2 := h2.h+1, h2.h, 3*h2.h+2, 3*h2.h+1, h2.ic, h2.is
	a3, c3, e3, g3, ic3, is3 := h3.h+1, h3.h, 3*h3.h+2, 3*h3.h+1, h3.ic, h3.is
	lim = lim[:4]
	const chunk = 512
	var idx [chunk]int32
	var sgn [chunk]int8
	for clo := lo; clo < hi; clo += chunk {
		chi := min(clo+chunk, hi)
		n := 0
		xs := x[clo-1 : chi+1]
		for j := 1; j < len(xs)-1; j++ {
			p, v, q := xs[j-1], xs[j], xs[j+1]
			up := b2i(v >= p) & b2i(v > q)
			dn := b2i(v <= p) & b2i(v < q)
			idx[n&(chunk-1)] = int32(clo - 1 + j)
			sgn[n&(chunk-1)] = int8(up - dn)
			n += up | dn
		}
		for k := range n {
			i, sign := int(idx[k]), float64(sgn[k])
			if i >= *next {
				setLim(i)
			}
			r0 := float32((cum[i+a0]-cum[i-c0])*ic0 - (cum[i+e0]-cum[i-g0])*is0)
			r1 := float32((cum[i+a1]-cum[i-c1])*ic1 - (cum[i+e1]-cum[i-g1])*is1)
			r2 := float32((cum[i+a2]-cum[i-c2])*ic2 - (cum[i+e2]-cum[i-g2])*is2)
			r3 := float32((cum[i+a3]-cum[i-c3])*ic3 - (cum[i+e3]-cum[i-g3])*is3)
			if sign*float64(r0) >= lim[0] || sign*float64(r1) >= lim[1] ||
				sign*float64(r2) >= lim[2] || sign*float64(r3) >= lim[3] {
				test(i, sign)
			}
		}
	}
}

// b2i is 1 for true and 0 for false (compiled to a flag copy, not a branch).
func b2i(b bool) int {
	if b {
		return 1
	}
	return 0
}
