package tuning

import (
	"fmt"

	"github.com/quorate-eeg/quorate/tuning/accuracy"
)

// Fitting methods of the automatic rule "at least k criteria met at these
// cutoffs".
const (
	// MethodCriterion fits each criterion's cutoff against that criterion's
	// own panel majority, the label the feature is meant to reproduce, by
	// design-weighted Youden's J (Youden 1950, Cancer 3:32–35), one threshold
	// per feature; only k is then chosen against the reference standard by
	// the policy. Seven choices see the verdict's labels instead of the
	// joint search's dozens, so the in-sample figures are far less
	// optimistic (Harrell 2015, Regression Modeling Strategies, §4.1).
	MethodCriterion = "criterion-majority"
	// MethodJoint is the joint search of AutoRule: six cutoffs and k chosen
	// together against the reference standard.
	MethodJoint = "joint-search"
)

// fitRule fits the automatic rule by method on s.
func fitRule(s *evset, method string, p accuracy.Policy) (*autoFit, []string, error) {
	switch method {
	case MethodJoint:
		return fitAuto(s, p)
	case MethodCriterion, "":
		return fitMajority(s, p)
	}
	return nil, nil, &InputError{Index: -1, Field: "Method", Msg: fmt.Sprintf("want %q or %q, got %q", MethodCriterion, MethodJoint, method)}
}

// fitMajority fits each criterion by fitCriterion (direction by weighted
// AUC ≥ ½, Youden cutoff against the criterion's panel majority), places
// each cutoff in the gap between adjacent observed values (placeCuts), and
// lets the policy pick k = 1…6 on the design-weighted figures against the
// reference standard (ties to the larger k). A criterion whose majority is
// one-sided or whose feature is constant is left out.
func fitMajority(s *evset, p accuracy.Policy) (*autoFit, []string, error) {
	f := &autoFit{}
	var warn []string
	for j := range 6 {
		cf := fitCriterion(s, j, false)
		if !cf.ok {
			warn = append(warn, fmt.Sprintf("c%d: %s; left out of the automatic rule", j+1, cf.skip))
			continue
		}
		f.active[j], f.dir[j], f.cut[j] = true, cf.dir, cf.cut
	}
	if f.active == [6]bool{} {
		return nil, warn, &NoDataError{Msg: "no criterion has a panel majority both ways and a varying feature: no automatic rule can be tuned"}
	}
	placeCuts(s, f, &f.cut)
	var kpts [6]accuracy.Point
	for k := 1; k <= 6; k++ {
		bk := &f.byK[k-1]
		bk.cut = f.cut
		var fc float64
		hit := make([]bool, s.n())
		for i, e := range s.src {
			hit[i] = f.hits(e, &f.cut, k)
			if hit[i] && !s.truth[i] && s.candidate[i] {
				fc += s.weight[i]
			}
		}
		bk.w = accuracy.Tally(hit, s.truth, s.weight)
		bk.fp = fc // a weighted count, as in fitAuto
		bk.point = accuracy.NewPoint(float64(k), bk.w, 1)
		bk.point.FalsePerHour = falsePerHour(fc, s.hours)
		kpts[k-1] = bk.point
	}
	idx, err := chooseK(kpts[:], p)
	f.k = idx + 1
	return f, warn, err
}
