package detect

import (
	"fmt"
	"math"
	"testing"
)

// sineSource holds sinusoids of frequency f cycles per sample on each
// channel, phase shifted per channel.
type sineSource struct{ f float64 }

func (s sineSource) ReadAt(ch int, start int64, dst []float32) error {
	for i := range dst {
		dst[i] = float32(math.Cos(2*math.Pi*s.f*float64(start+int64(i)) + float64(ch)))
	}
	return nil
}

// TestInterpolatedSinusoids checks the Lanczos resampling against the closed
// form of a sampled sinusoid: cos(2πf·iq + φ) at output i, for input rates
// of 200 and 128 Hz carried to 256 Hz. The error bound of a windowed-sinc
// interpolator grows toward the Nyquist frequency (Duchon 1979); for a = 8
// it stays within 0.2 % of the amplitude at 0.3 of the input rate and 1 %
// at 0.35 (computed for this kernel on a 1/32-sample grid of offsets; a = 4
// gives 1.9 % and 3.0 %, so the bounds fail for a shorter kernel).
func TestInterpolatedSinusoids(t *testing.T) {
	for _, rate := range []float64{200, 128} {
		for _, c := range []struct{ f, tol float64 }{{0.1, 0.002}, {0.3, 0.002}, {0.35, 0.01}} {
			t.Run(fmt.Sprintf("%g Hz, %.2f", rate, c.f), func(t *testing.T) {
				n := int64(4000)
				in := Input{Rate: rate, Len: n, Src: sineSource{c.f}}
				v, q, err := atDesignRate(in)
				if err != nil {
					t.Fatal(err)
				}
				if q != rate/designRate || v.Rate != designRate || v.Len != int64(math.Floor(float64(n-1)/q))+1 {
					t.Fatalf("view at %g Hz, q %g, %d samples", v.Rate, q, v.Len)
				}
				for _, ch := range []int{0, 1} {
					// away from the ends, where the kernel is cut
					start, m := int64(100), int(v.Len)-200
					dst := make([]float32, m)
					if err := v.Src.ReadAt(ch, start, dst); err != nil {
						t.Fatal(err)
					}
					worst := 0.0
					for i, y := range dst {
						x := float64(start+int64(i)) * q
						worst = max(worst, math.Abs(float64(y)-math.Cos(2*math.Pi*c.f*x+float64(ch))))
					}
					if worst > c.tol {
						t.Errorf("channel %d: largest error %.4f of the amplitude, want ≤ %.3f", ch, worst, c.tol)
					}
				}
			})
		}
	}
}

// TestDesignRateViews checks which view each rate gets: 256 Hz as it is,
// integer multiples decimated with samples taken on the input's own grid,
// and the rest interpolated.
func TestDesignRateViews(t *testing.T) {
	for _, c := range []struct {
		rate   float64
		interp bool
	}{{256, false}, {512, false}, {1024, false}, {250, true}, {500, true}, {200, true}, {1000, true}} {
		in := Input{Rate: c.rate, Len: 20000, Src: sineSource{0.01}}
		v, q, err := atDesignRate(in)
		if err != nil {
			t.Fatal(err)
		}
		_, interp := v.Src.(*interpSource)
		if v.Rate != designRate || q != c.rate/designRate || interp != c.interp {
			t.Errorf("%g Hz: view at %g Hz, q %g, interpolated %v; want %g Hz, q %g, interpolated %v",
				c.rate, v.Rate, q, interp, designRate, c.rate/designRate, c.interp)
		}
	}
}
