package tuning

import (
	"context"
	"math"
	"math/rand/v2"
	"testing"

	"github.com/quorate-eeg/quorate/tuning/accuracy"
)

// The headline corrects the in-sample optimism of a chosen rule. Truth: the rule applied
// to a fresh, large study from the same generator (simulate), design-weighted. Over
// repeated small studies the headline's sensitivity lies closer to that truth on average
// than the in-sample figure (Harrell, Lee & Mark 1996: the apparent estimate is biased
// upwards, the optimism-corrected one much less).
func TestHeadlineLessOptimistic(t *testing.T) {
	const reps = 6
	var biasIn, biasHead float64
	for r := range reps {
		ev := simulate(rand.New(rand.NewPCG(uint64(300+r), 3)), 12, 20, 0.8)
		res, err := Run(context.Background(), Options{Events: ev, RecordingHours: 50, Method: MethodJoint,
			Policy: accuracy.Policy{Kind: accuracy.Youden}, Bootstrap: -1, HeadlineReplicates: 80, Seed: uint64(r)})
		if err != nil {
			t.Fatal(err)
		}
		fresh := simulate(rand.New(rand.NewPCG(uint64(900+r), 4)), 150, 20, 0.8)
		var rated []Event
		var truth []bool
		var w []float64
		for _, e := range fresh {
			if e.Reference != -1 && e.Kind != "control" {
				rated = append(rated, e)
				truth = append(truth, e.Reference == 1)
				w = append(w, e.Weight)
			}
		}
		sens := accuracy.Tally(applyPrinted(t, res.Final.Rule, rated), truth, w).Sensitivity()
		biasIn += res.Final.InSample.Design.Sens.Value - sens
		biasHead += res.Final.Headline.Sens.Value - sens
	}
	biasIn /= reps
	biasHead /= reps
	t.Logf("mean sensitivity bias: in sample %+.3f, headline %+.3f", biasIn, biasHead)
	if !(math.Abs(biasHead) < math.Abs(biasIn)) {
		t.Errorf("headline bias %+.3f not smaller than in-sample bias %+.3f", biasHead, biasIn)
	}
}

// Where the sample cannot support an interval the headline withholds it and says why,
// instead of printing a collapsed [1, 1]: too few subjects to resample (common practice:
// at least five), or no missed IED in the sample.
func TestHeadlineWithholdsUnsupportedIntervals(t *testing.T) {
	ev := simulate(rand.New(rand.NewPCG(7, 3)), 3, 60, 1.5)
	res, err := Run(context.Background(), Options{Events: ev, RecordingHours: 10, Policy: accuracy.Policy{Kind: accuracy.Youden},
		Bootstrap: -1, HeadlineReplicates: 30, Seed: 1})
	if err != nil {
		t.Fatal(err)
	}
	h := res.Final.Headline
	if !math.IsNaN(h.Sens.Lo) || !math.IsNaN(h.Spec.Hi) || math.IsNaN(h.Sens.Value) || len(h.Notes) == 0 {
		t.Errorf("3 subjects: headline %+v, want point estimates, no intervals, and a note", h)
	}
	ev = simulate(rand.New(rand.NewPCG(8, 3)), 10, 20, 6) // features far apart: nothing missed
	res, err = Run(context.Background(), Options{Events: ev, RecordingHours: 10, Policy: accuracy.Policy{Kind: accuracy.MinSensitivity, Value: 0.999},
		Bootstrap: -1, HeadlineReplicates: 30, Seed: 1})
	if err != nil {
		t.Fatal(err)
	}
	if res.Final.InSample.Counts.FN != 0 {
		t.Fatalf("test set-up: the rule missed %v IEDs", res.Final.InSample.Counts.FN)
	}
	if h := res.Final.Headline; !math.IsNaN(h.Sens.Lo) || len(h.Notes) == 0 {
		t.Errorf("no missed IED: sensitivity %+v, notes %q; want no interval and a note", h.Sens, h.Notes)
	}
}

// TestFewSubjects checks the headline interval's widening factor against
// scipy 1.10 (script and values: testdata/fewsubjects.py).
func TestFewSubjects(t *testing.T) {
	for _, c := range []struct {
		a     int
		level float64
		want  float64
	}{
		{2, 0.95, 9.168172071676302},
		{5, 0.95, 1.5837842021560775},
		{8, 0.95, 1.289763320073566},
		{30, 0.95, 1.0613426479714705},
		{8, 0.90, 1.2313495197207152},
	} {
		if got := fewSubjects(c.a, c.level); math.Abs(got-c.want) > 1e-9 {
			t.Errorf("fewSubjects(%d, %v) = %.12f, want %.12f (scipy)", c.a, c.level, got, c.want)
		}
	}
	if got := fewSubjects(1, 0.95); got != 1 {
		t.Errorf("fewSubjects(1) = %v, want 1", got)
	}
}
