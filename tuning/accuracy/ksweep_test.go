package accuracy

import (
	"math/bits"
	"math/rand/v2"
	"testing"
)

func TestKSweepHand(t *testing.T) {
	// Four events, three criteria; hand count of criteria present:
	// e0 (pos) 3, e1 (pos) 1, e2 (neg) 2, e3 (neg) 0.
	crit := [][]bool{
		{true, true, true},
		{false, true, false},
		{true, false, true},
		{false, false, false},
	}
	truth := []bool{true, true, false, false}
	got := KSweep(crit, truth, nil)
	want := []Confusion{
		{TP: 2, FP: 1, FN: 0, TN: 1}, // ≥1: e0 e1 e2
		{TP: 1, FP: 1, FN: 1, TN: 1}, // ≥2: e0 e2
		{TP: 1, FP: 0, FN: 1, TN: 2}, // ≥3: e0
	}
	for k := range want {
		if got[k] != want[k] {
			t.Errorf("k=%d: %+v, want %+v", k+1, got[k], want[k])
		}
	}
	// Weights 2, 1, 0.5, 4 on the same events.
	got = KSweep(crit, truth, []float64{2, 1, 0.5, 4})
	if w := (Confusion{TP: 2, FP: 0.5, FN: 1, TN: 4}); got[1] != w {
		t.Errorf("weighted k=2: %+v, want %+v", got[1], w)
	}
}

func randomCriteria(rng *rand.Rand, events, n int) (crit [][]bool, truth []bool, w []float64) {
	for range events {
		pos := rng.Float64() < 0.3
		row := make([]bool, n)
		for j := range row {
			p := 0.3
			if pos {
				p = 0.6
			}
			row[j] = rng.Float64() < p
		}
		crit = append(crit, row)
		truth = append(truth, pos)
		w = append(w, 0.5+rng.Float64()*3)
	}
	return crit, truth, w
}

func TestKSweepMonotone(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	for trial := range 50 {
		n := 1 + trial%6
		crit, truth, w := randomCriteria(rng, 40+trial, n)
		if trial%2 == 0 {
			w = nil
		}
		cs := KSweep(crit, truth, w)
		for k := 1; k < len(cs); k++ {
			if cs[k].Sensitivity() > cs[k-1].Sensitivity() || cs[k].Specificity() < cs[k-1].Specificity() {
				t.Fatalf("trial %d k=%d: sens %v→%v spec %v→%v", trial, k+1,
					cs[k-1].Sensitivity(), cs[k].Sensitivity(), cs[k-1].Specificity(), cs[k].Specificity())
			}
		}
		// Against an explicit rule tallied event by event.
		for k := 1; k <= n; k++ {
			pred := make([]bool, len(crit))
			for i, row := range crit {
				c := 0
				for _, b := range row {
					if b {
						c++
					}
				}
				pred[i] = c >= k
			}
			if want := Tally(pred, truth, w); !confNear(cs[k-1], want) {
				t.Fatalf("trial %d k=%d: %+v, want %+v", trial, k, cs[k-1], want)
			}
		}
	}
}

func confNear(a, b Confusion) bool {
	const tol = 1e-9
	return near(a.TP, b.TP, tol) && near(a.FP, b.FP, tol) && near(a.TN, b.TN, tol) && near(a.FN, b.FN, tol)
}

func TestSubsetRules(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	crit, truth, w := randomCriteria(rng, 200, 6)
	rules := SubsetRules(crit, truth, w)
	// 63 "all" rules plus Σ_s C(6,s)(6−s) = 6·2⁵ − 6 = 186 "≥k incl." rules.
	if len(rules) != 63+186 {
		t.Fatalf("%d rules, want 249", len(rules))
	}
	names := map[string]bool{}
	for _, r := range rules {
		names[r.Name] = true
		pred := make([]bool, len(crit))
		for i, row := range crit {
			var m uint8
			for j, b := range row {
				if b {
					m |= 1 << j
				}
			}
			pred[i] = m&r.Subset == r.Subset && bits.OnesCount8(m) >= r.K
		}
		if want := Tally(pred, truth, w); !confNear(r.Confusion, want) {
			t.Fatalf("%s: %+v, want %+v", r.Name, r.Confusion, want)
		}
	}
	if len(names) != len(rules) {
		t.Error("rule names are not unique")
	}
	for _, n := range []string{"c1+c4+c6 all", "≥4 incl. c1,c6", "c1+c2+c3+c4+c5+c6 all", "≥6 incl. c3"} {
		if !names[n] {
			t.Errorf("missing rule %q", n)
		}
	}
	// The all-six rule is the k-of-n rule at k = n.
	ks := KSweep(crit, truth, w)
	for _, r := range rules {
		if r.Name == "c1+c2+c3+c4+c5+c6 all" && !confNear(r.Confusion, ks[5]) {
			t.Errorf("all-six rule %+v, KSweep k=6 %+v", r.Confusion, ks[5])
		}
	}
}
