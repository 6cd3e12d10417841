package draw

import (
	"fmt"
	"math/rand/v2"
	"testing"
)

// BenchmarkDraw1e6: 1,000 events from 10^6 candidates, score quintiles ×
// region, proportional allocation with a per-subject cap. Target < 2 s/op.
func BenchmarkDraw1e6(b *testing.B) {
	const n = 1_000_000
	rng := rand.New(rand.NewPCG(1, 2))
	regions := []string{"temporal-left", "temporal-right", "frontal-left", "frontal-right", "central", "occipital"}
	f := &Frame{Num: map[string][]float64{"score": make([]float64, n)}, Cat: map[string][]string{"region": make([]string, n)}}
	f.ID, f.Subject, f.Recording = make([]string, n), make([]string, n), make([]string, n)
	for i := 0; i < n; i++ {
		s := rng.IntN(300)
		f.ID[i] = fmt.Sprintf("ev-%d-%07d", s, i)
		f.Subject[i] = fmt.Sprintf("sub-%03d", s)
		f.Recording[i] = fmt.Sprintf("sub-%03d-run%d", s, i%3)
		f.Num["score"][i] = rng.ExpFloat64()
		f.Cat["region"][i] = regions[rng.IntN(len(regions))]
	}
	d := Design{Strata: []StratumSpec{{Column: "score", Bins: 5}, {Column: "region"}},
		Alloc: Allocation{Method: Proportional, N: 1000, Min: 5}, Cap: 500, Seed: 7}
	b.ResetTimer()
	for b.Loop() {
		if _, err := Draw(f, d); err != nil {
			b.Fatal(err)
		}
	}
}
