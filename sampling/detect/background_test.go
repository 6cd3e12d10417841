package detect

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

// TestMedianSelect checks selection-based medians against sorting.
func TestMedianSelect(t *testing.T) {
	r := rand.New(rand.NewPCG(1, 2))
	for n := 1; n < 300; n++ {
		x := make([]float32, n)
		for i := range x {
			x[i] = float32(r.IntN(7)) // ties on purpose
			if n%2 == 1 {
				x[i] = float32(r.NormFloat64())
			}
		}
		s := slices.Clone(x)
		slices.Sort(s)
		want := float64(s[n/2])
		if n%2 == 0 {
			want = (float64(s[n/2-1]) + float64(s[n/2])) / 2
		}
		if got := median32(slices.Clone(x)); got != want {
			t.Fatalf("n=%d: median %g, want %g", n, got, want)
		}
	}
}

// TestBlockMAD checks the median absolute deviation of {1, 1, 2, 2, 4, 6, 9}:
// median 2, absolute deviations {1, 1, 0, 0, 2, 4, 7}, MAD 1 (hand count;
// numpy.median and scipy.stats.median_abs_deviation give 2 and 1,
// testdata/mad.py), the factor madToSD against scipy's 1/Φ⁻¹(3/4) =
// 1.482602218505602 (scipy.stats.norm.ppf, testdata/mad.py), and the robust
// scale madToSD × MAD on a normal sample against its standard deviation
// (Hampel 1974).
func TestBlockMAD(t *testing.T) {
	x := []float32{1, 1, 2, 2, 4, 6, 9}
	med, mad := blockStats(x, 7, nil, nil, nil)
	if med[0] != 2 || mad[0] != 1 {
		t.Errorf("median %g MAD %g, want 2 and 1", med[0], mad[0])
	}
	if math.Abs(madToSD-1.482602218505602) > 1e-15 {
		t.Errorf("madToSD = %.16g, want scipy 1/norm.ppf(0.75) = 1.482602218505602", madToSD)
	}
	r := rand.New(rand.NewPCG(3, 4))
	y := make([]float32, 256*40)
	for i := range y {
		y[i] = float32(30 * r.NormFloat64())
	}
	_, mad = blockStats(y, 256, nil, nil, nil)
	sc := slidingScale(mad, 5, nil)
	// the median of block MADs of 256 normal samples is within a few % of σ
	for b, s := range sc {
		if math.Abs(s-30) > 3 {
			t.Errorf("block %d: scale %g, want about 30", b, s)
		}
	}
}

// TestSlidingScaleMatchesSort checks the running median of slidingScale
// against the median of each block's reach sorted afresh by the standard
// library's slices.Sort, bit for bit, on random scales with ties, for
// reaches wider than the whole input too.
func TestSlidingScaleMatchesSort(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 8))
	for trial := range 200 {
		n, h := 1+rng.IntN(40), rng.IntN(8)
		mad := make([]float64, n)
		for i := range mad {
			mad[i] = float64(rng.IntN(6)) * 0.25 // ties are common
			if trial%3 == 0 {
				mad[i] = rng.ExpFloat64()
			}
		}
		got := slidingScale(mad, h, nil)
		for b := range mad {
			w := slices.Clone(mad[max(b-h, 0):min(b+h+1, n)])
			slices.Sort(w)
			m := w[len(w)/2]
			if len(w)%2 == 0 {
				m = (w[len(w)/2-1] + w[len(w)/2]) / 2
			}
			if got[b] != madToSD*m {
				t.Fatalf("n %d h %d block %d: %v, sorted afresh %v", n, h, b, got[b], madToSD*m)
			}
		}
	}
}

// TestMedianNear checks median32Near against the median of the values
// sorted by the standard library's slices.Sort, bit for bit, with brackets
// that hold the middle, miss it on either side, are empty or inverted, and
// on input with ties and with a NaN (which falls back to median32).
func TestMedianNear(t *testing.T) {
	r := rand.New(rand.NewPCG(5, 6))
	mid := make([]float32, 400)
	hits := 0
	for trial := range 3000 {
		n := 1 + r.IntN(300)
		x := make([]float32, n)
		for i := range x {
			x[i] = float32(r.NormFloat64())
			if trial%4 == 0 {
				x[i] = float32(r.IntN(5)) // ties
			}
		}
		s := slices.Clone(x)
		slices.Sort(s)
		want := float64(s[n/2])
		if n%2 == 0 {
			want = (float64(s[n/2-1]) + float64(s[n/2])) / 2
		}
		c := float32(want) + float32(0.3*r.NormFloat64())
		w := float32(0.5 * r.ExpFloat64())
		lo, hi := c-w, c+w
		if trial%10 == 0 {
			lo, hi = hi, lo
		}
		y := slices.Clone(x)
		if got := median32Near(y, lo, hi, mid); got != want {
			t.Fatalf("trial %d n=%d bracket [%g, %g]: %g, want %g", trial, n, lo, hi, got, want)
		}
		if n >= 16 && lo <= float32(want) && float32(want) <= hi {
			hits++
		}
		if n > 1 && trial%50 == 0 {
			x[r.IntN(n)] = float32(math.NaN())
			if got, ref := median32Near(slices.Clone(x), lo, hi, mid), median32(slices.Clone(x)); got != ref && !(math.IsNaN(got) && math.IsNaN(ref)) {
				t.Fatalf("trial %d with NaN: %g, median32 %g", trial, got, ref)
			}
		}
	}
	if hits < 1000 {
		t.Fatalf("only %d trials exercised the bracketed path", hits)
	}
}
