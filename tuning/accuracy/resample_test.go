package accuracy

import (
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

// groupsOfSizes returns group labels s0, s1, … with the given sizes,
// interleaved so that a group's events are not contiguous.
func groupsOfSizes(sizes []int) []string {
	var g []string
	left := slices.Clone(sizes)
	for more := true; more; {
		more = false
		for i := range left {
			if left[i] > 0 {
				g = append(g, fmt.Sprintf("s%d", i))
				left[i]--
				more = true
			}
		}
	}
	return g
}

func checkFolds(t *testing.T, groups []string, folds [][]int) {
	t.Helper()
	seen := make([]bool, len(groups))
	foldOf := map[string]int{}
	for f, idx := range folds {
		if !slices.IsSorted(idx) {
			t.Errorf("fold %d not sorted", f)
		}
		for _, i := range idx {
			if seen[i] {
				t.Fatalf("event %d in two folds", i)
			}
			seen[i] = true
			if g, ok := foldOf[groups[i]]; ok && g != f {
				t.Fatalf("group %s straddles folds %d and %d", groups[i], g, f)
			}
			foldOf[groups[i]] = f
		}
	}
	if slices.Contains(seen, false) {
		t.Fatal("some event in no fold")
	}
}

func TestGroupKFoldHand(t *testing.T) {
	// Longest-processing-time by hand for sizes 5,4,3,3,2,2,1 into 3 folds:
	// 5→A, 4→B, 3→C, 3→C (6), 2→B (6), 2→A (7), 1→B (7): sizes 7, 7, 6.
	groups := groupsOfSizes([]int{2, 5, 1, 3, 4, 2, 3})
	folds := GroupKFold(groups, 3, 42)
	checkFolds(t, groups, folds)
	var sizes []int
	for _, f := range folds {
		sizes = append(sizes, len(f))
	}
	if want := []int{7, 7, 6}; !slices.Equal(sizes, want) {
		t.Errorf("fold sizes %v, want %v", sizes, want)
	}
	again := GroupKFold(groups, 3, 42)
	for i := range folds {
		if !slices.Equal(folds[i], again[i]) {
			t.Fatal("same seed gave a different split")
		}
	}
}

// optimalMakespan is the smallest possible largest fold, by exhaustive
// search.
func optimalMakespan(sizes []int, k int) int {
	best := math.MaxInt
	load := make([]int, k)
	var rec func(i int)
	rec = func(i int) {
		if i == len(sizes) {
			best = min(best, slices.Max(load))
			return
		}
		for f := range load {
			load[f] += sizes[i]
			if load[f] < best {
				rec(i + 1)
			}
			load[f] -= sizes[i]
		}
	}
	rec(0)
	return best
}

func TestGroupKFoldGrahamBound(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	for trial := range 40 {
		k := 2 + trial%3
		sizes := make([]int, k+1+rng.IntN(5))
		for i := range sizes {
			sizes[i] = 1 + rng.IntN(20)
		}
		groups := groupsOfSizes(sizes)
		folds := GroupKFold(groups, k, uint64(trial))
		checkFolds(t, groups, folds)
		largest := 0
		for _, f := range folds {
			largest = max(largest, len(f))
		}
		// Graham (1969): LPT makespan ≤ (4/3 − 1/(3k))·OPT.
		opt := optimalMakespan(sizes, k)
		if bound := (4.0/3 - 1/(3*float64(k))) * float64(opt); float64(largest) > bound+1e-9 {
			t.Errorf("sizes %v k=%d: largest fold %d exceeds Graham bound %.2f (opt %d)", sizes, k, largest, bound, opt)
		}
	}
}

func TestGroupKFoldPanics(t *testing.T) {
	defer func() {
		if recover() == nil {
			t.Error("k > groups did not panic")
		}
	}()
	GroupKFold([]string{"a", "b"}, 3, 1)
}

func TestClusterResample(t *testing.T) {
	sizes := []int{3, 1, 4, 1, 5, 9, 2, 6, 5, 3}
	groups := groupsOfSizes(sizes)
	const reps = 4000
	rng := rand.New(rand.NewPCG(7, 8))
	counts := make([]float64, len(sizes))
	for r := range reps {
		idx := ClusterResample(groups, rng)
		per := map[string]int{}
		for _, i := range idx {
			per[groups[i]]++
		}
		draws := 0
		for g, c := range per {
			var s int
			fmt.Sscanf(g, "s%d", &s)
			if c%sizes[s] != 0 {
				t.Fatalf("rep %d: group %s contributed %d events, not a multiple of %d", r, g, c, sizes[s])
			}
			counts[s] += float64(c / sizes[s])
			draws += c / sizes[s]
		}
		if draws != len(sizes) {
			t.Fatalf("rep %d drew %d groups, want %d", r, draws, len(sizes))
		}
	}
	// Each group's draw count is Binomial(G, 1/G): mean 1, variance
	// 1 − 1/G = 0.9, so the mean over reps has SD √(0.9/4000) ≈ 0.015.
	for s, c := range counts {
		if m := c / reps; math.Abs(m-1) > 5*math.Sqrt(0.9/reps) {
			t.Errorf("group %d mean draws %v, want 1", s, m)
		}
	}
	a := ClusterResample(groups, rand.New(rand.NewPCG(9, 9)))
	b := ClusterResample(groups, rand.New(rand.NewPCG(9, 9)))
	if !slices.Equal(a, b) {
		t.Error("same seed gave different resamples")
	}
}
