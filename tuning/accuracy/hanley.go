package accuracy

import "math"

// HanleyMcNeilSE returns the standard error of an area A under the ROC
// curve from nPos reference positives and nNeg reference negatives, by
// Hanley & McNeil (1982, Radiology 143:29–36, eq. 2) with their exponential
// approximations Q1 = A/(2−A) and Q2 = 2A²/(1+A):
//
//	SE² = [A(1−A) + (nPos−1)(Q1−A²) + (nNeg−1)(Q2−A²)] / (nPos·nNeg).
//
// It needs only A and the class sizes, so it suits planning and quick
// reports; with the scores at hand DeLong is preferred. It returns NaN
// when either class is empty or A is outside [0,1].
func HanleyMcNeilSE(auc float64, nPos, nNeg int) float64 {
	if nPos < 1 || nNeg < 1 || !(auc >= 0 && auc <= 1) {
		return math.NaN()
	}
	a := auc
	q1 := a / (2 - a)
	q2 := 2 * a * a / (1 + a)
	na, nn := float64(nPos), float64(nNeg)
	v := (a*(1-a) + (na-1)*(q1-a*a) + (nn-1)*(q2-a*a)) / (na * nn)
	return math.Sqrt(math.Max(v, 0))
}
