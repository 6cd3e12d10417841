package tuning

import (
	"context"
	"errors"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/quorate-eeg/quorate/tuning/accuracy"
)

func runSim(t *testing.T, seed uint64, policy string) *Result {
	t.Helper()
	p, err := accuracy.ParsePolicy(policy)
	if err != nil {
		t.Fatal(err)
	}
	ev := simulate(rand.New(rand.NewPCG(seed, 1)), 40, 30, 1.5)
	res, err := Run(context.Background(), Options{Events: ev, RecordingHours: 100, Policy: p, Bootstrap: 200, HeadlineReplicates: 60, Seed: seed, ReferenceName: "panel verdict"})
	if err != nil {
		t.Fatal(err)
	}
	return res
}

// The k-of-6 rules are nested (an event meeting k+1 criteria meets k), so
// sensitivity cannot rise and specificity cannot fall as k grows (closed
// form: TP and FP are sums over a shrinking set of events).
func TestKSweepMonotone(t *testing.T) {
	res := runSim(t, 3, "youden")
	rows := res.KSweep.Rows
	if len(rows) != 6 {
		t.Fatalf("%d k rows", len(rows))
	}
	for i := 1; i < 6; i++ {
		a, b := rows[i-1], rows[i]
		for _, pair := range [][2]Rates{{a.Plain, b.Plain}, {a.Design, b.Design}} {
			if pair[1].Sens.Value > pair[0].Sens.Value {
				t.Errorf("k=%d: sensitivity rose %v → %v", b.K, pair[0].Sens.Value, pair[1].Sens.Value)
			}
			if pair[1].Spec.Value < pair[0].Spec.Value {
				t.Errorf("k=%d: specificity fell %v → %v", b.K, pair[0].Spec.Value, pair[1].Spec.Value)
			}
		}
	}
	if a := res.KSweep.AUC; !(a > 0.5 && a <= 1) {
		t.Errorf("k-sweep AUC %v", a)
	}
	t.Logf("final %s; in-sample J %.3f, CV J %.3f; warnings %q", res.Final.Rule, res.Final.InSample.Design.Youden.Value, res.Final.CV.Design.Youden.Value, res.Warnings)
}

func TestRunErrors(t *testing.T) {
	ctx := context.Background()
	var nd *NoDataError
	// The error names the missing input, in the domain's words: the command adds its hint.
	if _, err := Run(ctx, Options{}); !errors.As(err, &nd) || !errors.Is(err, ErrNoEvents) || !strings.Contains(err.Error(), "no events") || strings.Contains(err.Error(), "quorate") {
		t.Errorf("no events: %v", err)
	}
	ev := simulate(rand.New(rand.NewPCG(1, 1)), 4, 5, 1)
	for i := range ev {
		ev[i].Reference = -1
		ev[i].Majority = [6]int8{-1, -1, -1, -1, -1, -1}
	}
	if _, err := Run(ctx, Options{Events: ev}); !errors.As(err, &nd) || !errors.Is(err, ErrNoReference) || !strings.Contains(err.Error(), "consensus") {
		t.Errorf("no consensus: %v", err)
	}
	ev = simulate(rand.New(rand.NewPCG(1, 1)), 4, 5, 1)
	for i := range ev {
		ev[i].Reference = 1
	}
	var sc *singleClassError
	if _, err := Run(ctx, Options{Events: ev}); !errors.As(err, &sc) || sc.Class != "IED" {
		t.Errorf("single class: %v", err)
	}
	ev = simulate(rand.New(rand.NewPCG(1, 1)), 4, 5, 1)
	ev[3].Weight = 0.5
	var ie *InputError
	if _, err := Run(ctx, Options{Events: ev}); !errors.As(err, &ie) || ie.Index != 3 || ie.Field != "Weight" {
		t.Errorf("bad weight: %v", err)
	}
}

// A policy nothing satisfies is a typed error that lists the closest points.
func TestRunPolicyUnmet(t *testing.T) {
	ev := simulate(rand.New(rand.NewPCG(5, 1)), 10, 20, 0.5)
	_, err := Run(context.Background(), Options{Events: ev, RecordingHours: 10,
		Policy: accuracy.Policy{Kind: accuracy.MaxFalsePerHour, Value: -1}, Bootstrap: -1})
	var npe *accuracy.NoPointError
	if !errors.As(err, &npe) || len(npe.Closest) == 0 || !strings.Contains(err.Error(), "closest") {
		t.Fatalf("err = %v, want *accuracy.NoPointError with closest points", err)
	}
}

// A constant feature column is skipped with a warning, not a crash.
func TestConstantFeature(t *testing.T) {
	ev := simulate(rand.New(rand.NewPCG(6, 1)), 10, 20, 1.5)
	for i := range ev {
		ev[i].Features[2] = 0.3
	}
	res, err := Run(context.Background(), Options{Events: ev, RecordingHours: 10, Policy: accuracy.Policy{Kind: accuracy.Youden}, Bootstrap: 50})
	if err != nil {
		t.Fatal(err)
	}
	if res.Criteria[2].Skipped == "" || !math.IsNaN(res.Criteria[2].AUC.Value) {
		t.Errorf("constant c3 not skipped: %+v", res.Criteria[2].AUC)
	}
	if res.Final.Cutoffs[2].Direction != 0 {
		t.Errorf("constant c3 used in the rule: %v", res.Final.Cutoffs[2])
	}
	found := false
	for _, w := range res.Warnings {
		found = found || strings.Contains(w, "c3") && strings.Contains(w, "constant")
	}
	if !found {
		t.Errorf("no warning for constant c3: %q", res.Warnings)
	}
}
