package simulate

import (
	"fmt"
	"math/rand/v2"
)

// Truth is what an item was built to be.
type Truth struct {
	Meets [6]bool // criteria the event was built to meet
	IED   bool    // a true interictal epileptiform discharge
}

// Answers is one rater's answer to one item. Criteria[c] true means present.
type Answers struct {
	Criteria     [6]bool
	Epileptiform bool
	Confidence   int // 1…5
}

// Profile is one simulated rater.
type Profile struct {
	Name        string
	Sens, Spec  [6]float64
	Threshold   int     // own count of present criteria that makes "epileptiform"
	Gestalt     float64 // probability that the verdict is the rater's overall recognition of the event
	VerdictFlip float64 // probability of flipping the verdict
	Lapse       float64 // probability of a random answer
	Halo        float64 // probability that one impression drives all criteria
	Consistency float64 // probability of repeating the first answer on a duplicate
}

// Panel returns n fictional raters (n ≥ 1). The last of three or more is hurried: lower
// accuracy and a strong halo. Accuracies vary between raters so that a latent-class
// model has something to find.
func Panel(n int) []Profile {
	ps := make([]Profile, n)
	for i := range ps {
		q := 0.93 - 0.03*float64(i%4) // 0.93, 0.90, 0.87, 0.84, …
		p := Profile{
			Name:        fmt.Sprintf("fictional-rater-%c", 'a'+i%26),
			Threshold:   4,
			Gestalt:     0.7,
			VerdictFlip: 0.03,
			Lapse:       0.02,
			Consistency: 0.85,
		}
		for c := range 6 {
			p.Sens[c] = q
			p.Spec[c] = q + 0.02
		}
		// Criterion 6 (field) is the hardest to judge by eye; criterion 1 the easiest.
		p.Sens[5] -= 0.05
		p.Spec[5] -= 0.05
		if n >= 3 && i == n-1 {
			p.Name = fmt.Sprintf("fictional-rater-%c-hurried", 'a'+i%26)
			for c := range 6 {
				p.Sens[c], p.Spec[c] = 0.75, 0.75
			}
			p.Halo, p.Lapse, p.Consistency, p.VerdictFlip, p.Gestalt = 0.4, 0.06, 0.7, 0.08, 0.4
		}
		ps[i] = p
	}
	return ps
}

// Answer draws one rater's answers to an item.
func (p Profile) Answer(t Truth, rng *rand.Rand) Answers {
	var a Answers
	if rng.Float64() < p.Lapse {
		for c := range 6 {
			a.Criteria[c] = rng.IntN(2) == 1
		}
		a.Epileptiform = rng.IntN(2) == 1
		a.Confidence = 1 + rng.IntN(2)
		return a
	}
	if rng.Float64() < p.Halo {
		for c := range 6 {
			a.Criteria[c] = t.IED
		}
	} else {
		for c := range 6 {
			if t.Meets[c] {
				a.Criteria[c] = rng.Float64() < p.Sens[c]
			} else {
				a.Criteria[c] = rng.Float64() >= p.Spec[c]
			}
		}
	}
	n := 0
	for _, v := range a.Criteria {
		if v {
			n++
		}
	}
	a.Epileptiform = n >= p.Threshold
	if rng.Float64() < p.Gestalt {
		a.Epileptiform = t.IED
	}
	if rng.Float64() < p.VerdictFlip {
		a.Epileptiform = !a.Epileptiform
	}
	// Confidence grows with distance from the rater's threshold.
	d := n - p.Threshold
	if d < 0 {
		d = -d - 1
	}
	a.Confidence = min(5, 2+d+rng.IntN(2))
	return a
}

// Again answers a hidden duplicate given the first answers.
func (p Profile) Again(first Answers, t Truth, rng *rand.Rand) Answers {
	if rng.Float64() < p.Consistency {
		return first
	}
	return p.Answer(t, rng)
}
