package synth

import (
	"math"

	"gonum.org/v1/gonum/dsp/fourier"
)

// pinkOrder is the AR order of the 1/f filter. A truncated order-p filter
// follows the power law down to roughly rate/(2π·p^(α)) Hz, about 0.2 Hz at
// 256 Hz for α=1.5, below any EEG band of interest.
const pinkOrder = 64

// pinkCoefficients returns the AR coefficients a[0..p] of the fractional
// integrator (1 − z⁻¹)^(α/2), whose output has power spectrum
//
//	S(f) = σ² / |2 sin(πf/fs)|^α,
//
// from the recursion a₀ = 1, aₖ = (k − 1 − α/2)·aₖ₋₁ / k
// (Kasdin 1995, "Discrete simulation of colored noise and stochastic
// processes and 1/f^α power law noise generation", Proc IEEE 83(5):802–827).
func pinkCoefficients(alpha float64, p int) []float64 {
	a := make([]float64, p+1)
	a[0] = 1
	for k := 1; k <= p; k++ {
		a[k] = (float64(k) - 1 - alpha/2) * a[k-1] / float64(k)
	}
	return a
}

// arVariance returns the output variance of the all-pole filter 1/A(z) driven
// by unit-variance white noise, (1/2π)∫|A(e^{iω})|⁻² dω, evaluated on a fine
// FFT grid; used to give every source unit variance.
func arVariance(a []float64) float64 {
	const n = 1 << 16
	seq := make([]float64, n)
	copy(seq, a)
	c := fourier.NewFFT(n).Coefficients(nil, seq)
	// Sum over the full circle from the one-sided coefficients.
	var s float64
	for i, v := range c {
		w := 2.0
		if i == 0 || i == n/2 {
			w = 1
		}
		re, im := real(v), imag(v)
		s += w / (re*re + im*im)
	}
	return s / n
}

// arFilter runs x_n = w_n − Σ_{k≥1} a_k x_{n−k} over a doubled ring buffer
// so the history is always contiguous.
type arFilter struct {
	a    []float64 // a[1..p]
	hist []float64 // 2p
	pos  int
	gain float64 // 1/sqrt(variance)
}

func newARFilter(a []float64) *arFilter {
	return newARFilterGain(a, 1/math.Sqrt(arVariance(a)))
}

// newARFilterGain is newARFilter with the normalising gain already known,
// so that many sources sharing coefficients pay for one variance.
func newARFilterGain(a []float64, gain float64) *arFilter {
	p := len(a) - 1
	return &arFilter{a: a[1:], hist: make([]float64, 2*p), gain: gain}
}

// next consumes one white-noise sample w and returns the next unit-variance
// output.
func (f *arFilter) next(w float64) float64 {
	p := len(f.a)
	h := f.hist[f.pos : f.pos+p]
	var acc float64
	for k, ak := range f.a {
		acc += ak * h[k]
	}
	x := w - acc
	f.pos--
	if f.pos < 0 {
		f.pos = p - 1
	}
	f.hist[f.pos] = x
	f.hist[f.pos+p] = x
	return x * f.gain
}
