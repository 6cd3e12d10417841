package packet

import (
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/stat/distuv"
)

func TestDrawOrderDuplicates(t *testing.T) {
	for _, n := range []int{1, 2, 3, 7, 10, 33, 300} {
		for _, share := range []float64{0, 0.1, 0.5} {
			rng := rand.New(rand.NewPCG(uint64(n), 7))
			o := drawOrder(n, share, rng)
			wantD := min(int(share*float64(n)+0.5), n/2)
			if len(o) != n+wantD {
				t.Fatalf("n=%d share=%g: %d slots, want %d", n, share, len(o), n+wantD)
			}
			pos := map[slot]int{}
			for i, s := range o {
				if _, dup := pos[s]; dup {
					t.Fatalf("n=%d: slot %v twice", n, s)
				}
				pos[s] = i
			}
			for it := range n {
				p0, ok := pos[slot{it, 0}]
				if !ok {
					t.Fatalf("n=%d: item %d missing", n, it)
				}
				if p1, ok := pos[slot{it, 1}]; ok && p1-p0 < (n+1)/2 {
					t.Errorf("n=%d: copies of item %d at %d and %d, closer than ⌈n/2⌉=%d", n, it, p0, p1, (n+1)/2)
				}
			}
		}
	}
}

// The first slot of an order without duplicates must be uniform over the
// items: Pearson's χ² goodness of fit against the uniform law, compared with
// the χ²(n−1) upper 0.1 % point from gonum's distuv.
func TestDrawOrderUniform(t *testing.T) {
	const n, draws = 6, 60000
	rng := rand.New(rand.NewPCG(1, 2))
	var count [n]float64
	for range draws {
		count[drawOrder(n, 0, rng)[0].item]++
	}
	e := float64(draws) / n
	var x2 float64
	for _, c := range count {
		x2 += (c - e) * (c - e) / e
	}
	crit := distuv.ChiSquared{K: n - 1}.Quantile(0.999)
	if x2 > crit {
		t.Errorf("χ² = %.2f > %.2f: first position not uniform (%v)", x2, crit, count)
	}
}
