package draw

import (
	"fmt"
	"math"
)

// Defaults of the Accuracy allocation's prior.
const (
	// DefaultPriorColumn is the frame column whose share at or above
	// DefaultPriorAt gives each stratum's prior prevalence.
	DefaultPriorColumn = "auto_count"
	// DefaultPriorAt is Kural et al.'s (2020, Neurology 94:e2139) ≥ 4 of
	// the six IFCN criteria.
	DefaultPriorAt = 4
	// accuracyFloor is the fewest units per stratum of an Accuracy draw, so
	// that every stratum keeps π > 0 and a within-stratum variance.
	accuracyFloor = 2
)

// AccuracyWeights returns the allocation weights a_h of the Accuracy
// method: the compromise Neyman allocation that minimises the sum of the
// relative variances of the stratified estimates of sensitivity and
// specificity for a fixed n,
//
//	a_h = N_h √( p_h/P² + (1−p_h)/Q² ),   P = Σ N_h p_h,  Q = Σ N_h (1−p_h),
//	n_h = n a_h / Σ a_h.
//
// Why: sensitivity is the ratio of the positives' called total to the
// positives' total; with the rule's sensitivity Se the same in every
// stratum its residuals z_i = x_i(y_i − Se) have within-stratum variance
// S²_h ≈ p_h Se(1−Se), so v(Ŝe) ≈ Se(1−Se) Σ N_h² p_h/n_h / P² (Cochran
// 1977, §6.11, combined ratio, fpc ignored), and likewise v(Ŝp) ≈ Sp(1−Sp)
// Σ N_h² (1−p_h)/n_h / Q². Minimising Σ_h c_h/n_h subject to Σ n_h = n
// gives n_h ∝ √c_h (Cochran 1977, §5.5, the argument of Theorem 5.6;
// allocation for several items, §5A.3 — section number from memory);
// taking Se(1−Se) = Sp(1−Sp) weights the two figures alike. p_h is the
// prior prevalence of IEDs in stratum h (priorOf). It oversamples strata
// likely to hold IEDs while strata of likely negatives keep a share set by
// specificity; with a floor of accuracyFloor units every stratum keeps a
// known π > 0: n_h ≥ min(max(Min, 2), N'_h), so π_h = n_h/N'_h ≥ 2/N'_h and
// every design weight is at most N'_h/2 (the floor is Allocate's; the π
// estimator is unbiased only when every π_k > 0, Särndal, Swensson &
// Wretman 1992, ch. 2, chapter from memory). Strata of size 0 get weight 0.
func AccuracyWeights(size []int, prior []float64) ([]float64, error) {
	if len(size) != len(prior) {
		return nil, &allocationError{Msg: fmt.Sprintf("%d priors for %d strata", len(prior), len(size))}
	}
	var P, Q float64
	for h, p := range prior {
		if !(p >= 0 && p <= 1) {
			return nil, &allocationError{Msg: fmt.Sprintf("stratum %d: prior prevalence %v outside [0,1]", h, p)}
		}
		P += float64(size[h]) * p
		Q += float64(size[h]) * (1 - p)
	}
	w := make([]float64, len(size))
	for h, p := range prior {
		var c float64
		if P > 0 {
			c += p / (P * P)
		}
		if Q > 0 {
			c += (1 - p) / (Q * Q)
		}
		w[h] = float64(size[h]) * math.Sqrt(c)
	}
	return w, nil
}

// priorOf returns each stratum's prior prevalence for the Accuracy
// allocation: a.Prior[label] when given (e.g. a guess or phase-1
// estimates), else the share of the stratum's rows whose column
// a.PriorColumn (default auto_count) is ≥ a.PriorAt (default 4),
// smoothed as (k + ½)/(N_h + 1) so that no stratum is given a prior of
// exactly 0 or 1 (Jeffreys' prior, Brown, Cai & DasGupta 2001, Stat Sci
// 16:101). The share of candidates meeting ≥ 4 criteria automatically is
// a monotone stand-in for the panel's prevalence, not an estimate of it.
func (fd *frameDesign) priorOf(a Allocation) ([]float64, error) {
	H := len(fd.labels)
	p := make([]float64, H)
	var k, n []float64
	for h, l := range fd.labels {
		if v, ok := a.Prior[l]; ok {
			if !(v >= 0 && v <= 1) {
				return nil, &allocationError{Stratum: l, Msg: fmt.Sprintf("prior prevalence %v outside [0,1]", v)}
			}
			p[h] = v
			continue
		}
		if k == nil {
			col := a.PriorColumn
			if col == "" {
				col = DefaultPriorColumn
			}
			at := a.PriorAt
			if at == 0 {
				at = DefaultPriorAt
			}
			c, ok := fd.f.Num[col]
			if !ok {
				return nil, &columnError{Column: col, Available: fd.f.Columns()}
			}
			k, n = make([]float64, H), make([]float64, H)
			for r, hr := range fd.st.Row {
				if fd.thin[r] == 0 || math.IsNaN(c[r]) {
					continue
				}
				n[hr]++
				if c[r] >= at {
					k[hr]++
				}
			}
		}
		p[h] = (k[h] + 0.5) / (n[h] + 1)
	}
	return p, nil
}

// StratumPlan is what a sample-size plan needs of a design applied to a
// frame: the strata, their sizes after any cap and their prior prevalence
// (priorOf, whatever the allocation method).
type StratumPlan struct {
	Labels []string
	Size   []int     // N'_h
	Prior  []float64 // p_h
}

// PlanStrata stratifies f by d and returns the strata with their prior
// prevalence.
func PlanStrata(f *Frame, d Design) (*StratumPlan, error) {
	fd, err := prepare(f, d)
	if err != nil {
		return nil, err
	}
	p, err := fd.priorOf(d.Alloc)
	if err != nil {
		return nil, err
	}
	return &StratumPlan{Labels: fd.labels, Size: fd.cappedSizes(), Prior: p}, nil
}

// Allocation returns n_h for a total of n under allocation a (Accuracy
// uses the plan's priors; Neyman needs a.SD).
func (sp *StratumPlan) Allocation(a Allocation, n int) ([]int, error) {
	sd := func(h int) (float64, error) {
		s, ok := a.SD[sp.Labels[h]]
		if !ok {
			return 0, &allocationError{Stratum: sp.Labels[h], Msg: "a plan with Neyman allocation needs SD for every stratum"}
		}
		return s, nil
	}
	a.N = n
	w, n, err := a.weights(sp.Labels, sp.Size, sd, func() ([]float64, error) { return sp.Prior, nil })
	if err != nil {
		return nil, err
	}
	alloc, _, err := Allocate(sp.Labels, sp.Size, w, n, a.floor())
	return alloc, err
}
