package draw

import (
	"fmt"
	"math"
)

// PhaseEstimate is what the panel's returns say about one stratum after an
// earlier phase: the share of rated events whose verdict was epileptiform
// and the share on which the raters did not all agree, from Rated events.
type PhaseEstimate struct {
	Prevalence   float64
	Disagreement float64
	Rated        int
}

// PhaseRecord documents one phase of a draw for design.json.
type PhaseRecord struct {
	Phase      int                `json:"phase"`
	N          int                `json:"n"`
	Method     string             `json:"allocation"`
	Why        string             `json:"why"`
	Allocation map[string]int     `json:"n_by_stratum"`
	Baseline   map[string]int     `json:"baseline_n_by_stratum,omitempty"`
	Prior      map[string]float64 `json:"prior_prevalence,omitempty"`
	Lambda     map[string]float64 `json:"lambda,omitempty"`
}

func byLabel[T any](labels []string, v []T) map[string]T {
	m := make(map[string]T, len(labels))
	for h, l := range labels {
		m[l] = v[h]
	}
	return m
}

// TopUpAdaptive is TopUp with the new phase allocated from the panel's
// returns so far (est, by stratum label), with design weights that keep
// the Horvitz–Thompson total exactly unbiased although n2_h depends on the
// returns.
//
// Allocation. Each stratum's prevalence guess is p̃_h = (1−d_h)·p̂_h +
// d_h/2, p̂_h = (k + ½)/(m + 1) the smoothed verdict share of the m rated
// events and d_h the share with a split panel (a split event's label is
// uncertain, so it counts as half positive, which raises p(1−p) where the
// panel hesitates); strata without returns keep the design's prior
// (priorOf). The target for the union is the Accuracy allocation
// (AccuracyWeights) of n1 + n on p̃; phase 2 gets n2_h ∝ max(0, target_h −
// n1_h), at least 1 in every stratum with undrawn units and at most
// ⌊N'_h·b_h/(n1_h+b_h)⌋ (so that no weight falls below 1), where b_h is
// the baseline: the n_h that TopUp would give with the design's own
// allocation, fixed before any return is seen.
//
// Why not π = (n1+n2)/N'. The union of two simple random samples is one
// simple random sample only when n2_h is fixed in advance; when n2_h grows
// with the phase-1 share of positives the pooled mean is biased (the
// covariance of n1/(n1+n2) with ȳ1). The weights here rest on
// conditional unbiasedness instead (Thompson 2012, Sampling 3rd ed., Wiley,
// the argument for sequential and adaptive designs; Särndal, Swensson &
// Wretman 1992, ch. 9, two-phase sampling — from memory): with T₁ = Σ_prev
// w_i y_i unbiased for the stratum total and, given the earlier phases,
// T₂ = Σ_prev y_i + (N'−n1)·ȳ_new unbiased too, any λ fixed in advance
// gives the unbiased T = λT₁ + (1−λ)T₂, i.e. weights
//
//	earlier units: λ·w_i + (1−λ),   new units: (1−λ)(N'−n1)/n2,
//
// (each divided by the unit's thinning probability under a cap). λ_h =
// (N'−n1−b)·n1 / ((n1+b)(N'−n1)) is the value at which T is the pooled
// estimator N'·ȳ_union when n2 = b: the design then coincides with TopUp,
// weights 1/π included. Pi holds 1/weight, a pseudo inclusion probability:
// with an adaptive n2 the first-order inclusion probability of the union
// has no closed form.
func TopUpAdaptive(f *Frame, d Design, prev []Drawn, n int, seed uint64, est map[string]PhaseEstimate) (*Result, error) {
	if est == nil {
		est = map[string]PhaseEstimate{}
	}
	return topUp(f, d, prev, n, seed, est)
}

type adaptive struct {
	alloc, base, n1 []int
	lambda, prior   []float64
	size            []int
	index           map[string]int
	rowOf           map[string]int
}

func planAdaptive(fd *frameDesign, a Allocation, n1, room []int, w []float64, n int, est map[string]PhaseEstimate) (*adaptive, []Warning, error) {
	H := len(fd.labels)
	open := 0
	for _, r := range room {
		if r > 0 {
			open++
		}
	}
	if n < open {
		return nil, nil, &allocationError{Msg: fmt.Sprintf("an adaptive top-up gives each of the %d strata with undrawn units at least one; %d is too few", open, n)}
	}
	base, _, err := Allocate(fd.labels, room, w, n, 1)
	if err != nil {
		return nil, nil, err
	}
	prior, err := fd.priorOf(a)
	if err != nil {
		return nil, nil, err
	}
	size := fd.cappedSizes()
	ad := &adaptive{base: base, n1: n1, lambda: make([]float64, H), prior: prior, size: size,
		index: map[string]int{}, rowOf: make(map[string]int, fd.f.Len())}
	for h, l := range fd.labels {
		ad.index[l] = h
		if e, ok := est[l]; ok && e.Rated > 0 {
			k := e.Prevalence * float64(e.Rated)
			p := (k + 0.5) / (float64(e.Rated) + 1)
			d := math.Min(1, math.Max(0, e.Disagreement))
			prior[h] = (1-d)*p + d/2
		}
	}
	for i, id := range fd.f.ID {
		ad.rowOf[id] = i
	}
	total := n
	for _, v := range n1 {
		total += v
	}
	aw, err := AccuracyWeights(size, prior)
	if err != nil {
		return nil, nil, err
	}
	target, _, err := Allocate(fd.labels, size, aw, total, 0)
	if err != nil {
		return nil, nil, err
	}
	limit := make([]int, H)
	deficit := make([]float64, H)
	for h := range limit {
		N, m, b := float64(size[h]), float64(n1[h]), float64(base[h])
		if room[h] > 0 {
			limit[h] = min(room[h], int(math.Floor(N*b/(m+b)+1e-9)))
			ad.lambda[h] = (N - m - b) * m / ((m + b) * (N - m))
		}
		deficit[h] = math.Max(0, float64(target[h]-n1[h]))
	}
	ad.alloc, _, err = Allocate(fd.labels, limit, deficit, n, 1)
	return ad, nil, err
}

func (ad *adaptive) record(phase, n int, labels []string) PhaseRecord {
	return PhaseRecord{Phase: phase, N: n, Method: "accuracy (adaptive)",
		Why:        "Accuracy allocation of the union on the panel's per-stratum prevalence and disagreement; conditional two-phase weights (see TopUpAdaptive)",
		Allocation: byLabel(labels, ad.alloc), Baseline: byLabel(labels, ad.base),
		Prior: byLabel(labels, ad.prior), Lambda: byLabel(labels, ad.lambda)}
}

// reweight sets the conditional two-phase weights of TopUpAdaptive on
// units, old holding the earlier phases' rows.
func (ad *adaptive) reweight(fd *frameDesign, units []Drawn, old map[string]Drawn, phase int) {
	for i := range units {
		u := &units[i]
		h := ad.index[u.Stratum]
		thin := fd.thin[ad.rowOf[u.EventID]]
		lam := ad.lambda[h]
		var w float64
		if u.Phase == phase {
			w = (1 - lam) * float64(ad.size[h]-ad.n1[h]) / float64(ad.alloc[h]) / thin
		} else {
			w = (lam*old[u.EventID].Weight*thin + 1 - lam) / thin
		}
		u.Weight, u.Pi = w, 1/w
	}
}
