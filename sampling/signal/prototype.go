package signal

import (
	"math"
	"math/cmplx"
)

// ButterworthPoles returns the n poles of the normalised analogue
// Butterworth low-pass prototype (cut-off 1 rad/s, unit DC gain):
//
//	s_m = −exp(jπm/(2n)),  m = −n+1, −n+3, …, n−1,
//
// the left-half-plane roots of 1 + (−s²)ⁿ = 0 (Butterworth 1930;
// Oppenheim & Schafer 2010, §7.2.1, eq. 7.18). They lie evenly on the unit
// circle; for odd n one pole is the real −1.
func ButterworthPoles(n int) []complex128 {
	p := make([]complex128, 0, n)
	for m := -n + 1; m < n; m += 2 {
		s := -cmplx.Exp(complex(0, math.Pi*float64(m)/float64(2*n)))
		if m == 0 {
			s = -1 // exactly real, so pairing treats it as a real pole
		}
		p = append(p, s)
	}
	return p
}

// ButterworthPolynomial returns the real coefficients, highest power first,
// of the normalised Butterworth polynomial Bₙ(s) = ∏(s − s_m) over the poles
// of ButterworthPoles; the prototype is H(s) = 1/Bₙ(s).
func ButterworthPolynomial(n int) []float64 {
	c := polyFromRoots(ButterworthPoles(n))
	out := make([]float64, len(c))
	for i, v := range c {
		out[i] = real(v)
	}
	return out
}

// polyFromRoots expands ∏(x − r) with coefficients highest power first.
func polyFromRoots(r []complex128) []complex128 {
	c := []complex128{1}
	for _, root := range r {
		next := make([]complex128, len(c)+1)
		for i, v := range c {
			next[i] += v
			next[i+1] -= v * root
		}
		c = next
	}
	return c
}
