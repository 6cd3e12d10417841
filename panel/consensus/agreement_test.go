package consensus

import (
	"bytes"
	"encoding/json"
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/quorate-eeg/quorate/panel/simulate"
)

// simulatedRatings rates n events by a simulated panel; every tenth event is shown twice.
func simulatedRatings(n, raters int, seed uint64) ([]Rating, map[string]string, map[string]bool) {
	rng := rand.New(rand.NewPCG(seed, 1))
	panel := simulate.Panel(raters)
	var rs []Rating
	subj := map[string]string{}
	truth := map[string]bool{}
	for i := 0; i < n; i++ {
		id := fmt.Sprintf("ev-%04d", i)
		subj[id] = fmt.Sprintf("sub-%02d", i%25)
		ied := rng.Float64() < 0.4
		var meets [6]bool
		for c := range meets {
			if ied {
				meets[c] = rng.Float64() < 0.85
			} else {
				meets[c] = rng.Float64() < 0.25
			}
		}
		truth[id] = ied
		for _, p := range panel {
			a := p.Answer(simulate.Truth{Meets: meets, IED: ied}, rng)
			rs = append(rs, toRating(id, p.Name, a, false))
			if i%10 == 0 {
				rs = append(rs, toRating(id, p.Name, p.Again(a, simulate.Truth{Meets: meets, IED: ied}, rng), true))
			}
		}
	}
	return rs, subj, truth
}

func toRating(id, rater string, a simulate.Answers, dup bool) Rating {
	b := func(v bool) *bool { return &v }
	return Rating{EventID: id, Rater: rater, Duplicate: dup, C1: b(a.Criteria[0]), C2: b(a.Criteria[1]), C3: b(a.Criteria[2]),
		C4: b(a.Criteria[3]), C5: b(a.Criteria[4]), C6: b(a.Criteria[5]), Epileptiform: b(a.Epileptiform)}
}

func TestMeasureOnSimulatedPanel(t *testing.T) {
	rs, subj, truth := simulatedRatings(400, 5, 3)
	agr, ds, err := Measure(rs, subj, 300, 9, 0.95)
	if err != nil {
		t.Fatal(err)
	}
	if len(agr.Questions) != 7 || agr.Subjects != 25 || agr.Events != 400 {
		t.Fatalf("report shape: %d questions, %d subjects, %d events", len(agr.Questions), agr.Subjects, agr.Events)
	}
	for _, q := range agr.Questions {
		k := float64(q.Fleiss.Value)
		// Raters of accuracy 0.75–0.93 on binary questions give moderate to substantial
		// agreement; far outside that band the tallies are wrong.
		if k < 0.3 || k > 0.9 {
			t.Errorf("%s: Fleiss kappa %.3f outside the plausible band [0.3, 0.9]", q.Question, k)
		}
		if !(float64(q.Fleiss.Lo) <= k && k <= float64(q.Fleiss.Hi)) {
			t.Errorf("%s: kappa %.3f outside its own interval [%.3f, %.3f]", q.Question, k, q.Fleiss.Lo, q.Fleiss.Hi)
		}
		if len(q.Cohen) != 10 {
			t.Errorf("%s: %d rater pairs, want 10", q.Question, len(q.Cohen))
		}
		for _, in := range q.Intra {
			// Consistency 0.7–0.85 plus chance coincidence.
			if in.Pairs != 40 || in.Observed < 0.7 {
				t.Errorf("%s %s: self-agreement %.2f on %d pairs", q.Question, in.Rater, in.Observed, in.Pairs)
			}
		}
	}
	// The hurried rater (last) is the least specific on the verdict, by the model's estimate.
	v := agr.Questions[6]
	hurried := v.Raters[len(v.Raters)-1]
	for _, r := range v.Raters[:len(v.Raters)-1] {
		if r.DSSpec <= hurried.DSSpec {
			t.Errorf("rater %s DS specificity %.2f not above the hurried rater's %.2f", r.Rater, r.DSSpec, hurried.DSSpec)
		}
	}
	// Dawid–Skene probabilities classify most events as built.
	right := 0
	for id, p := range ds {
		if (p >= 0.5) == truth[id] {
			right++
		}
	}
	if frac := float64(right) / float64(len(ds)); frac < 0.85 {
		t.Errorf("Dawid–Skene agrees with the truth on %.2f of events, want ≥ 0.85", frac)
	}
	var js bytes.Buffer
	if err := json.NewEncoder(&js).Encode(agr); err != nil {
		t.Fatal(err)
	}
	var md bytes.Buffer
	if err := agr.WriteMarkdown(&md); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(md.String(), "not a diagnostic device") || !strings.Contains(md.String(), "c6 field") {
		t.Error("markdown lacks the caution or a question")
	}
	again, _, _ := Measure(rs, subj, 300, 9, 0.95)
	if again.Questions[0].Fleiss != agr.Questions[0].Fleiss {
		t.Error("same seed gave different intervals")
	}
	if math.IsNaN(float64(agr.Questions[6].Alpha.Value)) {
		t.Error("alpha undefined")
	}
}
