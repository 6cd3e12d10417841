package signal

import (
	"math"
	"math/rand/v2"
	"testing"
)

// TestTripleMatchesOne checks that three sections run together (tripleUp,
// tripleDown, as forward and backward use for a cascade of three) give,
// bit for bit, what running each section alone (oneUp, oneDown) gives:
// the same transposed-direct-form-II recursion (Oppenheim & Schafer 2010,
// §6.5), only interleaved.
func TestTripleMatchesOne(t *testing.T) {
	bp, err := Butterworth(BandPass, 2, 256, 0.5, 70)
	if err != nil {
		t.Fatal(err)
	}
	n, err := Notch(50, 30, 256)
	if err != nil {
		t.Fatal(err)
	}
	c := normalise(Cascade(bp, n))
	if len(c) != 3 {
		t.Fatalf("want a cascade of 3 sections, got %d", len(c))
	}
	rng := rand.New(rand.NewPCG(5, 6))
	x := make([]float64, 5000)
	for i := range x {
		x[i] = 30*math.Sin(float64(i)/7) + rng.NormFloat64()
	}
	for _, up := range []bool{true, false} {
		a, b := append([]float64(nil), x...), append([]float64(nil), x...)
		za := make([][2]float64, 3)
		zb := [][2]float64{{0.1, -0.2}, {0.3, 0.05}, {-0.4, 0.2}}
		copy(za, zb)
		if up {
			forward(c, za, a)
		} else {
			backward(c, za, a)
		}
		for lo := 0; lo < len(b); lo += block {
			for k := range c {
				if up {
					oneUp(&c[k], &zb[k], b[lo:min(lo+block, len(b))])
				}
			}
		}
		if !up {
			for hi := len(b); hi > 0; hi -= block {
				for k := range c {
					oneDown(&c[k], &zb[k], b[max(hi-block, 0):hi])
				}
			}
		}
		for i := range a {
			if a[i] != b[i] {
				t.Fatalf("up=%v: sample %d: %v, section by section %v", up, i, a[i], b[i])
			}
		}
	}
}
