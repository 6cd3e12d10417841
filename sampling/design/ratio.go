package design

import "fmt"

// Ratio returns the combined ratio estimator
//
//	R̂ = Σ w_i y_i / Σ w_i x_i
//
// with its linearised (Taylor) variance: the stratified variance of the
// weighted total of the residuals z_i = y_i − R̂ x_i, divided by X̂²,
//
//	v(R̂) = Σ_h (1−f_h) n_h/(n_h−1) Σ_{i∈h} (w_i z_i − mean_h(w z))² / X̂²,
//
// X̂ = Σ w_i x_i (Cochran 1977, §6.11, combined ratio estimate, in the form
// of Särndal, Swensson & Wretman 1992, §5.6). With w_i = N_h/n_h it is
// Cochran's v(R̂) = Σ_h N_h²(1−f_h)(s²_yh + R̂² s²_xh − 2R̂ s_yxh)/n_h / X̂².
// Units with zero weight in the denominator total make R̂ undefined: an
// error is returned when X̂ = 0.
func Ratio(s Sample, y, x []float64) (Estimate, error) {
	if err := s.check(len(y), map[string]int{"y": len(y), "x": len(x)}); err != nil {
		return Estimate{}, err
	}
	var ty, tx float64
	for i, w := range s.Weight {
		ty += w * y[i]
		tx += w * x[i]
	}
	if tx == 0 {
		return Estimate{}, &FieldError{Field: "x", Index: -1, Msg: "weighted denominator total is zero"}
	}
	r := ty / tx
	z := make([]float64, len(y))
	for i := range z {
		z[i] = y[i] - r*x[i]
	}
	return Estimate{Value: r, Var: s.linVar(z) / (tx * tx), DF: s.DF()}, nil
}

func indicators(pred, truth []bool, f func(p, t bool) (num, den bool)) (y, x []float64, err error) {
	if len(pred) != len(truth) {
		return nil, nil, &FieldError{Field: "truth", Index: -1, Msg: fmt.Sprintf("%d truths for %d predictions", len(truth), len(pred))}
	}
	y = make([]float64, len(pred))
	x = make([]float64, len(pred))
	for i := range pred {
		n, d := f(pred[i], truth[i])
		if n {
			y[i] = 1
		}
		if d {
			x[i] = 1
		}
	}
	return y, x, nil
}

// Sensitivity estimates P(pred | truth) = Σ w·[pred∧truth] / Σ w·[truth]
// with Ratio.
func Sensitivity(s Sample, pred, truth []bool) (Estimate, error) {
	y, x, err := indicators(pred, truth, func(p, t bool) (bool, bool) { return p && t, t })
	if err != nil {
		return Estimate{}, err
	}
	return Ratio(s, y, x)
}

// Specificity estimates P(¬pred | ¬truth) = Σ w·[¬pred∧¬truth] / Σ w·[¬truth]
// with Ratio.
func Specificity(s Sample, pred, truth []bool) (Estimate, error) {
	y, x, err := indicators(pred, truth, func(p, t bool) (bool, bool) { return !p && !t, !t })
	if err != nil {
		return Estimate{}, err
	}
	return Ratio(s, y, x)
}

// PPV estimates P(truth | pred) = Σ w·[pred∧truth] / Σ w·[pred] with Ratio.
func PPV(s Sample, pred, truth []bool) (Estimate, error) {
	y, x, err := indicators(pred, truth, func(p, t bool) (bool, bool) { return p && t, p })
	if err != nil {
		return Estimate{}, err
	}
	return Ratio(s, y, x)
}

// Prevalence estimates the share of true IEDs among candidates,
// Σ w·[truth] / Σ w, with Ratio (the estimated N̂ = Σ w in the
// denominator, Särndal et al. 1992, §5.7).
func Prevalence(s Sample, truth []bool) (Estimate, error) {
	y, x, err := indicators(truth, truth, func(p, _ bool) (bool, bool) { return p, true })
	if err != nil {
		return Estimate{}, err
	}
	return Ratio(s, y, x)
}

// RatePerHour estimates IEDs per recording hour as Ŷ/H, where Ŷ = Σ w y is
// the weighted total of IED counts per sampled unit and H the known total
// recording time in hours; v = v(Ŷ)/H² (Total). When the hours themselves
// are sampled, use Ratio with x = hours per unit.
func RatePerHour(s Sample, y []float64, hours float64) (Estimate, error) {
	if !(hours > 0) {
		return Estimate{}, &FieldError{Field: "hours", Index: -1, Msg: fmt.Sprintf("total hours %v not positive", hours)}
	}
	t, err := Total(s, y)
	if err != nil {
		return Estimate{}, err
	}
	return Estimate{Value: t.Value / hours, Var: t.Var / (hours * hours), DF: t.DF}, nil
}
