package montage

import (
	"math/rand/v2"
	"slices"
	"testing"
)

// TestSelectRankMatchesSort checks selectRank, and the spread
// ChannelQuality takes from it, against the standard library's slices.Sort
// followed by the nearest-rank index (Hyndman & Fan 1996, definition 1), on
// random values with many ties and on constant runs.
func TestSelectRankMatchesSort(t *testing.T) {
	rng := rand.New(rand.NewPCG(9, 10))
	for trial := range 500 {
		n := 1 + rng.IntN(300)
		v := make([]float64, n)
		for i := range v {
			switch trial % 3 {
			case 0:
				v[i] = rng.NormFloat64()
			case 1:
				v[i] = float64(rng.IntN(4)) // ties
			default:
				v[i] = 7 // constant
			}
		}
		sorted := slices.Clone(v)
		slices.Sort(sorted)
		k := rng.IntN(n)
		if got := selectRank(slices.Clone(v), k); got != sorted[k] {
			t.Fatalf("n %d k %d: %v, sorted %v", n, k, got, sorted[k])
		}
		x := make([]float32, n)
		for i := range v {
			x[i] = float32(v[i])
		}
		s32 := make([]float64, n)
		for i := range x {
			s32[i] = float64(x[i])
		}
		slices.Sort(s32)
		want := s32[rankIndex(n, 0.99)] - s32[rankIndex(n, 0.01)]
		if q := ChannelQuality(x, [2]float64{}); q.Spread != want {
			t.Fatalf("n %d: spread %v, sorted %v", n, q.Spread, want)
		}
	}
}
