package design

import (
	"fmt"
	"math"
	"math/rand/v2"
	"sort"
)

// Interval is a bootstrap percentile interval.
type Interval struct {
	Lo, Hi float64
	Reps   []float64 // the replicate statistics, sorted
}

// Bootstrap returns a percentile interval at the given level (e.g. 0.95)
// for a statistic of the design weights, stat(w) (for example
// func(w []float64) float64 { return Σ w y / Σ w x }).
//
// Each of B replicates resamples, independently within every stratum,
// m_h = n_h−1 units with replacement from the n_h sampled units and
// rescales the weights
//
//	w*_i = w_i · n_h/(n_h−1) · r_i,
//
// r_i the number of times unit i was resampled (Rao & Wu 1988; Rao, Wu &
// Yue 1992, the rescaling bootstrap with m_h = n_h−1, which ignores the
// finite population correction). For a weighted total the replicate
// variance then has expectation Σ_h n_h/(n_h−1) Σ_{i∈h}(w_i y_i −
// mean_h)², the f_h = 0 linearised variance. A stratum with a single unit
// keeps its weight in every replicate (it contributes no variance).
// Percentiles are order statistics of the sorted replicates at ranks
// ⌈αB⌉ and ⌈(1−α)B⌉, α = (1−level)/2 (Efron & Tibshirani 1993, §13.3).
// stat must not keep w, which is reused; a NaN replicate (e.g. a zero
// denominator) sorts first and widens the interval, so check Reps when
// strata are small. The result depends only on the inputs and seed.
func Bootstrap(s Sample, stat func(w []float64) float64, B int, level float64, seed uint64) (Interval, error) {
	if err := s.check(len(s.Stratum), nil); err != nil {
		return Interval{}, err
	}
	if B < 1 || !(level > 0 && level < 1) {
		return Interval{}, &FieldError{Field: "B", Index: -1, Msg: fmt.Sprintf("need B ≥ 1 and 0 < level < 1, got %d, %v", B, level)}
	}
	groups := s.groups()
	// Visit strata in label order so the stream does not depend on the
	// order in which strata first appear.
	sort.Slice(groups, func(i, j int) bool { return s.Stratum[groups[i][0]] < s.Stratum[groups[j][0]] })
	rng := rand.New(rand.NewPCG(seed, 0x626f6f74)) // "boot"
	w := make([]float64, len(s.Weight))
	reps := make([]float64, B)
	for b := range reps {
		for _, g := range groups {
			n := len(g)
			if n < 2 {
				w[g[0]] = s.Weight[g[0]]
				continue
			}
			for _, i := range g {
				w[i] = 0
			}
			scale := float64(n) / float64(n-1)
			for k := 0; k < n-1; k++ {
				i := g[rng.IntN(n)]
				w[i] += s.Weight[i] * scale
			}
		}
		reps[b] = stat(w)
	}
	sort.Float64s(reps)
	a := (1 - level) / 2
	lo := int(math.Ceil(a*float64(B))) - 1
	hi := int(math.Ceil((1-a)*float64(B))) - 1
	lo = max(lo, 0)
	hi = min(max(hi, 0), B-1)
	return Interval{Lo: reps[lo], Hi: reps[hi], Reps: reps}, nil
}
