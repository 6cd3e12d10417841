package simulate

import (
	"math"
	"math/rand/v2"
	"testing"
)

// The simulated rates must come out as the profile says: a simulation whose raters do not
// follow their own profile would make every recovery test downstream meaningless.
func TestAnswerRatesFollowProfile(t *testing.T) {
	p := Panel(3)[0]
	rng := rand.New(rand.NewPCG(1, 2))
	const n = 40000
	var presentWhenMet, presentWhenNot [6]int
	for i := 0; i < n; i++ {
		meets := [6]bool{true, true, true, true, true, true}
		a := p.Answer(Truth{Meets: meets, IED: true}, rng)
		b := p.Answer(Truth{IED: false}, rng)
		for c := range 6 {
			if a.Criteria[c] {
				presentWhenMet[c]++
			}
			if b.Criteria[c] {
				presentWhenNot[c]++
			}
		}
	}
	for c := range 6 {
		// Expected rate mixes lapses (random, ½) with the profile.
		wantSens := (1-p.Lapse)*p.Sens[c] + p.Lapse*0.5
		wantFP := (1-p.Lapse)*(1-p.Spec[c]) + p.Lapse*0.5
		se := math.Sqrt(0.25 / n)
		if got := float64(presentWhenMet[c]) / n; math.Abs(got-wantSens) > 5*se {
			t.Errorf("c%d sensitivity %.4f, want %.4f", c+1, got, wantSens)
		}
		if got := float64(presentWhenNot[c]) / n; math.Abs(got-wantFP) > 5*se {
			t.Errorf("c%d false-present rate %.4f, want %.4f", c+1, got, wantFP)
		}
	}
}

func TestPanelHasOneHurriedRater(t *testing.T) {
	ps := Panel(5)
	hurried := 0
	for _, p := range ps {
		if p.Halo > 0 {
			hurried++
		}
	}
	if hurried != 1 {
		t.Fatalf("%d hurried raters, want 1", hurried)
	}
	if Panel(2)[1].Halo != 0 {
		t.Fatal("a panel of two should have no hurried rater")
	}
}

func TestDuplicatesMostlyConsistent(t *testing.T) {
	p := Panel(3)[1]
	rng := rand.New(rand.NewPCG(3, 4))
	same := 0
	const n = 20000
	tr := Truth{Meets: [6]bool{true, false, true, true, false, true}, IED: true}
	for i := 0; i < n; i++ {
		a := p.Answer(tr, rng)
		if p.Again(a, tr, rng) == a {
			same++
		}
	}
	// At least the Consistency share repeats exactly; fresh answers sometimes coincide.
	if got := float64(same) / n; got < p.Consistency-0.02 {
		t.Fatalf("identical duplicate answers %.3f, want ≥ %.2f", got, p.Consistency)
	}
}
