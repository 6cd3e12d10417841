package detect

import (
	"cmp"
	"math"
)

// madToSD converts a median absolute deviation to the standard deviation of
// a normal distribution with that MAD, 1/Φ⁻¹(3/4) (Hampel 1974, J Am Stat
// Assoc 69:383–393).
const madToSD = 1.482602218505602

// blockStats computes, for consecutive blocks of n samples of x (the last
// may be shorter, but at least n/2), the median med[b] and the median
// absolute deviation mad[b]. Medians are by selection, O(n) per block, so
// the robust scale costs a few operations per sample rather than a sort per
// sample (Hoare 1961, "Algorithm 65: Find", Commun ACM 4(7):321–322).
func blockStats(x []float32, n int, med, mad []float64, scratch []float32) ([]float64, []float64) {
	return blockStatsStride(x, n, 1, med, mad, scratch)
}

// blockStatsStride is blockStats on every stride-th sample of each block,
// counted from the block's start.
func blockStatsStride(x []float32, n, stride int, med, mad []float64, scratch []float32) ([]float64, []float64) {
	med, mad = med[:0], mad[:0]
	var mid []float32
	for s := 0; s < len(x); s += n {
		e := min(s+n, len(x))
		if e-s < n/2 && len(med) > 0 {
			// a short tail block inherits the previous block's statistics
			med = append(med, med[len(med)-1])
			mad = append(mad, mad[len(mad)-1])
			continue
		}
		b := scratch[:0]
		var sum float64
		for i := s; i < e; i += stride {
			b = append(b, x[i])
			sum += float64(x[i])
		}
		scratch = b
		if cap(mid) < len(b) {
			mid = make([]float32, len(b))
		}
		// the median within half the previous block's MAD of the mean
		// (the first block's by plain selection), the MAD within ×/÷
		// nearSpan of halfNormalMedian times the mean absolute deviation
		// (see bank.prepare)
		var m float64
		if len(mad) > 0 {
			c, r := sum/float64(len(b)), 0.5*mad[len(mad)-1]
			m = median32Near(b, float32(c-r), float32(c+r), mid)
		} else {
			m = median32(b)
		}
		sum = 0
		for i, v := range b {
			d := float32(math.Abs(float64(v) - m))
			b[i] = d
			sum += float64(d)
		}
		g := halfNormalMedian * sum / float64(len(b))
		med = append(med, m)
		mad = append(mad, median32Near(b, float32(g/nearSpan), float32(g*nearSpan), mid))
	}
	return med, mad
}

// slidingScale sets scale[b] to madToSD times the median of mad over blocks
// b−h … b+h (clipped to the ends): the robust background scale of block b.
// Taking the median across blocks keeps an event's own block, or a short
// burst of artefact, from raising the scale around it. The blocks in reach
// are kept sorted as the reach moves, one block in and one out per step
// (the running median of Härdle & Steiger 1995, "Optimal median smoothing",
// J R Stat Soc C 44:258–264, in its simplest form, a sorted array; O(h)
// per block), in slices.Sort's order (NaNs first).
func slidingScale(mad []float64, h int, scale []float64) []float64 {
	scale = scale[:0]
	var buf [32]float64 // 2h+1 ≤ 32 blocks (h = 5 by default) stay on the stack
	win := buf[:0]
	lo, hi := 0, 0
	for b := range mad {
		for top := min(b+h+1, len(mad)); hi < top; hi++ {
			win = sortedInsert(win, mad[hi])
		}
		for bot := max(b-h, 0); lo < bot; lo++ {
			win = sortedRemove(win, mad[lo])
		}
		var m float64
		if k := len(win); k%2 == 1 {
			m = win[k/2]
		} else {
			m = (win[k/2-1] + win[k/2]) / 2
		}
		scale = append(scale, madToSD*m)
	}
	return scale
}

// sortedInsert inserts v into x, sorted as slices.Sort sorts (cmp.Less),
// after any values equal to it.
func sortedInsert(x []float64, v float64) []float64 {
	x = append(x, v)
	j := len(x) - 1
	for ; j > 0 && cmp.Less(v, x[j-1]); j-- {
		x[j] = x[j-1]
	}
	x[j] = v
	return x
}

// sortedRemove removes from sorted x one value with the bits of v.
func sortedRemove(x []float64, v float64) []float64 {
	bits := math.Float64bits(v)
	for j, u := range x {
		if math.Float64bits(u) == bits {
			copy(x[j:], x[j+1:])
			return x[:len(x)-1]
		}
	}
	panic("detect: sortedRemove of a value not held")
}

// median32 returns the median of b (the mean of the two middle values for
// even length), reordering b.
func median32(b []float32) float64 {
	k := len(b)
	if k == 0 {
		return math.NaN()
	}
	hi := float64(selectK(b, k/2))
	if k%2 == 1 {
		return hi
	}
	// after selection every element below k/2 is ≤ b[k/2]; the lower
	// middle is their maximum
	lo := b[0]
	for _, v := range b[1 : k/2] {
		lo = max(lo, v)
	}
	return (float64(lo) + hi) / 2
}

// selectK reorders b so that b[k] is the k-th smallest, smaller-or-equal
// elements before it, and returns it (Hoare's selection, 1961, with a
// median-of-three pivot). The partition is Lomuto's with an unconditional
// swap, so the comparison sets a counter instead of taking a branch the
// processor cannot predict on noise (the counter is written as an
// assignment the compiler turns into SETcc: an `if … { i++ }` stayed a
// branch, and a mispredicted one on about half the elements made the
// selection of 128 values 3.5 times slower); short ranges finish by
// insertion.
func selectK(b []float32, k int) float32 {
	lo, hi := 0, len(b)-1
	for hi-lo > 12 {
		mid := lo + (hi-lo)/2
		if b[mid] < b[lo] {
			b[mid], b[lo] = b[lo], b[mid]
		}
		if b[hi] < b[lo] {
			b[hi], b[lo] = b[lo], b[hi]
		}
		if b[mid] < b[hi] {
			b[hi], b[mid] = b[mid], b[hi]
		}
		// b[lo] ≤ b[hi] ≤ b[mid]: the median of three is the pivot, at hi
		p := b[hi]
		i := lo
		for j := lo; j < hi; j++ {
			v := b[j]
			b[j] = b[i]
			b[i] = v
			inc := 0 // written so that the compiler emits SETcc, not a branch
			if v < p {
				inc = 1
			}
			i += inc
		}
		b[i], b[hi] = b[hi], b[i]
		switch {
		case k < i:
			hi = i - 1
		case k > i:
			lo = i + 1
		default:
			return b[k]
		}
	}
	for i := lo + 1; i <= hi; i++ {
		v := b[i]
		j := i
		for ; j > lo && b[j-1] > v; j-- {
			b[j] = b[j-1]
		}
		b[j] = v
	}
	return b[k]
}

// median32Near is median32 for a b whose median probably lies in [lo, hi],
// a bracket guessed from a neighbouring block's statistics. One pass counts
// the values below lo and gathers those inside into mid (at least len(b)
// long); when the middle rank(s) fall among them, the median is selected
// from mid alone, a fifth or so of b, and is the same value median32 would
// return, since the k-th smallest value does not depend on how it is found
// (the two-pivot idea of Floyd & Rivest 1975, "Algorithm 489: SELECT",
// Commun ACM 18(3):173, with the pivots taken from the neighbour rather
// than from a sample). Otherwise, or when b holds a NaN, it is median32(b).
// b is left as it was or reordered.
func median32Near(b []float32, lo, hi float32, mid []float32) float64 {
	k := len(b)
	if k < 16 || !(lo <= hi) {
		return median32(b)
	}
	mid = mid[:k]
	below, m, above := 0, 0, 0
	for _, v := range b {
		mid[m] = v
		// written so that the compiler emits SETcc, not branches (see selectK)
		ge, le := 0, 0
		if v >= lo {
			ge = 1
		}
		if v <= hi {
			le = 1
		}
		m += ge & le
		below += 1 - ge
		above += 1 - le
	}
	// a NaN is neither ≥ lo nor ≤ hi, and is counted twice
	if below+m+above != k {
		return median32(b)
	}
	j := k/2 - below // rank of the upper middle within mid
	first := j       // rank of the lower middle (the same for odd length)
	if k%2 == 0 {
		first = j - 1
	}
	if first < 0 || j >= m {
		return median32(b)
	}
	up := float64(selectK(mid[:m], j))
	if k%2 == 1 {
		return up
	}
	dn := mid[0]
	for _, v := range mid[1:j] {
		dn = max(dn, v)
	}
	return (float64(dn) + up) / 2
}
