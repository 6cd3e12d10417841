package montage

import "math"

// Thresholds of ChannelQuality, in physical units (µV for EEG).
const (
	// FlatSpread is the largest 1st–99th percentile spread of a flat
	// channel. Scalp EEG is rarely below about 10 µV peak to peak; a
	// spread under 1 µV means a disconnected or shorted input (common
	// practice). Percentiles rather than the extremes keep a single
	// artefact from hiding a dead channel.
	FlatSpread = 1.0
	// RailMargin is how close to a physical limit, as a fraction of the
	// physical range, a sample counts as clipped.
	RailMargin = 1e-3
	// SaturatedFraction is the smallest fraction of clipped samples that
	// makes a channel saturated (common practice: brief excursions to a
	// rail happen with movement; a channel at the rail 1% of the time is
	// not interpretable).
	SaturatedFraction = 0.01
)

// Quality summarises one channel's samples.
type Quality struct {
	Flat      bool
	Saturated bool
	Spread    float64 // 99th minus 1st percentile (nearest rank) of the finite samples
	Clipped   float64 // fraction of samples within RailMargin of a physical limit
	NonFinite int     // NaN or ±Inf samples, left out of Spread
}

// ChannelQuality flags a flat or saturated channel from a stretch of its
// samples in physical units and the physical range [min, max] that the
// digital range maps to (EDF header fields physical minimum/maximum).
// A range with min ≥ max disables the saturation test. An empty or
// all-non-finite x is flat. Percentiles use the nearest-rank definition
// (Hyndman & Fan 1996, Am Stat 50(4):361–365, definition 1).
func ChannelQuality(x []float32, physRange [2]float64) Quality {
	var q Quality
	v := make([]float64, 0, len(x))
	lo, hi := physRange[0], physRange[1]
	m := RailMargin * (hi - lo)
	clipped := 0
	for _, s := range x {
		f := float64(s)
		if math.IsNaN(f) || math.IsInf(f, 0) {
			q.NonFinite++
			continue
		}
		v = append(v, f)
		if lo < hi && (f <= lo+m || f >= hi-m) {
			clipped++
		}
	}
	if len(x) > 0 {
		q.Clipped = float64(clipped) / float64(len(x))
	}
	q.Saturated = lo < hi && q.Clipped >= SaturatedFraction
	if len(v) == 0 {
		q.Flat = true
		return q
	}
	// the two ranks by selection, the upper first: everything before it is
	// then no larger, so the lower is selected within that part
	hi99 := rankIndex(len(v), 0.99)
	top := selectRank(v, hi99)
	q.Spread = top - selectRank(v[:hi99+1], rankIndex(len(v), 0.01))
	q.Flat = q.Spread < FlatSpread
	return q
}

// rankIndex is the index of the nearest-rank p-quantile in n sorted values:
// ⌈pn⌉−1, clamped to [0, n−1].
func rankIndex(n int, p float64) int {
	k := int(math.Ceil(p*float64(n))) - 1
	return max(min(k, n-1), 0)
}

// selectRank reorders v so that v[k] is the value sorting would put there,
// no larger values before it and no smaller after, and returns it: Hoare's
// selection (1961, "Algorithm 65: Find", Commun ACM 4(7):321–322) with a
// median-of-three pivot and a three-way partition, O(n) on average where a sort is O(n log n). v
// holds no NaN.
func selectRank(v []float64, k int) float64 {
	lo, hi := 0, len(v)-1
	for hi > lo {
		mid := lo + (hi-lo)/2
		if v[mid] < v[lo] {
			v[mid], v[lo] = v[lo], v[mid]
		}
		if v[hi] < v[lo] {
			v[hi], v[lo] = v[lo], v[hi]
		}
		if v[mid] < v[hi] {
			v[hi], v[mid] = v[mid], v[hi]
		}
		p := v[hi] // the median of three, v[lo] ≤ v[hi] ≤ v[mid]
		// three-way partition (Dijkstra's Dutch national flag): [lo, lt) < p,
		// [lt, i) = p, (gt, hi] > p, so that runs of equal values, a flat
		// channel's, end the search at once instead of one value a pass
		lt, i, gt := lo, lo, hi
		for i <= gt {
			switch x := v[i]; {
			case x < p:
				v[lt], v[i] = x, v[lt]
				lt++
				i++
			case x > p:
				v[gt], v[i] = x, v[gt]
				gt--
			default:
				i++
			}
		}
		switch {
		case k < lt:
			hi = lt - 1
		case k > gt:
			lo = gt + 1
		default:
			return v[k]
		}
	}
	return v[k]
}
