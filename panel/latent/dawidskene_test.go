package latent

import (
	"errors"
	"math"
	"math/rand/v2"
	"testing"
)

type panel struct {
	ratings    [][]int
	truth      []int
	sens, spec []float64
}

// simulate draws a panel from the Dawid–Skene model itself (conditionally
// independent raters given the true class), so the generating parameters are
// the closed-form target of a consistent estimator.
func simulate(items int, prev float64, sens, spec []float64, missing float64, seed uint64) panel {
	rng := rand.New(rand.NewPCG(seed, 99))
	p := panel{sens: sens, spec: spec, truth: make([]int, items), ratings: make([][]int, items)}
	for i := range items {
		if rng.Float64() < prev {
			p.truth[i] = 1
		}
		row := make([]int, len(sens))
		for r := range row {
			switch {
			case rng.Float64() < missing:
				row[r] = Missing
			case p.truth[i] == 1:
				row[r] = b2i(rng.Float64() < sens[r])
			default:
				row[r] = b2i(rng.Float64() >= spec[r])
			}
		}
		p.ratings[i] = row
	}
	return p
}

func b2i(b bool) int {
	if b {
		return 1
	}
	return 0
}

func TestRecoversSimulatedPanel(t *testing.T) {
	sens := []float64{0.95, 0.9, 0.85, 0.8, 0.7, 0.65, 0.6}
	spec := []float64{0.9, 0.95, 0.8, 0.85, 0.75, 0.6, 0.7}
	p := simulate(2000, 0.3, sens, spec, 0.1, 1)
	res, err := Fit(p.ratings, 2, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if !res.Converged {
		t.Fatalf("no convergence in %d iterations", res.Iterations)
	}
	// Tolerance ±0.05: about 2.5 binomial standard errors for a sensitivity
	// estimated from ~540 answered positives (√(0.25/540) ≈ 0.02).
	const tol = 0.05
	for r := range sens {
		if d := res.Sensitivity(r) - sens[r]; math.Abs(d) > tol {
			t.Errorf("rater %d sensitivity %.3f, true %.2f", r, res.Sensitivity(r), sens[r])
		}
		if d := res.Specificity(r) - spec[r]; math.Abs(d) > tol {
			t.Errorf("rater %d specificity %.3f, true %.2f", r, res.Specificity(r), spec[r])
		}
	}
	if math.Abs(res.Prevalence[1]-0.3) > 0.03 {
		t.Errorf("prevalence %.3f, true 0.3", res.Prevalence[1])
	}
	// The posterior should classify far better than the worst rater.
	wrong := 0
	for i, q := range res.PositiveProb() {
		if (q > 0.5) != (p.truth[i] == 1) {
			wrong++
		}
	}
	if frac := float64(wrong) / 2000; frac > 0.06 {
		t.Errorf("posterior misclassifies %.3f of items", frac)
	}
}

func TestEqualRatersFollowMajority(t *testing.T) {
	// With exchangeable raters (equal sensitivity = specificity) and
	// prevalence 1/2, the Bayes posterior log-odds is a monotone function of
	// (#present − #absent) (Dawid & Skene 1979, eq. 2.5 with equal π_r), so
	// with 7 complete answers the MAP class is the majority vote.
	s := []float64{0.85, 0.85, 0.85, 0.85, 0.85, 0.85, 0.85}
	p := simulate(2000, 0.5, s, s, 0, 2)
	res, err := Fit(p.ratings, 2, Options{})
	if err != nil {
		t.Fatal(err)
	}
	for i, q := range res.PositiveProb() {
		votes := 0
		for _, v := range p.ratings[i] {
			votes += v
		}
		if (q > 0.5) != (votes >= 4) {
			t.Errorf("item %d: %d/7 present but posterior %.3f", i, votes, q)
		}
	}
}

func TestLikelihoodMonotone(t *testing.T) {
	// EM never decreases the likelihood (Dempster, Laird & Rubin 1977,
	// JRSS B 39:1–38, Theorem 1); checked without smoothing, where ℓ is the
	// objective.
	p := simulate(300, 0.3, []float64{0.9, 0.7, 0.6, 0.8}, []float64{0.8, 0.9, 0.6, 0.7}, 0.2, 3)
	prev := math.Inf(-1)
	for it := 1; it <= 15; it++ {
		res, err := Fit(p.ratings, 2, Options{MaxIter: it, Smoothing: -1, Tol: 1e-300})
		if err != nil {
			t.Fatal(err)
		}
		if res.LogLikelihood < prev-1e-9 {
			t.Errorf("iteration %d: ℓ fell from %.9f to %.9f", it, prev, res.LogLikelihood)
		}
		prev = res.LogLikelihood
	}
}

func TestDeterministic(t *testing.T) {
	p := simulate(500, 0.4, []float64{0.9, 0.8, 0.7}, []float64{0.85, 0.8, 0.75}, 0.1, 4)
	a, _ := Fit(p.ratings, 2, Options{})
	b, _ := Fit(p.ratings, 2, Options{})
	if a.LogLikelihood != b.LogLikelihood || a.Iterations != b.Iterations || a.Posterior[7][1] != b.Posterior[7][1] {
		t.Error("two fits of the same data differ")
	}
}

func TestFitErrors(t *testing.T) {
	var ce *cellError
	if _, err := Fit([][]int{{0, 1}, {2, 0}}, 2, Options{}); !errors.As(err, &ce) || ce.Item != 1 || ce.Rater != 0 {
		t.Errorf("bad class: %v", err)
	}
	var se *shapeError
	if _, err := Fit([][]int{{0, 1}, {0}}, 2, Options{}); !errors.As(err, &se) || se.Item != 1 {
		t.Errorf("ragged: %v", err)
	}
	var oe *optionError
	if _, err := Fit([][]int{{0, 1}}, 2, Options{MaxIter: -1}); !errors.As(err, &oe) || oe.Field != "MaxIter" {
		t.Errorf("MaxIter: %v", err)
	}
}

func BenchmarkFit(b *testing.B) {
	sens := []float64{0.95, 0.9, 0.85, 0.8, 0.7, 0.65, 0.6}
	p := simulate(2000, 0.3, sens, sens, 0.1, 5)
	for b.Loop() {
		if _, err := Fit(p.ratings, 2, Options{}); err != nil {
			b.Fatal(err)
		}
	}
}
