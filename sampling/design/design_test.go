package design

import (
	"encoding/json"
	"math"
	"os"
	"testing"
)

// caribou returns a sample whose strata have exactly the sizes, means and
// variances of the caribou survey (Siniff & Skoog 1964) tabulated in Lohr
// (2010) Sampling: Design and Analysis 2nd ed., ch. 3 — from memory; the
// values reproduce the book's total 54,497 and SE 5,840, and
// testdata/caribou.py recomputes them with numpy.
func caribou() (Nh map[string]float64, stratum []string, y []float64) {
	labels := []string{"A", "B", "C", "D", "E", "F"}
	N := []float64{400, 30, 61, 18, 70, 120}
	n := []int{98, 10, 37, 6, 39, 21}
	mean := []float64{24.1, 25.6, 267.6, 179.0, 293.7, 33.2}
	s2 := []float64{5575, 4064, 347556, 22798, 123578, 9795}
	Nh = make(map[string]float64)
	for h, l := range labels {
		Nh[l] = N[h]
		// pairs mean±a (plus one unit at the mean when n is odd) give
		// sample variance 2·pairs·a²/(n−1) = s².
		pairs := n[h] / 2
		a := math.Sqrt(s2[h] * float64(n[h]-1) / float64(2*pairs))
		for k := 0; k < pairs; k++ {
			stratum = append(stratum, l, l)
			y = append(y, mean[h]+a, mean[h]-a)
		}
		if n[h]%2 == 1 {
			stratum = append(stratum, l)
			y = append(y, mean[h])
		}
	}
	return Nh, stratum, y
}

func TestStratMeanCaribou(t *testing.T) {
	Nh, stratum, y := caribou()
	e, err := StratMean(Nh, stratum, y)
	if err != nil {
		t.Fatal(err)
	}
	N := 699.0
	// testdata/caribou.py: total 54496.6, var 34105732.425078 (Lohr 2010
	// ch. 3 reports 54,497 and SE 5,840 — from memory).
	if got := e.Value * N; math.Abs(got-54496.6) > 1e-6 {
		t.Errorf("total = %.6f, want 54496.6", got)
	}
	if got := e.Var * N * N; math.Abs(got-34105732.425078) > 1e-3 {
		t.Errorf("var(total) = %.6f, want 34105732.425078", got)
	}
	if se := e.SE() * N; math.Round(se) != 5840 {
		t.Errorf("SE = %.3f, want 5840 (Lohr 2010)", se)
	}

	// Total with w = N_h/n_h and f_h = n_h/N_h is N·ȳ_st and N²·v(ȳ_st)
	// (Cochran 1977, §5.3).
	s := weighted(Nh, stratum)
	tot, err := Total(s, y)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(tot.Value-54496.6) > 1e-6 || math.Abs(tot.Var-34105732.425078) > 1e-3 {
		t.Errorf("Total = %+v, want 54496.6, 34105732.425078", tot)
	}
}

// weighted builds the stratified SRS design: w = N_h/n_h, f_h = n_h/N_h.
func weighted(Nh map[string]float64, stratum []string) Sample {
	n := make(map[string]float64)
	for _, h := range stratum {
		n[h]++
	}
	s := Sample{Stratum: stratum, Weight: make([]float64, len(stratum)), FPC: map[string]float64{}}
	for i, h := range stratum {
		s.Weight[i] = Nh[h] / n[h]
	}
	for h := range n {
		s.FPC[h] = n[h] / Nh[h]
	}
	return s
}

type refUnit struct {
	Stratum     string
	Y, X        float64
	Truth, Pred bool
}

type ref struct {
	N           map[string]float64
	Units       []refUnit
	Ratio       [2]float64
	Sensitivity [2]float64
	Specificity [2]float64
	PPV         [2]float64
	StratMean   [2]float64
}

func loadRef(t *testing.T) ref {
	b, err := os.ReadFile("testdata/ratio.json")
	if err != nil {
		t.Fatal(err)
	}
	var r ref
	if err := json.Unmarshal(b, &r); err != nil {
		t.Fatal(err)
	}
	return r
}

func TestRatioAgainstCochranForm(t *testing.T) {
	r := loadRef(t)
	var stratum []string
	var y, x []float64
	var pred, truth []bool
	for _, u := range r.Units {
		stratum = append(stratum, u.Stratum)
		y, x = append(y, u.Y), append(x, u.X)
		pred, truth = append(pred, u.Pred), append(truth, u.Truth)
	}
	s := weighted(r.N, stratum)
	check := func(name string, e Estimate, err error, want [2]float64) {
		t.Helper()
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		// testdata/ratio.py: numpy, Cochran (1977) §6.11 combined ratio.
		if math.Abs(e.Value-want[0]) > 1e-12 || math.Abs(e.Var-want[1]) > 1e-12*math.Max(1, want[1]) {
			t.Errorf("%s = %.15g (var %.15g), want %.15g (var %.15g)", name, e.Value, e.Var, want[0], want[1])
		}
	}
	e, err := Ratio(s, y, x)
	check("ratio", e, err, r.Ratio)
	e, err = Sensitivity(s, pred, truth)
	check("sensitivity", e, err, r.Sensitivity)
	e, err = Specificity(s, pred, truth)
	check("specificity", e, err, r.Specificity)
	e, err = PPV(s, pred, truth)
	check("ppv", e, err, r.PPV)
	e, err = StratMean(r.N, stratum, y)
	check("stratmean", e, err, r.StratMean)
}

func TestHTTotal(t *testing.T) {
	// Closed form: 1/0.5 + 2/0.25 + 3/1 = 13.
	got, err := HTTotal([]float64{1, 2, 3}, []float64{0.5, 0.25, 1})
	if err != nil || got != 13 {
		t.Errorf("HTTotal = %v, %v; want 13", got, err)
	}
	if _, err := HTTotal([]float64{1}, []float64{0}); err == nil {
		t.Error("π = 0 accepted")
	}
}

func TestPrevalenceAndRate(t *testing.T) {
	// One stratum, equal weights: prevalence is the sample proportion p
	// and the linearised variance (1−f) p(1−p)/(n−1) (Cochran 1977, §3.2,
	// v(p) = (1−f) pq/(n−1)).
	truth := []bool{true, false, false, true, true, false, false, false, false, false}
	s := Sample{Stratum: make([]string, 10), Weight: make([]float64, 10), FPC: map[string]float64{"": 0.1}}
	for i := range s.Weight {
		s.Weight[i] = 10
	}
	e, err := Prevalence(s, truth)
	if err != nil {
		t.Fatal(err)
	}
	if want := 0.9 * 0.3 * 0.7 / 9; math.Abs(e.Value-0.3) > 1e-15 || math.Abs(e.Var-want) > 1e-15 {
		t.Errorf("prevalence = %v (var %v), want 0.3 (var %v)", e.Value, e.Var, want)
	}
	// Rate: 100 IEDs weighted over 50 h = 2/h; var = v(Ŷ)/H².
	y := []float64{1, 0, 0, 1, 1, 0, 0, 3, 2, 2}
	rate, err := RatePerHour(s, y, 50)
	if err != nil {
		t.Fatal(err)
	}
	tot, _ := Total(s, y)
	if rate.Value != 2 || math.Abs(rate.Var-tot.Var/2500) > 1e-15 {
		t.Errorf("rate = %+v", rate)
	}
}

func TestBootstrapMatchesLinearised(t *testing.T) {
	r := loadRef(t)
	var stratum []string
	var y, x []float64
	for _, u := range r.Units {
		stratum = append(stratum, u.Stratum)
		y, x = append(y, u.Y), append(x, u.X)
	}
	s := weighted(r.N, stratum)
	s.FPC = nil // the n_h−1 rescaling bootstrap ignores the fpc
	total := func(w []float64) float64 {
		t := 0.0
		for i := range w {
			t += w[i] * y[i]
		}
		return t
	}
	const B = 4000
	iv, err := Bootstrap(s, total, B, 0.95, 7)
	if err != nil {
		t.Fatal(err)
	}
	var m, m2 float64
	for _, v := range iv.Reps {
		m += v
	}
	m /= B
	for _, v := range iv.Reps {
		m2 += (v - m) * (v - m)
	}
	bv := m2 / (B - 1)
	lin, _ := Total(s, y)
	// Rao & Wu (1988): E*[var*] equals the f=0 linearised variance for a
	// total. Monte Carlo error of a variance from B replicates is about
	// √(2/B) ≈ 2.2%; allow 4 × that.
	if rel := math.Abs(bv/lin.Var - 1); rel > 4*math.Sqrt(2.0/B) {
		t.Errorf("bootstrap var %.6g vs linearised %.6g (rel. diff %.3f)", bv, lin.Var, rel)
	}
	if !(iv.Lo < lin.Value && lin.Value < iv.Hi) {
		t.Errorf("interval [%v, %v] misses the estimate %v", iv.Lo, iv.Hi, lin.Value)
	}
	// Ratio: percentile interval close to R̂ ± 1.96 SE (large-sample
	// normal approximation, Cochran 1977 §6.4), within 25% of the width.
	ratio := func(w []float64) float64 {
		var a, b float64
		for i := range w {
			a += w[i] * y[i]
			b += w[i] * x[i]
		}
		return a / b
	}
	ri, err := Bootstrap(s, ratio, B, 0.95, 7)
	if err != nil {
		t.Fatal(err)
	}
	re, _ := Ratio(s, y, x)
	want := 2 * 1.959964 * re.SE()
	if got := ri.Hi - ri.Lo; math.Abs(got/want-1) > 0.25 {
		t.Errorf("ratio interval width %v, normal width %v", got, want)
	}
	again, _ := Bootstrap(s, ratio, B, 0.95, 7)
	if again.Lo != ri.Lo || again.Hi != ri.Hi {
		t.Error("bootstrap not deterministic for a seed")
	}
}

func TestFieldErrors(t *testing.T) {
	s := Sample{Stratum: []string{"a", "a"}, Weight: []float64{2, 0.5}}
	if _, err := Total(s, []float64{1, 2}); err == nil {
		t.Error("weight < 1 accepted")
	} else if fe, ok := err.(*FieldError); !ok || fe.Index != 1 {
		t.Errorf("error %v, want *FieldError at index 1", err)
	}
	s.Weight[1] = 2
	if _, err := Ratio(s, []float64{1, 2}, []float64{0, 0}); err == nil {
		t.Error("zero denominator accepted")
	}
	if _, err := StratMean(map[string]float64{"a": 10}, []string{"a", "b"}, []float64{1, 2}); err == nil {
		t.Error("stratum without N_h accepted")
	}
}
