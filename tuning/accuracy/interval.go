package accuracy

import (
	"math"

	"gonum.org/v1/gonum/stat/distuv"
)

// zTwoSided returns the standard normal quantile z_{1−α/2} for a two-sided
// interval at the given confidence level, or NaN for a level outside (0,1).
func zTwoSided(level float64) float64 {
	if !(level > 0 && level < 1) {
		return math.NaN()
	}
	return distuv.UnitNormal.Quantile(1 - (1-level)/2)
}

// Wilson returns the Wilson score interval for the proportion x/n at the
// given two-sided confidence level (0.95 for a 95% interval). This is
// method 3 of Newcombe (1998), Statistics in Medicine 17:857–872:
//
//	(2np + z² ± z√(z² + 4np(1−p))) / (2(n + z²)),  p = x/n.
//
// x and n may be non-integer (design-weighted counts or an effective sample
// size). It returns NaN, NaN if n ≤ 0, x is outside [0, n] or the level is
// outside (0,1).
func Wilson(x, n, level float64) (lo, hi float64) {
	z := zTwoSided(level)
	if !(n > 0) || !(x >= 0 && x <= n) || math.IsNaN(z) {
		return math.NaN(), math.NaN()
	}
	p := x / n
	z2 := z * z
	centre := 2*n*p + z2
	half := z * math.Sqrt(z2+4*n*p*(1-p))
	den := 2 * (n + z2)
	return clamp01((centre - half) / den), clamp01((centre + half) / den)
}

// WilsonCC returns the Wilson score interval with continuity correction,
// method 4 of Newcombe (1998), Statistics in Medicine 17:857–872:
//
//	L = (2np + z² − 1 − z√(z² − 2 − 1/n + 4p(n(1−p) + 1))) / (2(n + z²))
//	U = (2np + z² + 1 + z√(z² + 2 − 1/n + 4p(n(1−p) − 1))) / (2(n + z²))
//
// with L = 0 when p = 0 and U = 1 when p = 1, as Newcombe prescribes. The
// arguments and NaN cases are those of Wilson.
func WilsonCC(x, n, level float64) (lo, hi float64) {
	z := zTwoSided(level)
	if !(n > 0) || !(x >= 0 && x <= n) || math.IsNaN(z) {
		return math.NaN(), math.NaN()
	}
	p := x / n
	z2 := z * z
	den := 2 * (n + z2)
	lo, hi = 0, 1
	if p > 0 {
		lo = (2*n*p + z2 - 1 - z*math.Sqrt(z2-2-1/n+4*p*(n*(1-p)+1))) / den
	}
	if p < 1 {
		hi = (2*n*p + z2 + 1 + z*math.Sqrt(z2+2-1/n+4*p*(n*(1-p)-1))) / den
	}
	return clamp01(lo), clamp01(hi)
}

// EffectiveN returns Kish's effective sample size (Σw)²/Σw² (Kish 1965,
// Survey Sampling, Wiley), the number of equally weighted observations that
// would give a mean the same variance as the weighted one under unequal
// weighting alone. An empty or all-zero weight vector gives 0.
func EffectiveN(weights []float64) float64 {
	var s, s2 float64
	for _, w := range weights {
		s += w
		s2 += w * w
	}
	if s2 == 0 {
		return 0
	}
	return s * s / s2
}

// WilsonWeighted returns the design-weighted proportion of hits and a
// Wilson interval for it computed with Kish's effective sample size in place
// of n, the substitution Korn & Graubard (1998, Survey Methodology
// 24:193–201) use for survey proportions:
//
//	p = Σ wᵢ hitᵢ / Σ wᵢ,  n_eff = (Σw)²/Σw²,  (lo, hi) = Wilson(p·n_eff, n_eff, level).
//
// Nil weights reduce it to Wilson(x, n, level). Only the unequal-weighting
// design effect is captured; clustering is not (use ClusterResample for
// that). It panics on mismatched lengths or negative weights.
func WilsonWeighted(hit []bool, weights []float64, level float64) (p, lo, hi float64) {
	checkWeights(weights, len(hit))
	var sw, sx float64
	for i, h := range hit {
		w := 1.0
		if weights != nil {
			w = weights[i]
		}
		sw += w
		if h {
			sx += w
		}
	}
	if sw == 0 {
		return math.NaN(), math.NaN(), math.NaN()
	}
	p = sx / sw
	neff := float64(len(hit))
	if weights != nil {
		neff = EffectiveN(weights)
	}
	lo, hi = Wilson(p*neff, neff, level)
	return p, lo, hi
}

func clamp01(v float64) float64 {
	return math.Min(1, math.Max(0, v))
}
