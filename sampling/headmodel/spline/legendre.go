package spline

import "math"

// G returns the spherical-spline kernel of Perrin et al. (1989)
//
//	g_m(x) = 1/(4π) Σ_{n=1}^{nTerms} (2n+1) / (n(n+1))^m · P_n(x),
//
// with P_n from Bonnet's recurrence (n+1)P_{n+1} = (2n+1)xP_n − nP_{n−1}
// (Abramowitz & Stegun 1964, 22.7.10; the equation number from memory,
// the values checked against scipy.special.eval_legendre in
// TestLegendreClosedForm and TestKernelAgainstScipy, testdata/gen_spline.py).
// x is clamped to [−1, 1].
func G(m, nTerms int, x float64) float64 {
	return kernel(weights(m, nTerms), x)
}

// weights returns (2n+1)/(n(n+1))^m/(4π) for n = 1 … nTerms.
func weights(m, nTerms int) []float64 {
	w := make([]float64, nTerms)
	for i := range w {
		n := float64(i + 1)
		w[i] = (2*n + 1) / math.Pow(n*(n+1), float64(m)) / (4 * math.Pi)
	}
	return w
}

func kernel(w []float64, x float64) float64 {
	x = math.Max(-1, math.Min(1, x))
	pPrev, p := 1.0, x
	s := 0.0
	for i, wi := range w {
		s += wi * p
		n := float64(i + 1)
		pPrev, p = p, ((2*n+1)*x*p-n*pPrev)/(n+1)
	}
	return s
}

// legendre returns P_n(x) by the same recurrence; for tests.
func legendre(n int, x float64) float64 {
	if n == 0 {
		return 1
	}
	pPrev, p := 1.0, x
	for k := 1; k < n; k++ {
		fk := float64(k)
		pPrev, p = p, ((2*fk+1)*x*p-fk*pPrev)/(fk+1)
	}
	return p
}
