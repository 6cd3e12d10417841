package detect

import (
	"math"
	"math/cmplx"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/dsp/fourier"
)

// TestRFFT compares rfft with gonum's general real transform (an FFTPACK
// port, Swarztrauber 1982) on random sequences, bin by bin, and with the
// closed form of a cosine's transform: x_j = cos(2πκj/n) has X_κ = n/2 and
// X_k = 0 elsewhere (any DSP text; from memory).
func TestRFFT(t *testing.T) {
	if newRFFT(500) != nil || newRFFT(4) != nil {
		t.Fatal("newRFFT accepted a length that is not a power of two ≥ 8")
	}
	rng := rand.New(rand.NewPCG(1, 2))
	for _, n := range []int{8, 16, 64, 512, 1024} {
		r := newRFFT(n)
		x := make([]float64, n)
		for i := range x {
			x[i] = rng.NormFloat64()
		}
		want := fourier.NewFFT(n).Coefficients(nil, x)
		got := make([]complex128, n/2+1)
		r.coefficients(got, x, 0, n/2)
		for k := range want {
			if d := cmplx.Abs(got[k] - want[k]); d > 1e-12*math.Sqrt(float64(n)) {
				t.Errorf("n=%d bin %d: %v, gonum %v", n, k, got[k], want[k])
			}
		}
		// a partial range leaves the other bins alone
		part := make([]complex128, n/2+1)
		part[0] = 7
		r.coefficients(part, x, 1, 2)
		if part[0] != 7 || part[3] != 0 || part[1] != got[1] || part[2] != got[2] {
			t.Errorf("n=%d: partial range wrote %v", n, part[:4])
		}
		kap := n / 8
		for i := range x {
			x[i] = math.Cos(2 * math.Pi * float64(kap*i) / float64(n))
		}
		r.coefficients(got, x, 0, n/2)
		for k, c := range got {
			w := 0.0
			if k == kap {
				w = float64(n) / 2
			}
			if cmplx.Abs(c-complex(w, 0)) > 1e-9 {
				t.Errorf("n=%d cosine at bin %d: bin %d is %v, want %g", n, kap, k, c, w)
			}
		}
	}
}

func BenchmarkRFFT512(b *testing.B) {
	r := newRFFT(512)
	x := make([]float64, 512)
	for i := range x {
		x[i] = math.Sin(float64(i) * 0.37)
	}
	co := make([]complex128, 257)
	for b.Loop() {
		r.coefficients(co, x, 2, 61)
	}
}

func BenchmarkGonumFFT512(b *testing.B) {
	f := fourier.NewFFT(512)
	x := make([]float64, 512)
	for i := range x {
		x[i] = math.Sin(float64(i) * 0.37)
	}
	co := make([]complex128, 257)
	for b.Loop() {
		co = f.Coefficients(co, x)
	}
}
