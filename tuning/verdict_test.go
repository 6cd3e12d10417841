package tuning

import (
	"context"
	"encoding/json"
	"math"
	"math/rand/v2"
	"os"
	"slices"
	"strings"
	"testing"

	"github.com/quorate-eeg/quorate/tuning/accuracy"
)

// youdenRef is testdata/youden_verdict.json: one feature, its verdict and
// majority labels and weights, and scikit-learn's design-weighted Youden
// thresholds and J (testdata/youden_verdict.py).
type youdenRef struct {
	Feature           []float64
	Verdict, Majority []bool
	Weight            []float64
	YoudenVerdict     float64 `json:"youden_verdict"`
	YoudenMajority    float64 `json:"youden_majority"`
	JVerdict          float64 `json:"j_verdict"`
}

// youdenSet reads the reference and builds its events with no criterion
// measured but, unless asScore, criterion 3 (feature and majority); with
// asScore the feature is the detector score instead.
func youdenSet(t *testing.T, asScore bool) (youdenRef, *evset) {
	t.Helper()
	b, err := os.ReadFile("testdata/youden_verdict.json")
	if err != nil {
		t.Fatal(err)
	}
	var ref youdenRef
	if err := json.Unmarshal(b, &ref); err != nil {
		t.Fatal(err)
	}
	var ev []Event
	for i, x := range ref.Feature {
		e := Event{Subject: string(rune('a' + i%8)), Weight: ref.Weight[i], Score: math.NaN()}
		for j := range 6 {
			e.Majority[j] = -1
			e.Features[j] = math.NaN()
		}
		if asScore {
			e.Score = x
		} else {
			e.Features[2] = x
			e.Majority[2] = 0
			if ref.Majority[i] {
				e.Majority[2] = 1
			}
		}
		if ref.Verdict[i] {
			e.Reference = 1
		}
		ev = append(ev, e)
	}
	o := Options{Events: ev}
	s, _, err := prepare(&o)
	if err != nil {
		t.Fatal(err)
	}
	return ref, s
}

// MethodVerdict reads each feature's cutoff off its ROC against the
// reference standard, MethodCriterion against the criterion's panel
// majority. testdata/youden_verdict.py gives both design-weighted Youden
// thresholds from scikit-learn's roc_curve (sample_weight) for a feature
// whose majority disagrees with the verdict on a quarter of the events.
func TestFitFeatureByVerdict(t *testing.T) {
	ref, s := youdenSet(t, false)
	fv := fitFeature(s, 2, false, true)
	fm := fitFeature(s, 2, false, false)
	if !fv.ok || fv.dir != 1 || fv.cut != ref.YoudenVerdict {
		t.Errorf("against the verdict: ok %v, direction %v, cutoff %v; scikit-learn %v", fv.ok, fv.dir, fv.cut, ref.YoudenVerdict)
	}
	if !fm.ok || fm.dir != 1 || fm.cut != ref.YoudenMajority {
		t.Errorf("against the majority: ok %v, direction %v, cutoff %v; scikit-learn %v", fm.ok, fm.dir, fm.cut, ref.YoudenMajority)
	}
	// With one feature the Youden policy's rule is "x ≥ cut" at the
	// verdict's Youden threshold (its J is the curve's unique maximum), the
	// cutoff printed in the gap below it.
	f, _, err := fitRule(s, MethodVerdict, accuracy.Policy{Kind: accuracy.Youden})
	if err != nil {
		t.Fatal(err)
	}
	below := math.Inf(-1)
	for _, x := range ref.Feature {
		if x < ref.YoudenVerdict {
			below = math.Max(below, x)
		}
	}
	if f.k != 1 || !(f.cut[2] > below && f.cut[2] < ref.YoudenVerdict) {
		t.Errorf("rule k=%d cutoff %v, want k=1 and a cutoff in (%v, %v)", f.k, f.cut[2], below, ref.YoudenVerdict)
	}
	c := accuracy.Tally(f.decide(s), s.truth, s.weight)
	if j := c.Sensitivity() + c.Specificity() - 1; math.Abs(j-ref.JVerdict) > 1e-12 {
		t.Errorf("weighted J of the rule %v, scikit-learn %v", j, ref.JVerdict)
	}
}

// MethodScoreVote fits the detector score's cutoff against the reference
// standard even though the criteria are fitted against their majorities:
// the score has no criterion label. The same scikit-learn reference
// (testdata/youden_verdict.py), with the feature given as the score and no
// criterion measured: the score's cutoff is the verdict's Youden
// threshold, and the rule "at least 1 of: score ≥ s" reaches its J.
func TestScoreVoteByVerdict(t *testing.T) {
	ref, s := youdenSet(t, true)
	if fs := fitFeature(s, scoreSlot, false, false); !fs.ok || fs.cut != ref.YoudenVerdict {
		t.Errorf("score: ok %v, cutoff %v; scikit-learn %v", fs.ok, fs.cut, ref.YoudenVerdict)
	}
	f, warn, err := fitRule(s, MethodScoreVote, accuracy.Policy{Kind: accuracy.Youden})
	if err != nil {
		t.Fatal(err)
	}
	if len(warn) != 6 { // each unmeasured criterion is left out, the score is not
		t.Errorf("warnings %q, want one per unmeasured criterion", warn)
	}
	if f.k != 1 || !f.active[scoreSlot] || f.slot(f.cut, scoreSlot).Value >= ref.YoudenVerdict {
		t.Errorf("rule %q, want at least 1 with the score's cutoff just below %v", f.name(f.cut, f.k), ref.YoudenVerdict)
	}
	c := accuracy.Tally(f.decide(s), s.truth, s.weight)
	if j := c.Sensitivity() + c.Specificity() - 1; math.Abs(j-ref.JVerdict) > 1e-12 {
		t.Errorf("weighted J of the rule %v, scikit-learn %v", j, ref.JVerdict)
	}
}

// A team's own detector may give no score: the default fit then leaves the
// vote out, says so, and is the six-criteria fit (MethodCriterion), rule
// for rule.
func TestScoreVoteWithoutScores(t *testing.T) {
	ev := simulate(rand.New(rand.NewPCG(7, 1)), 10, 30, 1.2)
	for i := range ev {
		ev[i].Score = math.NaN()
	}
	run := func(m string) *Result {
		res, err := Run(context.Background(), Options{Events: ev, RecordingHours: 10, Policy: accuracy.Policy{Kind: accuracy.Youden},
			Bootstrap: -1, HeadlineReplicates: -1, Method: m, Seed: 2})
		if err != nil {
			t.Fatal(err)
		}
		return res
	}
	def, six := run(""), run(MethodCriterion)
	if def.Final.Rule != six.Final.Rule || def.Final.Score.Direction != 0 || len(def.Auto.ByK) != 6 {
		t.Errorf("without scores the default rule %q differs from the six-criteria rule %q", def.Final.Rule, six.Final.Rule)
	}
	if !slices.ContainsFunc(def.Warnings, func(w string) bool {
		return strings.HasPrefix(w, "score: no event with a reference has a measured score")
	}) {
		t.Errorf("no warning that the score is left out: %q", def.Warnings)
	}
}
