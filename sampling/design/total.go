package design

import "fmt"

// HTTotal returns the Horvitz–Thompson estimator of a population total,
//
//	Ŷ = Σ_i y_i / π_i,
//
// unbiased for any design with all first-order inclusion probabilities
// π_i > 0 (Horvitz & Thompson 1952; Särndal et al. 1992, §2.8). Its
// variance needs second-order probabilities; for a stratified design use
// Total.
func HTTotal(y, pi []float64) (float64, error) {
	if len(y) != len(pi) {
		return 0, &FieldError{Field: "pi", Index: -1, Msg: fmt.Sprintf("%d probabilities for %d values", len(pi), len(y))}
	}
	t := 0.0
	for i, p := range pi {
		if !(p > 0 && p <= 1) {
			return 0, &FieldError{Field: "pi", Index: i, Msg: fmt.Sprintf("inclusion probability %v outside (0,1]", p)}
		}
		t += y[i] / p
	}
	return t, nil
}

// Total returns the design-weighted total Ŷ = Σ w_i y_i with the
// stratified variance estimator v = Σ_h (1−f_h) n_h/(n_h−1) Σ_{i∈h}
// (w_i y_i − mean_h(w y))² (see Sample.FPC). Under stratified simple random
// sampling this is N ȳ_st and Cochran's (1977, §5.3) v(N ȳ_st).
func Total(s Sample, y []float64) (Estimate, error) {
	if err := s.check(len(y), map[string]int{"y": len(y)}); err != nil {
		return Estimate{}, err
	}
	t := 0.0
	for i, w := range s.Weight {
		t += w * y[i]
	}
	return Estimate{Value: t, Var: s.linVar(y), DF: s.DF()}, nil
}

// StratMean returns the stratified mean and its unbiased variance under
// stratified simple random sampling without replacement (Cochran 1977,
// §5.2–5.3, eqs. for ȳ_st and v(ȳ_st)):
//
//	ȳ_st = Σ_h W_h ȳ_h,   v(ȳ_st) = Σ_h W_h² (1−f_h) s²_h / n_h,
//
// W_h = N_h/N, f_h = n_h/N_h, s²_h with divisor n_h−1. Nh gives N_h per
// stratum label; y is grouped by stratum. A stratum with one unit has no
// s²_h and returns an error.
func StratMean(Nh map[string]float64, stratum []string, y []float64) (Estimate, error) {
	if len(stratum) != len(y) {
		return Estimate{}, &FieldError{Field: "y", Index: -1, Msg: fmt.Sprintf("%d values for %d units", len(y), len(stratum))}
	}
	type acc struct{ n, sum, sum2 float64 }
	by := make(map[string]*acc)
	for i, h := range stratum {
		if _, ok := Nh[h]; !ok {
			return Estimate{}, &FieldError{Field: "stratum", Index: i, Msg: fmt.Sprintf("stratum %q has no population size", h)}
		}
		a := by[h]
		if a == nil {
			a = &acc{}
			by[h] = a
		}
		a.n++
		a.sum += y[i]
	}
	N := 0.0
	for _, v := range Nh {
		N += v
	}
	// second pass for s²_h about the stratum mean (avoids cancellation)
	for i, h := range stratum {
		d := y[i] - by[h].sum/by[h].n
		by[h].sum2 += d * d
	}
	var e Estimate
	for h, a := range by {
		if a.n < 2 {
			return Estimate{}, &FieldError{Field: "stratum", Index: -1, Msg: fmt.Sprintf("stratum %q has one unit: no variance", h)}
		}
		if a.n > Nh[h] {
			return Estimate{}, &FieldError{Field: "stratum", Index: -1, Msg: fmt.Sprintf("stratum %q: n_h=%v exceeds N_h=%v", h, a.n, Nh[h])}
		}
		W := Nh[h] / N
		s2 := a.sum2 / (a.n - 1)
		e.Value += W * a.sum / a.n
		e.Var += W * W * (1 - a.n/Nh[h]) * s2 / a.n
	}
	return e, nil
}
