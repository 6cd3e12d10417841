package tuning

import (
	"math"

	"github.com/quorate-eeg/quorate/sampling/design"
	"github.com/quorate-eeg/quorate/tuning/accuracy"
	"gonum.org/v1/gonum/stat/distuv"
)

// Estimate is a value with a two-sided interval; Lo and Hi are NaN when no
// interval is given.
type Estimate struct {
	Value, Lo, Hi float64
}

func pointOnly(v float64) Estimate { return Estimate{v, math.NaN(), math.NaN()} }

// Rates are the accuracy figures of one decision rule.
type Rates struct {
	Sens, Spec, PPV, NPV, Accuracy Estimate
	LRPos, LRNeg                   Estimate // likelihood ratios
	Youden                         Estimate // J = Sens + Spec − 1
}

// Metrics describes one operating point on the events it was measured on.
//
// Plain: unweighted counts; Sens, Spec, PPV, NPV and Accuracy with Wilson
// intervals (Newcombe 1998, method 3, via accuracy.Wilson); likelihood
// ratios with the log-method interval of Simel, Samsa & Matchar (1991,
// J Clin Epidemiol 44:763–770),
//
//	SE(ln LR+) = √(1/TP − 1/(TP+FN) + 1/FP − 1/(FP+TN)),
//	SE(ln LR−) = √(1/FN − 1/(TP+FN) + 1/TN − 1/(FP+TN));
//
// Youden's J with the Wald interval J ± z√(Se(1−Se)/P + Sp(1−Sp)/N)
// (Youden 1950, Cancer 3:32–35).
//
// Design: design-weighted combined ratio estimators (design.Sensitivity,
// Specificity, PPV and design.Ratio for NPV and accuracy) with their
// linearised variance with subjects as primary sampling units (design.Sample
// with Cluster; ultimate-cluster estimator, no finite population
// correction, which overstates the variance slightly), turned into Wilson
// intervals on the effective sample size (Korn & Graubard 1998, Survey
// Methodology 24:193–201): n_eff = p(1−p)/v̂ · (t_{n−1}/t_df)², df = subjects
// − variance strata, capped at the denominator's count, or Kish's (Σw)²/Σw² where p is 0 or 1; LRs and J are point estimates
// from the weighted counts.
//
// FalsePerHour is the design-weighted count of reference-negative candidates
// called positive divided by the recording hours (design.RatePerHour, Wald
// interval, floor 0); controls do not count.
type Metrics struct {
	Counts, Weighted accuracy.Confusion
	Plain, Design    Rates
	FalsePerHour     Estimate
}

// measure computes Metrics of the decisions hit on the events of s.
func measure(s *evset, hit []bool, level float64) Metrics {
	m := Metrics{
		Counts:   accuracy.Tally(hit, s.truth, nil),
		Weighted: accuracy.Tally(hit, s.truth, s.weight),
	}
	c := m.Counts
	m.Plain = Rates{
		Sens:     wilson(c.TP, c.TP+c.FN, level),
		Spec:     wilson(c.TN, c.TN+c.FP, level),
		PPV:      wilson(c.TP, c.TP+c.FP, level),
		NPV:      wilson(c.TN, c.TN+c.FN, level),
		Accuracy: wilson(c.TP+c.TN, c.Total(), level),
		LRPos:    lrInterval(c.LRPos(), c.TP, c.TP+c.FN, c.FP, c.FP+c.TN, level),
		LRNeg:    lrInterval(c.LRNeg(), c.FN, c.TP+c.FN, c.TN, c.FP+c.TN, level),
		Youden:   youdenInterval(c, level),
	}
	// subjects as primary sampling units (design.Sample.Cluster)
	sm := design.Sample{Stratum: s.stratum, Weight: s.weight, Cluster: s.subject}
	w := m.Weighted
	ind := func(f func(p, t bool) bool) []float64 {
		v := make([]float64, len(hit))
		for i := range hit {
			if f(hit[i], s.truth[i]) {
				v[i] = 1
			}
		}
		return v
	}
	z := zOf(level)
	// wald turns a design-weighted proportion into a Wilson interval on its effective
	// sample size (Korn & Graubard 1998): n_eff = p(1−p)/v̂, capped at the number of
	// events in the denominator; where v̂ or p(1−p) is 0 (every sampled event on one side)
	// the linearised variance says nothing, and Kish's n_eff = (Σw)²/Σw² of the
	// denominator's weights is used instead (Kish 1965, §11.7). A Wald interval would
	// collapse to a point there, claiming a certainty the sample cannot give.
	wald := func(den []float64) func(e design.Estimate, err error) Estimate {
		return func(e design.Estimate, err error) Estimate {
			if err != nil {
				return pointOnly(math.NaN())
			}
			var n, sw, sw2 float64
			for i, d := range den {
				if d == 1 {
					n++
					sw += s.weight[i]
					sw2 += s.weight[i] * s.weight[i]
				}
			}
			p := e.Value
			neff := math.NaN()
			if v := e.Var; v > 0 && p > 0 && p < 1 {
				neff = e.EffectiveSize(n, level) // df-adjusted, Korn & Graubard 1998
			} else if sw2 > 0 {
				neff = sw * sw / sw2
			}
			if !(neff > 0) || math.IsNaN(p) {
				return pointOnly(p)
			}
			lo, hi := accuracy.Wilson(p*neff, neff, level)
			return Estimate{p, lo, hi}
		}
	}
	one := func(bool, bool) bool { return true }
	pos := ind(func(_, t bool) bool { return t })
	neg := ind(func(_, t bool) bool { return !t })
	called := ind(func(p, _ bool) bool { return p })
	uncalled := ind(func(p, _ bool) bool { return !p })
	m.Design = Rates{
		Sens:     wald(pos)(design.Sensitivity(sm, hit, s.truth)),
		Spec:     wald(neg)(design.Specificity(sm, hit, s.truth)),
		PPV:      wald(called)(design.PPV(sm, hit, s.truth)),
		NPV:      wald(uncalled)(design.Ratio(sm, ind(func(p, t bool) bool { return !p && !t }), uncalled)),
		Accuracy: wald(ind(one))(design.Ratio(sm, ind(func(p, t bool) bool { return p == t }), ind(one))),
		LRPos:    pointOnly(w.LRPos()),
		LRNeg:    pointOnly(w.LRNeg()),
		Youden:   pointOnly(w.Youden()),
	}
	fp := make([]float64, len(hit))
	for i := range hit {
		if hit[i] && !s.truth[i] && s.candidate[i] {
			fp[i] = 1
		}
	}
	m.FalsePerHour = pointOnly(math.NaN())
	if r, err := design.RatePerHour(sm, fp, s.hours); err == nil {
		h := z * r.SE()
		m.FalsePerHour = Estimate{r.Value, math.Max(0, r.Value-h), r.Value + h}
	}
	return m
}

func zOf(level float64) float64 { return distuv.UnitNormal.Quantile(1 - (1-level)/2) }

func wilson(x, n, level float64) Estimate {
	lo, hi := accuracy.Wilson(x, n, level)
	v := math.NaN()
	if n > 0 {
		v = x / n
	}
	return Estimate{v, lo, hi}
}

// lrInterval is the log-method interval of Simel et al. (1991) for a
// likelihood ratio (a/n1)/(b/n2).
func lrInterval(lr, a, n1, b, n2, level float64) Estimate {
	if !(a > 0 && b > 0) || math.IsNaN(lr) || math.IsInf(lr, 0) {
		return pointOnly(lr)
	}
	se := math.Sqrt(1/a - 1/n1 + 1/b - 1/n2)
	h := zOf(level) * se
	return Estimate{lr, lr * math.Exp(-h), lr * math.Exp(h)}
}

func youdenInterval(c accuracy.Confusion, level float64) Estimate {
	se, sp := c.Sensitivity(), c.Specificity()
	j := se + sp - 1
	if math.IsNaN(j) {
		return pointOnly(j)
	}
	h := zOf(level) * math.Sqrt(se*(1-se)/c.Positives()+sp*(1-sp)/c.Negatives())
	return Estimate{j, math.Max(-1, j-h), math.Min(1, j+h)}
}

// Point is one evaluated point of a sweep: the rule, its threshold (a score
// or feature cutoff, or k), and its unweighted and design-weighted counts.
type Point struct {
	Rule         string
	Threshold    float64
	Counts       accuracy.Confusion
	Weighted     accuracy.Confusion
	FalsePerHour float64 // design-weighted false detections among candidates per recording hour
}

// asPoint is the operating point a policy sees: design-weighted rates.
func (p Point) asPoint() accuracy.Point {
	ap := accuracy.NewPoint(p.Threshold, p.Weighted, 1)
	ap.FalsePerHour = p.FalsePerHour
	return ap
}

func asPoints(pts []Point) []accuracy.Point {
	out := make([]accuracy.Point, len(pts))
	for i, p := range pts {
		out[i] = p.asPoint()
	}
	return out
}

// falsePerHour returns fp/hours, NaN without hours.
func falsePerHour(fp, hours float64) float64 {
	if !(hours > 0) {
		return math.NaN()
	}
	return fp / hours
}
