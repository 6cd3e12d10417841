package plan

import (
	"context"
	"fmt"
	"math"

	"github.com/quorate-eeg/quorate/sampling/draw"
	"gonum.org/v1/gonum/stat/distuv"
)

// Options describe the candidate study.
type Options struct {
	Strata *draw.StratumPlan // strata, N'_h and prior prevalence p_h
	Alloc  draw.Allocation   // how n is shared among strata
	Sizes  []int             // total events to consider; nil: 100, 200, 300, 500, 800

	Sens, Spec     float64 // expected sensitivity and specificity of the rule; 0: 0.8 and 0.9
	DesignEffect   float64 // variance inflation for events clustered in subjects; 0: 1.5
	Kappa          float64 // expected Fleiss' kappa between raters; 0: 0.4
	Raters         int     // raters per event; 0: 3
	SecondsPerItem float64 // rating time per item and rater, s; 0: 30
	Controls       int     // background controls rated besides the events
	Level          float64 // interval level; 0: 0.95
}

// Row is the forecast for one total sample size.
type Row struct {
	N              int     // events drawn
	Positives      float64 // expected IEDs among them, Σ n_h p_h
	SensHalfWidth  float64 // expected half-width of the sensitivity interval
	SpecHalfWidth  float64 // expected half-width of the specificity interval
	ReferenceError float64 // expected share of events whose panel majority is wrong
	RaterHours     float64 // (N + Controls) · Raters · SecondsPerItem / 3600
}

func (o *Options) defaults() {
	if o.Sizes == nil {
		o.Sizes = []int{100, 200, 300, 500, 800}
	}
	def := func(v *float64, d float64) {
		if *v == 0 {
			*v = d
		}
	}
	def(&o.Sens, 0.8)
	def(&o.Spec, 0.9)
	def(&o.DesignEffect, 1.5) // common practice: a cautious guess for events clustered in subjects
	def(&o.Kappa, 0.4)
	def(&o.SecondsPerItem, 30)
	def(&o.Level, 0.95)
	if o.Raters == 0 {
		o.Raters = 3
	}
}

// Run forecasts each sample size of o.Sizes (sizes larger than the
// candidates are skipped).
//
// Half-widths. With the rule's sensitivity Se the same in every stratum,
// the linearised variance of the combined ratio estimator of Se (Cochran
// 1977, §6.11) under stratified simple random sampling is
//
//	v(Ŝe) = deff · Se(1−Se) Σ_h N_h² (1−n_h/N_h) p_h / n_h / P²,   P = Σ_h N_h p_h,
//
// and v(Ŝp) likewise with 1−p_h, Sp and Q = Σ_h N_h (1−p_h); the half-width
// is z_{1−α/2}·√v. deff multiplies the variance for events clustered in
// subjects (Kish 1965, §8.2). n_h comes from o.Alloc.
//
// Reference error. Each rater is taken to be right with probability a
// whatever the truth, errors independent given the truth (the two-class
// model of Dawid & Skene 1979 with equal raters); two raters then agree
// with probability a² + (1−a)², and chance agreement is q² + (1−q)² with
// q = p̄a + (1−p̄)(1−a) the share of "yes" calls, p̄ = P/N. a is solved from
// the expected kappa by bisection, and the majority of R raters is wrong
// with probability Σ_{k<R/2} C(R,k) a^k (1−a)^{R−k} (half the tie
// probability for even R). Label errors bias a figure rather than widen
// its interval, so this is reported beside the half-widths, not in them.
func Run(ctx context.Context, o Options) ([]Row, error) {
	o.defaults()
	if o.Strata == nil || len(o.Strata.Size) == 0 {
		return nil, fmt.Errorf("plan: no strata: the candidates are needed")
	}
	for name, v := range map[string]float64{"sensitivity": o.Sens, "specificity": o.Spec} {
		if !(v > 0 && v < 1) {
			return nil, fmt.Errorf("plan: expected %s %v, want a value in (0,1)", name, v)
		}
	}
	if !(o.DesignEffect >= 1) {
		return nil, fmt.Errorf("plan: design effect %v, want ≥ 1", o.DesignEffect)
	}
	if !(o.Kappa > 0 && o.Kappa <= 1) {
		return nil, fmt.Errorf("plan: expected kappa %v, want a value in (0,1]", o.Kappa)
	}
	if o.Raters < 1 || !(o.SecondsPerItem > 0) || o.Controls < 0 {
		return nil, fmt.Errorf("plan: raters %d, seconds per item %v, controls %d: want ≥ 1, > 0, ≥ 0", o.Raters, o.SecondsPerItem, o.Controls)
	}
	sp := o.Strata
	var N, P, Q float64
	for h, s := range sp.Size {
		N += float64(s)
		P += float64(s) * sp.Prior[h]
		Q += float64(s) * (1 - sp.Prior[h])
	}
	z := distuv.UnitNormal.Quantile(1 - (1-o.Level)/2)
	refErr := MajorityError(RaterAccuracy(o.Kappa, P/N), o.Raters)
	var rows []Row
	for _, n := range o.Sizes {
		if err := ctx.Err(); err != nil {
			return nil, err
		}
		if n < 1 || float64(n) > N {
			continue
		}
		nh, err := sp.Allocation(o.Alloc, n)
		if err != nil {
			return nil, err
		}
		r := Row{N: n, ReferenceError: refErr, RaterHours: float64((n+o.Controls)*o.Raters) * o.SecondsPerItem / 3600}
		var vs, vp float64
		for h, s := range sp.Size {
			if nh[h] == 0 {
				continue
			}
			Nh, k, p := float64(s), float64(nh[h]), sp.Prior[h]
			r.Positives += k * p
			c := Nh * Nh * (1 - k/Nh) / k
			vs += c * p
			vp += c * (1 - p)
		}
		r.SensHalfWidth = z * math.Sqrt(o.DesignEffect*o.Sens*(1-o.Sens)*vs/(P*P))
		r.SpecHalfWidth = z * math.Sqrt(o.DesignEffect*o.Spec*(1-o.Spec)*vp/(Q*Q))
		rows = append(rows, r)
	}
	return rows, nil
}

// RaterAccuracy returns the accuracy a ∈ [½, 1] of equal raters, errors
// independent given the truth, at which Cohen's/Fleiss' kappa of two
// raters equals kappa when the prevalence is p (see Run); bisection to
// 1e-12. NaN for kappa outside (0, 1].
func RaterAccuracy(kappa, p float64) float64 {
	if !(kappa > 0 && kappa <= 1) {
		return math.NaN()
	}
	k := func(a float64) float64 {
		q := p*a + (1-p)*(1-a)
		po, pe := a*a+(1-a)*(1-a), q*q+(1-q)*(1-q)
		if pe == 1 {
			return 1
		}
		return (po - pe) / (1 - pe)
	}
	lo, hi := 0.5, 1.0
	for hi-lo > 1e-12 {
		m := (lo + hi) / 2
		if k(m) < kappa {
			lo = m
		} else {
			hi = m
		}
	}
	return (lo + hi) / 2
}

// MajorityError returns the probability that the majority of r raters of
// accuracy a, errors independent, is wrong; a tie (even r) counts half.
func MajorityError(a float64, r int) float64 {
	e := 0.0
	for k := 0; k <= r; k++ { // k raters right
		pk := binom(r, k) * math.Pow(a, float64(k)) * math.Pow(1-a, float64(r-k))
		switch {
		case 2*k < r:
			e += pk
		case 2*k == r:
			e += pk / 2
		}
	}
	return e
}

func binom(n, k int) float64 {
	c := 1.0
	for i := 1; i <= k; i++ {
		c *= float64(n-k+i) / float64(i)
	}
	return c
}
