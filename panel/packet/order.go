package packet

import (
	"math"
	"math/rand/v2"
)

// slot is one position of a rater's order: an item index and which copy.
type slot struct {
	item int
	copy int
}

// drawOrder returns a rater's order of n items with round(share·n) hidden
// duplicates (at most ⌊n/2⌋). The originals are shuffled (Fisher–Yates,
// Knuth TAOCP vol. 2 §3.4.2, via rand.Perm); duplicates are drawn from the
// first ⌊n/2⌋ positions and each second copy is inserted at a uniform gap at
// least ⌈n/2⌉ originals later, so the two copies of an event are always at
// least ⌈n/2⌉ positions apart.
func drawOrder(n int, share float64, rng *rand.Rand) []slot {
	perm := rng.Perm(n)
	half := n / 2
	d := min(int(math.Round(share*float64(n))), half)
	// gaps[g] lists the copies placed just before original position g (g==n: at the end).
	gaps := make([][]int, n+1)
	for _, p := range rng.Perm(half)[:d] {
		lo := p + (n+1)/2
		g := lo + rng.IntN(n-lo+1)
		gaps[g] = append(gaps[g], perm[p])
	}
	out := make([]slot, 0, n+d)
	for g := 0; g <= n; g++ {
		for _, it := range gaps[g] {
			out = append(out, slot{it, 1})
		}
		if g < n {
			out = append(out, slot{perm[g], 0})
		}
	}
	return out
}
