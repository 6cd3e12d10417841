package draw

import (
	"math"
	"testing"
)

func TestAccuracyWeightsClosedForm(t *testing.T) {
	// Neyman allocation minimises Σ c_h/n_h for fixed Σ n_h at n_h ∝ √c_h
	// (Cochran 1977, §5.5, Cauchy–Schwarz argument): with p = (0.5, 0.1),
	// N = (100, 300): P = 80, Q = 320, a_1 = 100·√(0.5/6400 + 0.5/102400),
	// a_2 = 300·√(0.1/6400 + 0.9/102400), written out by hand.
	w, err := AccuracyWeights([]int{100, 300}, []float64{0.5, 0.1})
	if err != nil {
		t.Fatal(err)
	}
	a1 := 100 * math.Sqrt(0.5/6400+0.5/102400)
	a2 := 300 * math.Sqrt(0.1/6400+0.9/102400)
	if math.Abs(w[0]-a1) > 1e-12 || math.Abs(w[1]-a2) > 1e-12 {
		t.Errorf("weights %v, want %v %v", w, a1, a2)
	}
	// It beats proportional allocation on the criterion it minimises, by
	// the Cauchy–Schwarz inequality: Σ c_h/n_h at n ∝ a_h is (Σ a_h)²/n.
	crit := func(n1, n2 float64) float64 { return a1*a1/n1 + a2*a2/n2 }
	n := 100.0
	opt := crit(n*a1/(a1+a2), n*a2/(a1+a2))
	if prop := crit(25, 75); !(opt < prop) || math.Abs(opt-(a1+a2)*(a1+a2)/n) > 1e-12 {
		t.Errorf("criterion at optimum %v, proportional %v", opt, prop)
	}
	if _, err := AccuracyWeights([]int{1}, []float64{1.5}); err == nil {
		t.Error("prior 1.5 accepted")
	}
}

func TestAccuracyOversamplesPositivesKeepsFloor(t *testing.T) {
	f, truth := simFrame()
	specs, _ := ParseStrata("score:q4,lobe")
	pos := func(a Allocation) (int, int) {
		res, err := Draw(f, Design{Strata: specs, Alloc: a, Seed: 3})
		if err != nil {
			t.Fatal(err)
		}
		idx := map[string]int{}
		for i, id := range f.ID {
			idx[id] = i
		}
		k := 0
		for _, u := range res.Drawn {
			if truth[idx[u.EventID]] {
				k++
			}
		}
		least := 1 << 30
		for _, s := range res.Strata {
			least = min(least, s.Sample)
		}
		return k, least
	}
	kp, _ := pos(Allocation{Method: Proportional, N: 80})
	ka, least := pos(Allocation{Method: Accuracy, N: 80})
	if !(ka > kp) {
		t.Errorf("accuracy drew %d IEDs, proportional %d: want more", ka, kp)
	}
	if least < accuracyFloor {
		t.Errorf("a stratum got %d units, floor %d", least, accuracyFloor)
	}
}

func TestAllocateMinimumsBeforeWholeStrata(t *testing.T) {
	// Σ n_h = n must hold (Hamilton's method keeps the total): a stratum taken
	// whole before the minimums were reserved once gave 10 + 3·1 = 13 for n = 12.
	alloc, _, err := Allocate([]string{"a", "b", "c", "d"}, []int{10, 10, 10, 10}, []float64{0, 0, 0, 1}, 12, 1)
	if err != nil {
		t.Fatal(err)
	}
	if alloc[0]+alloc[1]+alloc[2]+alloc[3] != 12 || alloc[3] != 9 || alloc[0] != 1 {
		t.Errorf("allocation %v, want [1 1 1 9]", alloc)
	}
}
