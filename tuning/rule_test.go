package tuning

import (
	"context"
	"math/rand/v2"
	"strconv"
	"strings"
	"testing"

	"github.com/quorate-eeg/quorate/sampling/candidate"
	"github.com/quorate-eeg/quorate/tuning/accuracy"
)

// applyPrinted reads a rule as printed ("at least K of: feature ≥ v; feature ≤ v; …"),
// with nothing but the text, and applies it to the events.
func applyPrinted(t *testing.T, rule string, ev []Event) []bool {
	t.Helper()
	head, body, ok := strings.Cut(rule, " of: ")
	k, err := strconv.Atoi(strings.TrimPrefix(head, "at least "))
	if !ok || err != nil {
		t.Fatalf("cannot read %q", rule)
	}
	col := map[string]int{}
	for j, n := range candidate.FeatureNames {
		col[n] = j
	}
	col["score"] = 6
	type cond struct {
		j  int
		ge bool
		v  float64
	}
	var cs []cond
	for _, part := range strings.Split(body, "; ") {
		f := strings.Fields(part)
		v, err := strconv.ParseFloat(f[2], 64)
		j, known := col[f[0]]
		if len(f) != 3 || err != nil || !known || (f[1] != "≥" && f[1] != "≤") {
			t.Fatalf("cannot read %q in %q", part, rule)
		}
		cs = append(cs, cond{j, f[1] == "≥", v})
	}
	hit := make([]bool, len(ev))
	for i, e := range ev {
		n := 0
		for _, c := range cs {
			x := e.Score
			if c.j < 6 {
				x = e.Features[c.j]
			}
			if (c.ge && x >= c.v) || (!c.ge && x <= c.v) {
				n++
			}
		}
		hit[i] = n >= k
	}
	return hit
}

// Every printed rule, read back from its text and applied, gives exactly the counts
// reported beside it: cutoffs sit between observed values and print in their shortest
// exact form.
func TestPrintedRulesReproduceCounts(t *testing.T) {
	ev := simulate(rand.New(rand.NewPCG(5, 1)), 12, 25, 1.2)
	var rated []Event // the events the counts are over: a reference, not a control
	var truth []bool
	for _, e := range ev {
		if e.Reference != -1 && e.Kind != "control" {
			rated = append(rated, e)
			truth = append(truth, e.Reference == 1)
		}
	}
	for _, m := range []string{MethodJoint, MethodCriterion, MethodScoreVote} {
		res, err := Run(context.Background(), Options{Events: ev, RecordingHours: 10, Policy: accuracy.Policy{Kind: accuracy.Youden},
			Bootstrap: -1, HeadlineReplicates: 20, Method: m, Seed: 3})
		if err != nil {
			t.Fatal(err)
		}
		check := func(rule string, want accuracy.Confusion) {
			if got := accuracy.Tally(applyPrinted(t, rule, rated), truth, nil); got != want {
				t.Errorf("%s: %q read back gives %+v, reported %+v", m, rule, got, want)
			}
		}
		check(res.Final.Rule, res.Final.InSample.Counts)
		if hasScore := strings.Contains(res.Final.Rule, "; score ≥ "); hasScore != (m == MethodScoreVote) {
			t.Errorf("%s: rule %q: the score votes exactly in %s", m, res.Final.Rule, MethodScoreVote)
		}
		for _, b := range res.Auto.ByK {
			check(b.Rule, b.Counts)
		}
		if a := res.Alternative; a != nil {
			check(a.Rule, a.InSample.Counts)
		}
		// Each criterion's cutoff, printed and read back, gives its counts against
		// the criterion's own panel majority.
		for _, c := range res.Criteria {
			if c.Skipped != "" {
				continue
			}
			cut, _ := strconv.ParseFloat(strconv.FormatFloat(c.Cutoff, 'g', -1, 64), 64)
			var met, maj []bool
			for _, e := range rated {
				x := e.Features[c.Criterion-1]
				if e.Majority[c.Criterion-1] == -1 {
					continue
				}
				met = append(met, (c.Direction > 0 && x >= cut) || (c.Direction < 0 && x <= cut))
				maj = append(maj, e.Majority[c.Criterion-1] == 1)
			}
			if got := accuracy.Tally(met, maj, nil); got != c.AtCutoff.Counts {
				t.Errorf("c%d cutoff %v read back gives %+v, reported %+v", c.Criterion, c.Cutoff, got, c.AtCutoff.Counts)
			}
		}
		for _, r := range res.Final.CV.FoldRules {
			applyPrinted(t, r, ev) // fold rules read back too
		}
	}
}
