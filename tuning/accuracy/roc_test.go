package accuracy

import (
	"encoding/csv"
	"math"
	"os"
	"strconv"
	"testing"
)

// hanleyMcNeilRatings returns Hanley & McNeil (1982), Radiology 143:29–36,
// Table 1 (from memory): 58 normal and 51 abnormal CT images rated on a
// five-point scale, 1 = definitely normal … 5 = definitely abnormal.
func hanleyMcNeilRatings() (scores []float64, truth []bool) {
	normal := []int{33, 6, 6, 11, 2}
	abnormal := []int{3, 2, 2, 11, 33}
	for r, k := range normal {
		for range k {
			scores = append(scores, float64(r+1))
			truth = append(truth, false)
		}
	}
	for r, k := range abnormal {
		for range k {
			scores = append(scores, float64(r+1))
			truth = append(truth, true)
		}
	}
	return scores, truth
}

func TestROCThresholdConvention(t *testing.T) {
	// gonum stat.ROC documented example (ExampleROC_threshold): scores
	// 0.1, 0.4, 0.35, 0.8 with classes F, F, T, T.
	tpr, fpr, th := ROC([]float64{0.1, 0.4, 0.35, 0.8}, []bool{false, false, true, true}, nil)
	wantT := []float64{0, 0.5, 0.5, 1, 1}
	wantF := []float64{0, 0, 0.5, 0.5, 1}
	wantTh := []float64{math.Inf(1), 0.8, 0.4, 0.35, 0.1}
	for i := range wantT {
		if tpr[i] != wantT[i] || fpr[i] != wantF[i] || th[i] != wantTh[i] {
			t.Fatalf("ROC = %v %v %v, want %v %v %v", tpr, fpr, th, wantT, wantF, wantTh)
		}
	}
}

func TestAUCWeighted(t *testing.T) {
	// gonum ExampleROC_weighted data. Weighted Mann–Whitney by hand:
	// positives 3(w1) 6(w3) 7.5(w2) 8(w2), W+ = 8; negatives 0(w4) 5(w6),
	// W− = 10; the negative at 0 is beaten by all (4·8 = 32), the one at 5
	// by 6, 7.5, 8 (6·7 = 42): A = 74/80.
	y := []float64{8, 7.5, 6, 5, 3, 0}
	c := []bool{true, true, true, false, true, false}
	w := []float64{2, 2, 3, 6, 1, 4}
	tpr, fpr, _ := ROC(y, c, w)
	if got := AUC(tpr, fpr); !near(got, 74.0/80, 1e-12) {
		t.Errorf("weighted AUC = %v, want %v", got, 74.0/80)
	}
	if y[0] != 8 || c[3] {
		t.Error("ROC reordered the caller's slices")
	}
}

func TestAUCHanleyMcNeil(t *testing.T) {
	s, tr := hanleyMcNeilRatings()
	tpr, fpr, _ := ROC(s, tr, nil)
	// Hanley & McNeil (1982) Table 2: trapezoidal area 0.893 (from memory);
	// pROC 1.18 auc() on the same table: 0.893171061528059
	// (testdata/delong_proc.R); sklearn.metrics.roc_auc_score and
	// scipy.stats.mannwhitneyu U/(mn) agree (testdata/reference.py).
	got := AUC(tpr, fpr)
	if !near(got, 0.893171061528059, 1e-12) {
		t.Errorf("AUC = %v, want pROC 0.893171061528059", got)
	}
	ref := readLibRef(t)
	if !near(got, ref.HanleyMcNeil.ROCAUCScore, 1e-12) || !near(got, ref.HanleyMcNeil.MannWhitneyAUC, 1e-12) {
		t.Errorf("AUC = %v, want roc_auc_score %v, Mann–Whitney %v", got, ref.HanleyMcNeil.ROCAUCScore, ref.HanleyMcNeil.MannWhitneyAUC)
	}
	if !near(got, 0.893, 5e-4) {
		t.Errorf("AUC = %v, want published 0.893", got)
	}
	// Hanley & McNeil (1982): SE(0.893) with 51 abnormal, 58 normal is
	// 0.032 (from memory); the formula gives 0.0325, so the published
	// figure is matched only to its rounding (±0.001). No general library
	// has this approximation: testdata/reference.py writes the paper's
	// formula out with numpy (0.03251158176764658); the library variance of
	// the same table is pROC's DeLong variance in TestDeLongAgainstPROC.
	se := HanleyMcNeilSE(0.893, 51, 58)
	if !near(se, 0.032, 1e-3) {
		t.Errorf("HanleyMcNeilSE = %v, want 0.032", se)
	}
	if !near(se, ref.HanleyMcNeil.SENumpy, 1e-12) {
		t.Errorf("HanleyMcNeilSE = %v, want numpy %v", se, ref.HanleyMcNeil.SENumpy)
	}
	// Closed form: A = 0.5 gives Q1 = 1/3, Q2 = 1/3, so with m = n = 1
	// SE² = A(1−A) = 0.25.
	if se := HanleyMcNeilSE(0.5, 1, 1); !near(se, 0.5, 1e-15) {
		t.Errorf("HanleyMcNeilSE(0.5,1,1) = %v, want 0.5", se)
	}
	// Closed form: A = 1 gives Q1 = Q2 = 1 and SE = 0.
	if se := HanleyMcNeilSE(1, 30, 40); se != 0 {
		t.Errorf("HanleyMcNeilSE(1,30,40) = %v, want 0", se)
	}
	if !math.IsNaN(HanleyMcNeilSE(0.9, 0, 5)) {
		t.Error("empty class should give NaN")
	}
}

// readDeLongData reads testdata/delong_data.csv written by
// testdata/delong_proc.R.
func readDeLongData(t testing.TB) (truth []bool, s1, s2 []float64) {
	f, err := os.Open("testdata/delong_data.csv")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	for _, r := range rows[1:] {
		a, err1 := strconv.ParseFloat(r[1], 64)
		b, err2 := strconv.ParseFloat(r[2], 64)
		if err1 != nil || err2 != nil {
			t.Fatalf("bad row %v", r)
		}
		truth = append(truth, r[0] == "1")
		s1 = append(s1, a)
		s2 = append(s2, b)
	}
	return truth, s1, s2
}

func TestDeLongAgainstPROC(t *testing.T) {
	truth, s1, s2 := readDeLongData(t)
	// pROC 1.18: auc(), var(method = "delong"), ci.auc(method = "delong"),
	// cov(method = "delong") and roc.test(method = "delong", paired = TRUE)
	// on testdata/delong_data.csv (testdata/delong_proc.R).
	auc, v := DeLong(s1, truth)
	if !near(auc, 0.7121875, 1e-12) || !near(v, 0.00196021288964725, 1e-14) {
		t.Errorf("DeLong(s1) = %v, %v; want 0.7121875, 0.00196021288964725", auc, v)
	}
	tpr, fpr, _ := ROC(s1, truth, nil)
	if a := AUC(tpr, fpr); !near(a, auc, 1e-12) {
		t.Errorf("trapezoid AUC %v differs from Mann–Whitney %v", a, auc)
	}
	lo, hi := DeLongCI(auc, v, 0.95)
	if !near(lo, 0.625411483178681, 1e-12) || !near(hi, 0.798963516821318, 1e-12) {
		t.Errorf("DeLongCI = [%v, %v], want [0.625411483178681, 0.798963516821318]", lo, hi)
	}
	p := DeLongPaired(s1, s2, truth)
	for _, c := range []struct {
		name      string
		got, want float64
	}{
		{"AUC2", p.AUC2, 0.633958333333333},
		{"Var2", p.Var2, 0.00223672884410236},
		{"Cov", p.Cov, 0.00088374700529214},
		{"Z", p.Z, 1.58713885858108},
		{"P", p.P, 0.112481198682076},
	} {
		if !near(c.got, c.want, 1e-10) {
			t.Errorf("paired %s = %v, want pROC %v", c.name, c.got, c.want)
		}
	}

	// Hanley & McNeil rating table, pROC var(method = "delong").
	s, tr := hanleyMcNeilRatings()
	if _, v := DeLong(s, tr); !near(v, 0.000943989270262985, 1e-15) {
		t.Errorf("DeLong var (Hanley–McNeil table) = %v, want 0.000943989270262985", v)
	}
}

func TestDeLongLogitCI(t *testing.T) {
	// Delta method closed form: with A = 0.9 and Var = 0.0009,
	// logit(0.9) = ln 9, SE_logit = 0.03/0.09 = 1/3.
	lo, hi := DeLongLogitCI(0.9, 0.0009, 0.95)
	z := 1.959963984540054 // z_{0.975}, Abramowitz & Stegun (1964) Table 26.5 (to 7 decimals 1.9599640)
	wantLo := 1 / (1 + math.Exp(-(math.Log(9) - z/3)))
	wantHi := 1 / (1 + math.Exp(-(math.Log(9) + z/3)))
	if !near(lo, wantLo, 1e-9) || !near(hi, wantHi, 1e-9) {
		t.Errorf("DeLongLogitCI = [%v,%v], want [%v,%v]", lo, hi, wantLo, wantHi)
	}
	if hi >= 1 || lo <= 0 {
		t.Error("logit interval left (0,1)")
	}
}

func TestROCAgainstPROC(t *testing.T) {
	truth, s1, _ := readDeLongData(t)
	tpr, fpr, th := ROC(s1, truth, nil)
	// pROC 1.18 coords(roc, "all") for s1 (testdata/proc_roc_s1.csv),
	// listed from the lowest threshold up, hence reversed here.
	f, err := os.Open("testdata/proc_roc_s1.csv")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	rows = rows[1:]
	if len(rows) != len(tpr) {
		t.Fatalf("%d ROC points, pROC has %d", len(tpr), len(rows))
	}
	for i, r := range rows {
		sens, _ := strconv.ParseFloat(r[0], 64)
		spec, _ := strconv.ParseFloat(r[1], 64)
		j := len(tpr) - 1 - i
		if !near(tpr[j], sens, 1e-12) || !near(1-fpr[j], spec, 1e-12) {
			t.Errorf("point at threshold %v: (%v, %v), pROC (%v, %v)", th[j], tpr[j], 1-fpr[j], sens, spec)
		}
	}
}

func TestCountsMatchROC(t *testing.T) {
	truth, s1, _ := readDeLongData(t)
	w := make([]float64, len(s1))
	for i := range w {
		w[i] = 1 + float64(i%4)
	}
	for _, weights := range [][]float64{nil, w} {
		tpr, fpr, th := ROC(s1, truth, weights)
		cth, counts := Counts(s1, truth, weights)
		if len(cth) != len(th) {
			t.Fatalf("%d count thresholds, ROC has %d", len(cth), len(th))
		}
		for i := range th {
			c := counts[i]
			if cth[i] != th[i] || !near(c.Sensitivity(), tpr[i], 1e-12) || !near(1-c.Specificity(), fpr[i], 1e-12) {
				t.Fatalf("threshold %v: counts %+v vs ROC (%v, %v) at %v", cth[i], c, tpr[i], fpr[i], th[i])
			}
			pred := make([]bool, len(s1))
			for j, s := range s1 {
				pred[j] = s >= th[i]
			}
			if want := Tally(pred, truth, weights); !confNear(c, want) {
				t.Fatalf("threshold %v: %+v, Tally %+v", th[i], c, want)
			}
		}
	}
}

func TestDeLongDegenerate(t *testing.T) {
	// One positive: the AUC is defined (one of three negatives below, one
	// tied counting ½: 1.5/3) but S10 needs two positives.
	auc, v := DeLong([]float64{2, 1, 2, 3}, []bool{true, false, false, false})
	if !near(auc, 1.5/3, 1e-15) || !math.IsNaN(v) {
		t.Errorf("one positive: %v, %v; want 0.5, NaN", auc, v)
	}
	if auc, _ := DeLong([]float64{1, 2}, []bool{true, true}); !math.IsNaN(auc) {
		t.Errorf("no negatives: AUC %v, want NaN", auc)
	}
}
