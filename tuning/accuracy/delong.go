package accuracy

import (
	"cmp"
	"math"
	"slices"

	"gonum.org/v1/gonum/stat/distuv"
)

// DeLong returns the empirical AUC of scores against truth and the DeLong,
// DeLong & Clarke-Pearson (1988, Biometrics 44:837–845) estimate of its
// variance from structural components. For m reference positives X and n
// reference negatives Y, with ψ(x,y) = 1 if x > y, ½ if x = y, 0 otherwise,
//
//	V10(Xᵢ) = (1/n) Σⱼ ψ(Xᵢ,Yⱼ),   V01(Yⱼ) = (1/m) Σᵢ ψ(Xᵢ,Yⱼ),
//	A = mean V10,   Var(A) = S10/m + S01/n,
//
// where S10 and S01 are the sample variances (divisor m−1, n−1) of the
// components. Ties count ½, so A equals AUC on the ROC curve. The
// components are computed from midranks in O(N log N) by the algorithm of
// Sun & Xu (2014, IEEE Signal Processing Letters 21:1389–1393):
// V10(Xᵢ) = (Tz(Xᵢ) − Tx(Xᵢ))/n and V01(Yⱼ) = 1 − (Tz(Yⱼ) − Ty(Yⱼ))/m, with
// Tz, Tx, Ty the midranks within the pooled, positive and negative scores.
//
// Design weights are not supported: DeLong's variance is a U-statistic
// result for simple random samples. Events are taken as independent; for
// events clustered in subjects use DeLongClustered (Obuchowski 1997). The
// variance is NaN when a class has fewer than two members (the AUC is NaN
// when a class is empty). DeLong panics on mismatched lengths or NaN
// scores.
func DeLong(scores []float64, truth []bool) (auc, variance float64) {
	c := placements(scores, truth)
	return c.auc, c.s10/float64(len(c.v10)) + c.s01/float64(len(c.v01))
}

// DeLongCI returns the Wald interval auc ± z·√variance at the given
// two-sided level, clipped to [0,1] (the interval pROC reports for
// method="delong"). Near A = 1 this interval is too short and may be
// clipped; DeLongLogitCI is the alternative that respects the bounds.
func DeLongCI(auc, variance, level float64) (lo, hi float64) {
	z := zTwoSided(level)
	if math.IsNaN(z) || !(variance >= 0) {
		return math.NaN(), math.NaN()
	}
	h := z * math.Sqrt(variance)
	return clamp01(auc - h), clamp01(auc + h)
}

// DeLongLogitCI returns the interval formed on the logit scale,
// logit(A) ± z·√Var/(A(1−A)) (the delta method), mapped back by the
// logistic function, as suggested for areas near 1 by Pepe (2003), The
// Statistical Evaluation of Medical Tests for Classification and
// Prediction, Oxford University Press. It returns NaN, NaN when A is 0 or 1.
func DeLongLogitCI(auc, variance, level float64) (lo, hi float64) {
	z := zTwoSided(level)
	if math.IsNaN(z) || !(variance >= 0) || !(auc > 0 && auc < 1) {
		return math.NaN(), math.NaN()
	}
	l := math.Log(auc / (1 - auc))
	h := z * math.Sqrt(variance) / (auc * (1 - auc))
	return logistic(l - h), logistic(l + h)
}

func logistic(x float64) float64 { return 1 / (1 + math.Exp(-x)) }

// PairedAUC is the DeLong comparison of two AUCs measured on the same
// events.
type PairedAUC struct {
	AUC1, AUC2 float64
	Var1, Var2 float64
	Cov        float64 // covariance of the two AUC estimates
	Z          float64 // (AUC1 − AUC2)/√(Var1 + Var2 − 2Cov)
	P          float64 // two-sided normal p-value for Z
}

// DeLongPaired compares the AUCs of two scores on the same events by the
// test of DeLong, DeLong & Clarke-Pearson (1988, Biometrics 44:837–845):
// the covariance of the two estimates is S10₁₂/m + S01₁₂/n, with S10₁₂ and
// S01₁₂ the sample covariances (divisors m−1, n−1) of the structural
// components of the two scores, and Z = (A₁ − A₂)/√(V₁ + V₂ − 2C) is
// referred to the standard normal. Ties count ½. It panics on mismatched
// lengths or NaN scores.
func DeLongPaired(scores1, scores2 []float64, truth []bool) PairedAUC {
	if len(scores1) != len(scores2) {
		panic("accuracy: scores1 and scores2 length mismatch")
	}
	a := placements(scores1, truth)
	b := placements(scores2, truth)
	m, n := float64(len(a.v10)), float64(len(a.v01))
	r := PairedAUC{
		AUC1: a.auc,
		AUC2: b.auc,
		Var1: a.s10/m + a.s01/n,
		Var2: b.s10/m + b.s01/n,
		Cov:  sampleCov(a.v10, b.v10)/m + sampleCov(a.v01, b.v01)/n,
	}
	r.Z = (r.AUC1 - r.AUC2) / math.Sqrt(r.Var1+r.Var2-2*r.Cov)
	r.P = 2 * distuv.UnitNormal.CDF(-math.Abs(r.Z))
	return r
}

// components holds DeLong's structural components of one score.
type components struct {
	v10, v01 []float64 // per positive, per negative
	auc      float64
	s10, s01 float64 // sample variances of v10 and v01
}

func placements(scores []float64, truth []bool) components {
	if len(scores) != len(truth) {
		panic("accuracy: scores and truth length mismatch")
	}
	var x, y []float64
	for i, s := range scores {
		if math.IsNaN(s) {
			panic("accuracy: NaN score")
		}
		if truth[i] {
			x = append(x, s)
		} else {
			y = append(y, s)
		}
	}
	m, n := len(x), len(y)
	z := append(slices.Clone(x), y...)
	tz := midranks(z)
	tx := midranks(x)
	ty := midranks(y)
	c := components{v10: make([]float64, m), v01: make([]float64, n)}
	var sum float64
	for i := range x {
		c.v10[i] = (tz[i] - tx[i]) / float64(n)
		sum += c.v10[i]
	}
	for j := range y {
		c.v01[j] = 1 - (tz[m+j]-ty[j])/float64(m)
	}
	c.auc = sum / float64(m)
	c.s10 = sampleCov(c.v10, c.v10)
	c.s01 = sampleCov(c.v01, c.v01)
	return c
}

// midranks returns the 1-based ranks of v, tied values sharing the mean of
// the ranks they span.
func midranks(v []float64) []float64 {
	idx := make([]int, len(v))
	for i := range idx {
		idx[i] = i
	}
	slices.SortFunc(idx, func(a, b int) int { return cmp.Compare(v[a], v[b]) })
	r := make([]float64, len(v))
	for i := 0; i < len(idx); {
		j := i
		for j < len(idx) && v[idx[j]] == v[idx[i]] {
			j++
		}
		mid := float64(i+j+1) / 2 // mean of ranks i+1..j
		for k := i; k < j; k++ {
			r[idx[k]] = mid
		}
		i = j
	}
	return r
}

// sampleCov returns the covariance of a and b with divisor len−1, NaN for
// fewer than two pairs.
func sampleCov(a, b []float64) float64 {
	n := len(a)
	if n < 2 {
		return math.NaN()
	}
	var ma, mb float64
	for i := range a {
		ma += a[i]
		mb += b[i]
	}
	ma /= float64(n)
	mb /= float64(n)
	var s float64
	for i := range a {
		s += (a[i] - ma) * (b[i] - mb)
	}
	return s / float64(n-1)
}
