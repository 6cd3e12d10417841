package accuracy

import (
	"math"
	"testing"
)

// Newcombe (1998), Statistics in Medicine 17:857–872, Table II, methods 3
// and 4, four decimals (from memory); the full-precision values are R 4
// prop.test(x, n, correct = FALSE / TRUE)$conf.int, whose interval is the
// same score interval (testdata/delong_proc.R), and TestWilsonScipy checks
// them again against scipy.stats.binomtest(x, n).proportion_ci(method =
// "wilson" / "wilsoncc") and statsmodels proportion_confint(method =
// "wilson") (testdata/reference.py).
var wilsonCases = []struct {
	x, n                                   float64
	lo, hi                                 float64 // prop.test, correct = FALSE
	ccLo, ccHi                             float64 // prop.test, correct = TRUE
	paperLo, paperHi, paperCCLo, paperCCHi float64
}{
	{81, 263, 0.255288519878274, 0.3662095769828, 0.253508682295185, 0.368176201043004, 0.2553, 0.3662, 0.2535, 0.3682},
	{15, 148, 0.0623863995307363, 0.160487241723308, 0.0597782084284981, 0.164449779364837, 0.0624, 0.1605, 0.0598, 0.1644},
	{0, 20, 0, 0.161125158052819, 0, 0.200453345013487, 0, 0.1611, 0, 0.2005},
	{1, 29, 0.00611321429276266, 0.171755218793203, 0.00180264021327967, 0.196281751009759, 0.0061, 0.1718, 0.0018, 0.1963},
	{29, 29, 0.883030201500259, 1, 0.854383524420427, 1, 0.8830, 1, 0.8544, 1},
}

func TestWilsonNewcombe(t *testing.T) {
	for _, c := range wilsonCases {
		lo, hi := Wilson(c.x, c.n, 0.95)
		if !near(lo, c.lo, 1e-9) || !near(hi, c.hi, 1e-9) {
			t.Errorf("Wilson(%v/%v) = [%v, %v], want prop.test [%v, %v]", c.x, c.n, lo, hi, c.lo, c.hi)
		}
		if !near(lo, c.paperLo, 5e-5) || !near(hi, c.paperHi, 5e-5) {
			t.Errorf("Wilson(%v/%v) = [%.4f, %.4f], want Newcombe [%v, %v]", c.x, c.n, lo, hi, c.paperLo, c.paperHi)
		}
		lo, hi = WilsonCC(c.x, c.n, 0.95)
		if !near(lo, c.ccLo, 1e-9) || !near(hi, c.ccHi, 1e-9) {
			t.Errorf("WilsonCC(%v/%v) = [%v, %v], want prop.test [%v, %v]", c.x, c.n, lo, hi, c.ccLo, c.ccHi)
		}
		if !near(lo, c.paperCCLo, 5e-5) || !near(hi, c.paperCCHi, 5e-5) {
			t.Errorf("WilsonCC(%v/%v) = [%.4f, %.4f], want Newcombe [%v, %v]", c.x, c.n, lo, hi, c.paperCCLo, c.paperCCHi)
		}
	}
}

func TestWilsonScipy(t *testing.T) {
	ref := readLibRef(t)
	if len(ref.Wilson) != len(wilsonCases) {
		t.Fatalf("%d scipy cases, %d Newcombe cases", len(ref.Wilson), len(wilsonCases))
	}
	for i, r := range ref.Wilson {
		c := wilsonCases[i]
		if r.X != c.x || r.N != c.n {
			t.Fatalf("case %d: scipy %v/%v, Newcombe %v/%v", i, r.X, r.N, c.x, c.n)
		}
		lo, hi := Wilson(r.X, r.N, 0.95)
		if !near(lo, r.Lo, 1e-12) || !near(hi, r.Hi, 1e-12) || !near(lo, r.SMLo, 1e-12) || !near(hi, r.SMHi, 1e-12) {
			t.Errorf("Wilson(%v/%v) = [%v, %v], want scipy [%v, %v], statsmodels [%v, %v]", r.X, r.N, lo, hi, r.Lo, r.Hi, r.SMLo, r.SMHi)
		}
		lo, hi = WilsonCC(r.X, r.N, 0.95)
		if !near(lo, r.CCLo, 1e-12) || !near(hi, r.CCHi, 1e-12) {
			t.Errorf("WilsonCC(%v/%v) = [%v, %v], want scipy wilsoncc [%v, %v]", r.X, r.N, lo, hi, r.CCLo, r.CCHi)
		}
	}
}

func TestWilsonInvalid(t *testing.T) {
	for _, a := range [][3]float64{{1, 0, 0.95}, {3, 2, 0.95}, {-1, 5, 0.95}, {1, 5, 1}, {1, 5, 0}} {
		lo, hi := Wilson(a[0], a[1], a[2])
		clo, chi := WilsonCC(a[0], a[1], a[2])
		if !math.IsNaN(lo) || !math.IsNaN(hi) || !math.IsNaN(clo) || !math.IsNaN(chi) {
			t.Errorf("Wilson%v = [%v,%v], CC [%v,%v]; want NaN", a, lo, hi, clo, chi)
		}
	}
}

func TestWilsonWeighted(t *testing.T) {
	hit := []bool{true, false, true, true, false, false, false, true}
	// Nil weights reduce to the plain interval: 4/8.
	p, lo, hi := WilsonWeighted(hit, nil, 0.95)
	wlo, whi := Wilson(4, 8, 0.95)
	if p != 0.5 || lo != wlo || hi != whi {
		t.Errorf("unweighted: %v [%v,%v], want 0.5 [%v,%v]", p, lo, hi, wlo, whi)
	}
	// Kish (1965) n_eff = (Σw)²/Σw²: weights 1,1,1,1,3,3,3,3 give
	// 16²/40 = 6.4, and p = (1+1+1+3)/16 = 0.375 (hand computation).
	w := []float64{1, 1, 1, 1, 3, 3, 3, 3}
	if got := EffectiveN(w); !near(got, 6.4, 1e-12) {
		t.Errorf("EffectiveN = %v, want 6.4", got)
	}
	p, lo, hi = WilsonWeighted(hit, w, 0.95)
	wlo, whi = Wilson(0.375*6.4, 6.4, 0.95)
	if !near(p, 0.375, 1e-12) || !near(lo, wlo, 1e-12) || !near(hi, whi, 1e-12) {
		t.Errorf("weighted: %v [%v,%v], want 0.375 [%v,%v]", p, lo, hi, wlo, whi)
	}
	// Equal weights of any size leave n_eff = n.
	if got := EffectiveN([]float64{2.5, 2.5, 2.5}); !near(got, 3, 1e-12) {
		t.Errorf("EffectiveN(equal) = %v, want 3", got)
	}
}
