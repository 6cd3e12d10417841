package tuning

import (
	"context"
	"math"
	"math/rand/v2"
	"testing"

	"github.com/quorate-eeg/quorate/tuning/accuracy"
)

// Design weights: a finite archive with known truth is sampled 200 times by
// a deliberately unbalanced stratified draw (candidates scoring above 1 with
// π = 350/N_high, the rest with π = 60/N_low). The design-weighted
// sensitivity of "≥5 criteria" with its linearised-variance 95% interval
// must cover the archive's true sensitivity at close to the nominal rate;
// the unweighted Wilson interval, blind to the oversampling, must not.
// Tolerance: 200 replications give a binomial SE of √(.95·.05/200) ≈ 0.015
// for the coverage; accept 0.90–0.99 (about ±3 SE, common practice).
func TestDesignWeightsCoverTruth(t *testing.T) {
	rng := rand.New(rand.NewPCG(42, 7))
	pop := simulate(rng, 400, 100, 1.5)
	var hi, lo []int
	var tp, pos float64
	for i, e := range pop {
		if e.Score > 1 {
			hi = append(hi, i)
		} else {
			lo = append(lo, i)
		}
		if e.Reference == 1 {
			pos++
			n := 0
			for _, m := range e.Majority {
				if m == 1 {
					n++
				}
			}
			if n >= 5 {
				tp++
			}
		}
	}
	truth := tp / pos
	draw := func(idx []int, n int, stratum string) []Event {
		perm := rng.Perm(len(idx))[:n]
		out := make([]Event, n)
		for k, p := range perm {
			out[k] = pop[idx[p]]
			out[k].Stratum = stratum
			out[k].Weight = float64(len(idx)) / float64(n)
		}
		return out
	}
	const reps = 200
	var coverW, coverU int
	for range reps {
		ev := append(draw(hi, 350, "high"), draw(lo, 60, "low")...)
		o := Options{Events: ev, Level: 0.95}
		s, _, err := prepare(&o)
		if err != nil {
			t.Fatal(err)
		}
		ks := kSweep(s, &o, 0.95)
		w, u := ks.Rows[4].Design.Sens, ks.Rows[4].Plain.Sens
		if w.Lo <= truth && truth <= w.Hi {
			coverW++
		}
		if u.Lo <= truth && truth <= u.Hi {
			coverU++
		}
	}
	cw, cu := float64(coverW)/reps, float64(coverU)/reps
	t.Logf("true sensitivity %.3f; coverage weighted %.3f, unweighted %.3f", truth, cw, cu)
	if cw < 0.90 || cw > 0.99 {
		t.Errorf("design-weighted coverage %.3f outside [0.90, 0.99]", cw)
	}
	if cu > 0.5 {
		t.Errorf("unweighted coverage %.3f: the unbalanced draw should bias it", cu)
	}
}

// Choosing an operating point on the events it is judged on is optimistic
// (the apparent-error bias of Efron 1983, J. Am. Stat. Assoc. 78:316–331):
// over repeated small studies the cross-validated Youden's J must not be
// higher on average than the in-sample J.
func TestCrossValidatedNotHigher(t *testing.T) {
	var in, cv float64
	const reps = 20
	for r := range reps {
		ev := simulate(rand.New(rand.NewPCG(uint64(100+r), 3)), 15, 20, 0.8)
		res, err := Run(context.Background(), Options{Events: ev, RecordingHours: 50,
			Policy: accuracy.Policy{Kind: accuracy.Youden}, Bootstrap: -1, HeadlineReplicates: -1, Seed: uint64(r)})
		if err != nil {
			t.Fatal(err)
		}
		in += res.Final.InSample.Design.Youden.Value
		cv += res.Final.CV.Design.Youden.Value
	}
	in /= reps
	cv /= reps
	t.Logf("mean J in-sample %.3f, cross-validated %.3f", in, cv)
	if !(cv < in) || math.IsNaN(cv) {
		t.Errorf("cross-validated J %.3f not below in-sample %.3f", cv, in)
	}
}

// Bootstrap intervals bracket the point estimate and repeat for a seed.
func TestBootstrapDeterministic(t *testing.T) {
	a := runSim(t, 9, "min-specificity=0.9")
	b := runSim(t, 9, "min-specificity=0.9")
	ba, bb := a.Final.Bootstrap, b.Final.Bootstrap
	if *ba != *bb || a.Final.Rule != b.Final.Rule {
		t.Errorf("not deterministic: %+v vs %+v", ba, bb)
	}
	for _, e := range []Estimate{ba.Sens, ba.Spec, ba.PPV, ba.FalsePerHour} {
		if !(e.Lo <= e.Value && e.Value <= e.Hi) || e.Lo == e.Hi {
			t.Errorf("interval %+v does not bracket its estimate", e)
		}
	}
	if a.Final.InSample.Design.Spec.Value < 0.9 {
		t.Errorf("policy min-specificity=0.9 gave spec %v", a.Final.InSample.Design.Spec.Value)
	}
}

func BenchmarkRun20k(b *testing.B) {
	ev := simulate(rand.New(rand.NewPCG(1, 2)), 200, 100, 1.2)
	opt := Options{Events: ev, RecordingHours: 2000, Policy: accuracy.DefaultPolicy, Folds: 5, Bootstrap: 2000, Seed: 1}
	for b.Loop() {
		if _, err := Run(context.Background(), opt); err != nil {
			b.Fatal(err)
		}
	}
}
