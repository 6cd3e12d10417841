package tuning

import (
	"cmp"
	"math"
	"slices"

	"github.com/quorate-eeg/quorate/tuning/accuracy"
)

// ScoreSweep is analysis (d): the rule "detector score ≥ threshold" at every
// distinct score (+Inf first, as accuracy.Counts orders them), against the
// reference standard.
//
// FalsePerHour at a threshold is the design-weighted count of
// reference-negative candidates at or above it divided by the recording
// hours: the weights project the sampled false detections to the whole
// archive. AUC is unweighted with the DeLong (1988) interval, subjects as clusters (Obuchowski 1997); WeightedAUC is
// the design-weighted trapezoidal area.
type ScoreSweep struct {
	N           int // events with a score
	Curve       []Point
	AUC         Estimate
	WeightedAUC float64
	// Chosen indexes Curve at the policy's point, −1 when none qualifies;
	// At holds its metrics.
	Chosen int
	At     *Metrics
}

func scoreSweep(s *evset, policy accuracy.Policy, level float64) (ScoreSweep, int) {
	var idx []int
	for i, e := range s.src {
		if !math.IsNaN(e.Score) {
			idx = append(idx, i)
		}
	}
	sw := ScoreSweep{N: len(idx), Chosen: -1, AUC: pointOnly(math.NaN()), WeightedAUC: math.NaN()}
	missing := s.n() - len(idx)
	if len(idx) == 0 {
		return sw, missing
	}
	score := func(i int) float64 { return s.src[i].Score }
	slices.SortStableFunc(idx, func(a, b int) int { return cmp.Compare(score(b), score(a)) })
	var plain, wt accuracy.Confusion
	var fc float64
	for _, i := range idx {
		if s.truth[i] {
			plain.FN++
			wt.FN += s.weight[i]
		} else {
			plain.TN++
			wt.TN += s.weight[i]
		}
	}
	sw.Curve = append(sw.Curve, Point{Rule: "score", Threshold: math.Inf(1), Counts: plain, Weighted: wt, FalsePerHour: falsePerHour(0, s.hours)})
	for k := 0; k < len(idx); {
		th := score(idx[k])
		for ; k < len(idx) && score(idx[k]) == th; k++ {
			i := idx[k]
			w := s.weight[i]
			if s.truth[i] {
				plain.TP, plain.FN = plain.TP+1, plain.FN-1
				wt.TP, wt.FN = wt.TP+w, wt.FN-w
			} else {
				plain.FP, plain.TN = plain.FP+1, plain.TN-1
				wt.FP, wt.TN = wt.FP+w, wt.TN-w
				if s.candidate[i] {
					fc += w
				}
			}
		}
		sw.Curve = append(sw.Curve, Point{Rule: "score", Threshold: th, Counts: plain, Weighted: wt, FalsePerHour: falsePerHour(fc, s.hours)})
	}
	x := make([]float64, len(idx))
	t := make([]bool, len(idx))
	subj := make([]string, len(idx))
	for k, i := range idx {
		x[k], t[k], subj[k] = score(i), s.truth[i], s.subject[i]
	}
	sw.AUC = aucEstimate(x, t, subj, level)
	ws := make([]accuracy.Confusion, len(sw.Curve))
	for i, p := range sw.Curve {
		ws[i] = p.Weighted
	}
	sw.WeightedAUC = countsAUC(ws)
	if c, err := accuracy.Choose(asPoints(sw.Curve), policy); err == nil {
		sw.Chosen = c
		th := sw.Curve[c].Threshold
		hit := make([]bool, s.n())
		for i, e := range s.src {
			hit[i] = e.Score >= th // NaN scores are never called
		}
		m := measure(s, hit, level)
		sw.At = &m
	}
	return sw, missing
}

// aucEstimate is the empirical AUC with a DeLong-type interval that treats
// subjects as clusters (Obuchowski 1997): events of one patient are not
// independent, and the independent-events variance (DeLong et al. 1988)
// understates the interval's width when they are not. With fewer than two
// subjects no clustered variance exists and the DeLong variance is used.
func aucEstimate(x []float64, t []bool, subject []string, level float64) Estimate {
	auc, v := accuracy.DeLongClustered(x, t, subject)
	if math.IsNaN(v) {
		auc, v = accuracy.DeLong(x, t)
	}
	lo, hi := accuracy.DeLongCI(auc, v, level)
	return Estimate{auc, lo, hi}
}
