package tuning

import (
	"math"
	"strconv"

	"github.com/quorate-eeg/quorate/tuning/accuracy"
)

// KRow is the rule "the panel majority found at least K of the six criteria
// present", measured against the reference standard.
type KRow struct {
	K int
	Metrics
}

// KSweep is analysis (a): the k-of-6 rules on the panel's majority criteria.
type KSweep struct {
	Rows []KRow // K = 1…6
	// AUC and WeightedAUC are the trapezoidal areas under the ROC curve
	// through the six rules and the corners (0,0) and (1,1), unweighted and
	// design-weighted (accuracy.AUC).
	AUC, WeightedAUC float64
	// Chosen indexes Rows at the rule the policy picks on the weighted
	// rates, −1 when none qualifies.
	Chosen int
}

// majorityCriteria returns, per event, which criteria the panel majority
// found present; undetermined and no-quorum count as not present.
func majorityCriteria(s *evset) [][]bool {
	out := make([][]bool, s.n())
	for i, e := range s.src {
		row := make([]bool, 6)
		for j, m := range e.Majority {
			row[j] = m == 1
		}
		out[i] = row
	}
	return out
}

func kSweep(s *evset, o *Options, level float64) KSweep {
	crit := majorityCriteria(s)
	count := make([]int, s.n())
	for i, row := range crit {
		for _, b := range row {
			if b {
				count[i]++
			}
		}
	}
	var ks KSweep
	hit := make([]bool, s.n())
	pts := make([]Point, 6)
	for k := 1; k <= 6; k++ {
		for i := range hit {
			hit[i] = count[i] >= k
		}
		m := measure(s, hit, level)
		ks.Rows = append(ks.Rows, KRow{K: k, Metrics: m})
		pts[k-1] = Point{Threshold: float64(k), Weighted: m.Weighted, FalsePerHour: m.FalsePerHour.Value}
	}
	ks.AUC = cornersAUC(accuracy.KSweep(crit, s.truth, nil))
	ks.WeightedAUC = cornersAUC(accuracy.KSweep(crit, s.truth, s.weight))
	ks.Chosen, _ = accuracy.Choose(asPoints(pts), o.Policy)
	return ks
}

// cornersAUC is the trapezoidal area under the curve through nested rules
// (strictest last) closed by (0,0) and (1,1).
func cornersAUC(cs []accuracy.Confusion) float64 {
	tpr := []float64{0}
	fpr := []float64{0}
	for i := len(cs) - 1; i >= 0; i-- {
		tpr = append(tpr, cs[i].Sensitivity())
		fpr = append(fpr, 1-cs[i].Specificity())
	}
	tpr = append(tpr, 1)
	fpr = append(fpr, 1)
	for _, v := range tpr {
		if math.IsNaN(v) {
			return math.NaN()
		}
	}
	return accuracy.AUC(tpr, fpr)
}

func kName(k int) string { return "≥" + strconv.Itoa(k) + " of 6 criteria (panel majority)" }
