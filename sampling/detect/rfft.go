package detect

import (
	"math"
	"math/bits"
)

// rfft is the discrete Fourier transform of a real sequence whose length n
// is a power of two, computed as a complex transform of half the length:
//
//	z_j = x_2j + i·x_2j+1,  Z = DFT_{n/2}(z),
//	X_k = (Z_k + Z*_{n/2−k})/2 − (i/2)·e^{−2πik/n}·(Z_k − Z*_{n/2−k})
//
// (Press et al. 2007, Numerical Recipes, 3rd ed., §12.3.2), the half-length
// transform by iterative radix-2 decimation in time on bit-reversed input
// (Cooley & Tukey 1965, Math Comput 19:297–301). Only the bins the caller
// asks for are unpacked. It serves c2's Welch spectrum, which reads bins up
// to 30 Hz of a 2 s segment only, at a third of the cost of the general
// mixed-radix transform (gonum's fourier.FFT, kept for other lengths).
type rfft struct {
	n   int
	rev []int32      // bit reversal of 0 … n/2−1
	tw  []complex128 // e^{−2πij/(n/2)}, j < n/4: the half-length transform's twiddles
	wk  []complex128 // e^{−2πik/n}, k ≤ n/2: the unpacking's twiddles
	z   []complex128
}

// newRFFT returns the transform of length n, or nil unless n is a power of
// two of at least 8.
func newRFFT(n int) *rfft {
	if n < 8 || n&(n-1) != 0 {
		return nil
	}
	m := n / 2
	r := &rfft{n: n, rev: make([]int32, m), tw: make([]complex128, m/2), wk: make([]complex128, m+1), z: make([]complex128, m)}
	shift := 64 - bits.TrailingZeros(uint(m))
	for j := range m {
		r.rev[j] = int32(bits.Reverse64(uint64(j)) >> shift)
	}
	for j := range r.tw {
		s, c := math.Sincos(-2 * math.Pi * float64(j) / float64(m))
		r.tw[j] = complex(c, s)
	}
	for k := range r.wk {
		s, c := math.Sincos(-2 * math.Pi * float64(k) / float64(n))
		r.wk[k] = complex(c, s)
	}
	return r
}

// coefficients writes X_k, k0 ≤ k ≤ k1 (within 0 … n/2), of the real
// sequence x (length n) to dst[k]; dst must hold n/2+1 values, and its
// other entries are left as they were.
func (r *rfft) coefficients(dst []complex128, x []float64, k0, k1 int) {
	m := r.n / 2
	z := r.z[:m]
	x = x[:r.n]
	for j, q := range r.rev {
		z[j] = complex(x[2*q], x[2*q+1])
	}
	// first stage (span 1, twiddle 1) and second (span 2, twiddles 1 and −i)
	for s := 0; s+3 < m; s += 4 {
		a, b, c, d := z[s], z[s+1], z[s+2], z[s+3]
		a, b = a+b, a-b
		c, d = c+d, c-d
		d = complex(imag(d), -real(d)) // −i·d
		z[s], z[s+2] = a+c, a-c
		z[s+1], z[s+3] = b+d, b-d
	}
	// the remaining stages two at a time (spans h and 2h on four values
	// held in registers: the same operations as two passes, half the
	// loads and stores), then a last single stage when their number is odd
	h, step := 4, m/8
	for ; 2*h < m; h, step = 4*h, step/4 {
		for s := 0; s < m; s += 4 * h {
			q0, q1, q2, q3 := z[s:s+h], z[s+h:s+2*h], z[s+2*h:s+3*h], z[s+3*h:s+4*h]
			for j := range q0 {
				a, b, c, d := q0[j], q1[j], q2[j], q3[j]
				w := r.tw[j*step]
				b = cmul(w, b)
				a, b = a+b, a-b
				d = cmul(w, d)
				c, d = c+d, c-d
				u, v := r.tw[j*step/2], r.tw[(j+h)*step/2]
				c = cmul(u, c)
				a, c = a+c, a-c
				d = cmul(v, d)
				b, d = b+d, b-d
				q0[j], q1[j], q2[j], q3[j] = a, b, c, d
			}
		}
	}
	if h < m {
		for s := 0; s < m; s += 2 * h {
			lo, hi := z[s:s+h], z[s+h:s+2*h]
			for j := range lo {
				t := cmul(r.tw[j*step], hi[j])
				hi[j] = lo[j] - t
				lo[j] += t
			}
		}
	}
	for k := max(k0, 0); k <= min(k1, m); k++ {
		a, b := z[k%m], z[(m-k)%m]
		b = complex(real(b), -imag(b)) // Z*_{m−k}
		e, o := a+b, a-b               // 2·even part, 2·(odd part)·i
		w := r.wk[k]
		// −i·w·o
		t := complex(real(w)*real(o)-imag(w)*imag(o), real(w)*imag(o)+imag(w)*real(o))
		t = complex(imag(t), -real(t))
		dst[k] = (e + t) * 0.5
	}
}

// cmul is w·x written out, as the butterflies compute it.
func cmul(w, x complex128) complex128 {
	return complex(real(w)*real(x)-imag(w)*imag(x), real(w)*imag(x)+imag(w)*real(x))
}
