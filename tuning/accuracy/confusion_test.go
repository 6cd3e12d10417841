package accuracy

import (
	"math"
	"testing"
)

func near(a, b, tol float64) bool {
	if math.IsNaN(a) || math.IsNaN(b) {
		return math.IsNaN(a) && math.IsNaN(b)
	}
	if math.IsInf(a, 0) || math.IsInf(b, 0) {
		return a == b
	}
	return math.Abs(a-b) <= tol
}

func TestConfusionRates(t *testing.T) {
	// Altman & Bland (1994), "Diagnostic tests 1: sensitivity and
	// specificity", BMJ 308:1552: liver scan against necropsy/biopsy, 231
	// true positives, 32 false positives, 27 false negatives, 54 true
	// negatives; the paper prints sensitivity 0.895 and specificity 0.628,
	// and Altman & Bland (1994), BMJ 309:102, PPV 0.878 and NPV 0.667 (the
	// printed three decimals from memory). Full precision:
	// sklearn.metrics.recall_score and precision_score with pos_label 1
	// and 0 and the cell counts as sample_weight (testdata/reference.py).
	ref := readLibRef(t)
	c := Confusion{TP: 231, FP: 32, FN: 27, TN: 54}
	for _, tc := range []struct {
		name string
		got  float64
		lib  float64
		want float64
	}{
		{"sensitivity", c.Sensitivity(), ref.AltmanBland.Sensitivity, 0.895},
		{"specificity", c.Specificity(), ref.AltmanBland.Specificity, 0.628},
		{"PPV", c.PPV(), ref.AltmanBland.PPV, 0.878},
		{"NPV", c.NPV(), ref.AltmanBland.NPV, 0.667},
	} {
		if !near(tc.got, tc.lib, 1e-12) {
			t.Errorf("%s = %v, want scikit-learn %v", tc.name, tc.got, tc.lib)
		}
		if !near(tc.got, tc.want, 5e-4) {
			t.Errorf("%s = %v, want published %v", tc.name, tc.got, tc.want)
		}
	}
	for _, tc := range []struct {
		name string
		got  float64
		want float64
	}{
		// LR+ = 0.895/0.372 and LR− = 0.105/0.628, closed form from the
		// rates above.
		{"LR+", c.LRPos(), (231.0 / 258) / (32.0 / 86)},
		{"LR-", c.LRNeg(), (27.0 / 258) / (54.0 / 86)},
		{"accuracy", c.Accuracy(), 285.0 / 344},
		{"youden", c.Youden(), 231.0/258 + 54.0/86 - 1},
	} {
		if !near(tc.got, tc.want, 5e-4) {
			t.Errorf("%s = %v, want %v", tc.name, tc.got, tc.want)
		}
	}
}

func TestConfusionZeroDenominators(t *testing.T) {
	inf, nan := math.Inf(1), math.NaN()
	for _, tc := range []struct {
		c                    Confusion
		sens, spec, lrp, lrn float64
	}{
		// No false positives: spec 1, LR+ = sens/0 = +Inf.
		{Confusion{TP: 3, FN: 1, TN: 5}, 0.75, 1, inf, 0.25},
		// Nothing called positive: sens 0, spec 1, LR+ = 0/0.
		{Confusion{FN: 4, TN: 5}, 0, 1, nan, 1},
		// Everything called positive: spec 0, LR− = 0/0.
		{Confusion{TP: 4, FP: 5}, 1, 0, 1, nan},
		// All wrong: spec 0 and 1−sens = 1, LR− = 1/0.
		{Confusion{FN: 4, FP: 5}, 0, 0, 0, inf},
		// No reference positives: sensitivity undefined.
		{Confusion{FP: 1, TN: 5}, nan, 5.0 / 6, nan, nan},
	} {
		c := tc.c
		if !near(c.Sensitivity(), tc.sens, 1e-12) || !near(c.Specificity(), tc.spec, 1e-12) ||
			!near(c.LRPos(), tc.lrp, 1e-12) || !near(c.LRNeg(), tc.lrn, 1e-12) {
			t.Errorf("%+v: sens %v spec %v LR+ %v LR- %v; want %v %v %v %v", c,
				c.Sensitivity(), c.Specificity(), c.LRPos(), c.LRNeg(), tc.sens, tc.spec, tc.lrp, tc.lrn)
		}
	}
	if !math.IsNaN(Confusion{}.PPV()) || !math.IsNaN(Confusion{}.Accuracy()) {
		t.Error("empty table should give NaN PPV and accuracy")
	}
}

func TestTally(t *testing.T) {
	pred := []bool{true, true, false, false, true}
	truth := []bool{true, false, true, false, true}
	// Hand count: TP = events 0,4; FP = 1; FN = 2; TN = 3.
	if got, want := Tally(pred, truth, nil), (Confusion{TP: 2, FP: 1, FN: 1, TN: 1}); got != want {
		t.Errorf("unweighted: got %+v want %+v", got, want)
	}
	w := []float64{1.5, 2, 3, 0.25, 4}
	if got, want := Tally(pred, truth, w), (Confusion{TP: 5.5, FP: 2, FN: 3, TN: 0.25}); got != want {
		t.Errorf("weighted: got %+v want %+v", got, want)
	}
	defer func() {
		if recover() == nil {
			t.Error("negative weight did not panic")
		}
	}()
	Tally(pred, truth, []float64{1, 1, -1, 1, 1})
}
