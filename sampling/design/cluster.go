package design

import (
	"math"

	"gonum.org/v1/gonum/stat/distuv"
)

// clusterVar is the with-replacement ultimate-cluster variance estimator of
// a weighted total Σ w_i z_i, with the units' clusters (subjects) as primary
// sampling units (Wolter 2007, Introduction to Variance Estimation, 2nd ed.,
// §1.4 and ch. 6; Korn & Graubard 1999, Analysis of Health Surveys, §5.2):
//
//	t_c = Σ_{i∈c} w_i z_i,   v = Σ_g n_g/(n_g−1) Σ_{c∈g} (t_c − t̄_g)²,
//
// n_g the number of clusters in variance stratum g and t̄_g their mean.
// Events sharing a subject are thereby allowed any correlation.
//
// Variance strata. The design's strata are event-level (score quartile ×
// lobe), so one subject may have events in several strata and is then not
// nested in any of them. The variance strata g are the connected groups of
// design strata linked by a shared cluster: strata that share no subject
// stay apart (PSUs nested within strata, the textbook case), strata that
// share subjects are collapsed into one. Collapsing strata overstates the
// variance, never understates it in expectation (collapsed strata, Wolter
// 2007, §2.5), which is the honest direction. When every subject spans
// every stratum this is the unstratified estimator over subjects. A
// variance stratum with one cluster contributes 0 (and no degree of
// freedom). The finite population correction is not applied (first-stage
// with-replacement approximation, conservative).
func (s Sample) clusterVar(z []float64) float64 {
	v := 0.0
	for _, g := range s.psuStrata() {
		t := make([]float64, len(g))
		for k, c := range g {
			t[k] = c.total(s, z)
		}
		v += spread(t)
	}
	return v
}

// psu is one primary sampling unit: the indices of its units.
type psu []int

func (c psu) total(s Sample, z []float64) float64 {
	t := 0.0
	for _, i := range c {
		t += s.Weight[i] * z[i]
	}
	return t
}

// psuStrata groups the clusters into variance strata (see clusterVar),
// in first-seen order. Without Sample.Cluster every unit is its own PSU
// within its design stratum.
func (s Sample) psuStrata() [][]psu {
	if s.Cluster == nil {
		var out [][]psu
		for _, g := range s.groups() {
			ps := make([]psu, len(g))
			for k, i := range g {
				ps[k] = psu{i}
			}
			out = append(out, ps)
		}
		return out
	}
	// union–find over design strata, joined through shared clusters
	stratumAt := map[string]int{}
	var parent []int
	find := func(a int) int {
		for parent[a] != a {
			parent[a] = parent[parent[a]]
			a = parent[a]
		}
		return a
	}
	clusterAt := map[string]int{}
	var clusters []psu
	var firstStratum []int
	for i, h := range s.Stratum {
		sh, isNew := firstSeen(stratumAt, h)
		if isNew {
			parent = append(parent, sh)
		}
		c, isNew := firstSeen(clusterAt, s.Cluster[i])
		if isNew {
			clusters = append(clusters, nil)
			firstStratum = append(firstStratum, sh)
		}
		clusters[c] = append(clusters[c], i)
		if a, b := find(firstStratum[c]), find(sh); a != b {
			parent[b] = a
		}
	}
	groupAt := map[int]int{}
	var out [][]psu
	for c, ps := range clusters {
		k, isNew := firstSeen(groupAt, find(firstStratum[c]))
		if isNew {
			out = append(out, nil)
		}
		out[k] = append(out[k], ps)
	}
	return out
}

// DF returns the design degrees of freedom of the linearised variance:
// the number of PSUs minus the number of variance strata (Korn & Graubard
// 1999, §5.2). Without clusters that is n − H; with clusters it counts
// subjects and the collapsed variance strata of clusterVar.
func (s Sample) DF() float64 {
	df := 0
	for _, g := range s.psuStrata() {
		df += len(g) - 1
	}
	return float64(df)
}

// CI returns the two-sided interval Value ± t_{DF,1−α/2}·SE at the given
// level, Student's t on the design degrees of freedom (Korn & Graubard
// 1999, §5.2); DF = +Inf gives the normal interval. It returns NaN, NaN
// when DF < 1 or the variance is not a non-negative number.
func (e Estimate) CI(level float64) (lo, hi float64) {
	q := tQuantile(e.DF, level)
	if math.IsNaN(q) || !(e.Var >= 0) {
		return math.NaN(), math.NaN()
	}
	h := q * e.SE()
	return e.Value - h, e.Value + h
}

// EffectiveSize returns Korn & Graubard's (1998, Survey Methodology
// 24:193–201) degrees-of-freedom-adjusted effective sample size of an
// estimated proportion p = Value from n sampled units,
//
//	n* = p(1−p)/v · (t_{n−1} / t_{DF})²,
//
// t the 1−α/2 quantiles of Student's t at the given level, capped at n; a
// binomial interval (Wilson, Clopper–Pearson) on n* then carries both the
// design effect and the design's few degrees of freedom. NaN when p is 0
// or 1, v is 0, or DF < 1.
func (e Estimate) EffectiveSize(n, level float64) float64 {
	p, v := e.Value, e.Var
	if !(v > 0 && p > 0 && p < 1 && n > 1) {
		return math.NaN()
	}
	adj := tQuantile(n-1, level) / tQuantile(e.DF, level)
	return math.Min(n, p*(1-p)/v*adj*adj)
}

func tQuantile(df, level float64) float64 {
	if !(df >= 1) || !(level > 0 && level < 1) {
		return math.NaN()
	}
	if math.IsInf(df, 1) {
		return distuv.UnitNormal.Quantile(1 - (1-level)/2)
	}
	return distuv.StudentsT{Mu: 0, Sigma: 1, Nu: df}.Quantile(1 - (1-level)/2)
}
