package montage

import (
	"math"
	"slices"
)

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
	slices.Sort(v)
	q.Spread = rank(v, 0.99) - rank(v, 0.01)
	q.Flat = q.Spread < FlatSpread
	return q
}

// rank is the nearest-rank p-quantile of sorted v: v[⌈pn⌉−1].
func rank(v []float64, p float64) float64 {
	k := int(math.Ceil(p*float64(len(v)))) - 1
	return v[max(min(k, len(v)-1), 0)]
}
