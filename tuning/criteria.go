package tuning

import (
	"fmt"
	"math"

	"github.com/quorate-eeg/quorate/sampling/candidate"
	"github.com/quorate-eeg/quorate/tuning/accuracy"
)

// CriterionROC is analysis (c), first part: one criterion's feature against
// the panel majority for that criterion, over the events with both a
// majority decision and a measured feature.
//
// The direction is always +1: every feature is defined so that a higher
// value means the criterion is more clearly present (sampling/detect decides
// "met" at or above its cutoff), and a rule that counted a criterion as met
// when its feature is low would say the opposite of the criterion. A
// feature whose design-weighted AUC against its label is below ½ keeps that
// direction, its AUC is reported as it is, and fitting warns. The
// cutoff is the threshold maximising design-weighted Youden's J (Youden 1950,
// Cancer 3:32–35) whatever the study's policy, because a criterion cutoff is
// a building block of a rule, not an operating point: the policy is applied
// to the rule (AutoRule). AUC is unweighted with the DeLong (1988) interval, subjects as clusters (Obuchowski 1997),
// which has no weighted form; WeightedAUC is the design-weighted area.
type CriterionROC struct {
	Criterion   int // 1…6
	Feature     string
	N           int
	Present     int // events whose majority is present
	Direction   int
	AUC         Estimate
	WeightedAUC float64
	Cutoff      float64 // in the feature's units; the criterion is met at or beyond it
	AtCutoff    Point
	Curve       []Point // every threshold, in the feature's units
	Skipped     string  // why no ROC was drawn, or ""
}

// criterionFit is a criterion's direction and Youden cutoff on some events.
type criterionFit struct {
	dir     float64 // +1 or −1
	cut     float64 // in direction-adjusted units: met when dir·x ≥ cut
	ok      bool
	skip    string
	against string    // a warning when the feature runs against its label, or ""
	th      []float64 // direction-adjusted thresholds
	plain   []accuracy.Confusion
	weighed []accuracy.Confusion
	best    int
}

// fitCriterion finds the direction and Youden cutoff of feature j against
// the majority for j.
func fitCriterion(s *evset, j int, withPlain bool) criterionFit {
	return fitFeature(s, j, withPlain, false)
}

// fitFeature finds the direction and Youden cutoff of slot j (a criterion's
// feature, or the detector score at scoreSlot) against the panel majority
// for criterion j, or, with byVerdict, against the reference standard (the
// IED verdict) on every event where the value is measured. The score has no
// criterion majority and is always fitted by verdict.
func fitFeature(s *evset, j int, withPlain, byVerdict bool) criterionFit {
	byVerdict = byVerdict || j == scoreSlot
	var x, w []float64
	var t []bool
	for i, e := range s.src {
		v := value(e, j)
		if math.IsNaN(v) || (!byVerdict && e.Majority[j] == -1) {
			continue
		}
		x = append(x, v)
		if byVerdict {
			t = append(t, s.truth[i])
		} else {
			t = append(t, e.Majority[j] == 1)
		}
		w = append(w, s.weight[i])
	}
	name, label := slotName(j), slotLabel(j)
	pos := 0
	for _, b := range t {
		if b {
			pos++
		}
	}
	switch {
	case len(x) == 0:
		if byVerdict {
			return criterionFit{skip: fmt.Sprintf("%s: no event with a reference has a measured %s", label, name)}
		}
		return criterionFit{skip: fmt.Sprintf("%s: no event has both a panel decision and a measured %s", label, name)}
	case pos == 0 || pos == len(x):
		ref := "panel majority"
		if byVerdict {
			ref = "reference standard"
		}
		return criterionFit{skip: fmt.Sprintf("%s: the %s is the same for all %d events; no ROC for %s", label, ref, len(x), name)}
	}
	lo, hi := x[0], x[0]
	for _, v := range x {
		lo, hi = math.Min(lo, v), math.Max(hi, v)
	}
	if lo == hi {
		return criterionFit{skip: fmt.Sprintf("%s: %s is constant (%g) on all %d events; its ROC is skipped and it is left out of the automatic rule", label, name, lo, len(x))}
	}
	f := criterionFit{dir: 1, ok: true}
	f.th, f.weighed = accuracy.Counts(x, t, w)
	if a := countsAUC(f.weighed); a < 0.5 {
		// Never flipped: see CriterionROC.
		ref := fmt.Sprintf("panel majority for %s", label)
		if byVerdict {
			ref = "panel verdict"
		}
		f.against = fmt.Sprintf("%s: %s runs against the %s (design-weighted AUC %.2f < 0.5); it keeps its defined direction (higher = met), so it rarely helps the rule",
			label, name, ref, a)
	}
	if withPlain {
		_, f.plain = accuracy.Counts(x, t, nil)
	}
	pts := make([]accuracy.Point, len(f.th))
	for i, c := range f.weighed {
		pts[i] = accuracy.NewPoint(f.th[i], c, math.NaN())
	}
	f.best, _ = accuracy.Choose(pts, accuracy.Policy{Kind: accuracy.Youden})
	f.cut = f.th[f.best]
	return f
}

// countsAUC is the trapezoidal AUC of a Counts curve.
func countsAUC(cs []accuracy.Confusion) float64 {
	tpr := make([]float64, len(cs))
	fpr := make([]float64, len(cs))
	for i, c := range cs {
		tpr[i], fpr[i] = c.Sensitivity(), 1-c.Specificity()
	}
	return accuracy.AUC(tpr, fpr)
}

func criterionROC(s *evset, j int, level float64) (CriterionROC, criterionFit) {
	r := CriterionROC{Criterion: j + 1, Feature: candidate.FeatureNames[j], AUC: pointOnly(math.NaN()), WeightedAUC: math.NaN(), Cutoff: math.NaN()}
	f := fitCriterion(s, j, true)
	if !f.ok {
		r.Skipped = f.skip
		return r, f
	}
	var x []float64
	var t []bool
	var subj []string
	for i, e := range s.src {
		if v := e.Features[j]; e.Majority[j] != -1 && !math.IsNaN(v) {
			x = append(x, f.dir*v)
			t = append(t, e.Majority[j] == 1)
			subj = append(subj, s.subject[i])
			r.N++
			if e.Majority[j] == 1 {
				r.Present++
			}
		}
	}
	r.AUC = aucEstimate(x, t, subj, level)
	r.WeightedAUC = countsAUC(f.weighed)
	r.Direction = int(f.dir)
	// The cutoff sits in the gap below the Youden threshold (gapCut), so it
	// reads back to the same decisions however it is printed.
	below := math.Inf(-1)
	for _, v := range x {
		if v < f.cut {
			below = math.Max(below, v)
		}
	}
	r.Cutoff = f.dir * f.cut
	if !math.IsInf(f.cut, 0) {
		r.Cutoff = f.dir * gapCut(below, f.cut)
	}
	for i := range f.th {
		r.Curve = append(r.Curve, Point{Rule: r.Feature, Threshold: f.dir * f.th[i], Counts: f.plain[i], Weighted: f.weighed[i], FalsePerHour: math.NaN()})
	}
	r.AtCutoff = r.Curve[f.best]
	return r, f
}
