package synth

import (
	"math"
	"math/rand/v2"
	"testing"
)

// The recursion must reproduce the binomial coefficients of (1 − z⁻¹)^(α/2),
// aₖ = Γ(k − α/2) / (Γ(k+1) Γ(−α/2)) (Kasdin 1995, eq. for the AR form;
// closed form of the generalised binomial coefficient).
func TestPinkCoefficientsClosedForm(t *testing.T) {
	for _, alpha := range []float64{0.5, 1, 1.5} {
		a := pinkCoefficients(alpha, 40)
		for k := 1; k <= 40; k++ {
			lg1, s1 := math.Lgamma(float64(k) - alpha/2)
			lg2, _ := math.Lgamma(float64(k) + 1)
			lg3, s3 := math.Lgamma(-alpha / 2)
			want := float64(s1*s3) * math.Exp(lg1-lg2-lg3)
			if math.Abs(a[k]-want) > 1e-12*math.Abs(want) {
				t.Errorf("α=%g a[%d]=%g, closed form %g", alpha, k, a[k], want)
			}
		}
	}
}

// arVariance against closed forms: AR(1) 1/(1−φ²); AR(2) with
// x = φ₁x₋₁ + φ₂x₋₂ + w, σ² = (1−φ₂) / ((1+φ₂)((1−φ₂)² − φ₁²))
// (Box, Jenkins & Reinsel, Time Series Analysis, 4th ed., eq. 3.2.27).
func TestARVarianceClosedForm(t *testing.T) {
	phi := 0.97
	if got, want := arVariance([]float64{1, -phi}), 1/(1-phi*phi); math.Abs(got-want) > 1e-9*want {
		t.Errorf("AR(1) %g, closed form %g", got, want)
	}
	a := resonator(10, 0.8, 256)
	p1, p2 := -a[1], -a[2]
	want := (1 - p2) / ((1 + p2) * ((1-p2)*(1-p2) - p1*p1))
	if got := arVariance(a); math.Abs(got-want) > 1e-6*want {
		t.Errorf("AR(2) %g, closed form %g", got, want)
	}
}

// The generated noise must follow S(f) ∝ |2 sin(πf/fs)|^(−α) (Kasdin 1995):
// compare the power ratio of two bands with the closed form, and check unit
// variance.
func TestPinkSpectrum(t *testing.T) {
	const fs, alpha = 256.0, 1.5
	f := newARFilter(pinkCoefficients(alpha, pinkOrder))
	r := rand.New(rand.NewPCG(1, 2))
	x := make([]float64, 1<<17)
	for range 4096 {
		f.next(r.NormFloat64())
	}
	var ss float64
	for i := range x {
		x[i] = f.next(r.NormFloat64())
		ss += x[i] * x[i]
	}
	if v := ss / float64(len(x)); math.Abs(v-1) > 0.15 {
		t.Errorf("variance %g, want 1", v)
	}
	freq, psd := welch(x, fs, 1024)
	model := func(lo, hi float64) float64 {
		var s float64
		for _, fr := range freq {
			if fr >= lo && fr <= hi {
				s += math.Pow(2*math.Sin(math.Pi*fr/fs), -alpha)
			}
		}
		return s
	}
	for _, b := range [][4]float64{{2, 4, 20, 40}, {1, 2, 8, 12}} {
		got := bandPower(freq, psd, b[0], b[1]) / bandPower(freq, psd, b[2], b[3])
		want := model(b[0], b[1]) / model(b[2], b[3])
		if math.Abs(math.Log(got/want)) > 0.15 {
			t.Errorf("band ratio %v: %g, closed form %g", b, got, want)
		}
	}
}
