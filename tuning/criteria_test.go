package tuning

import (
	"encoding/json"
	"math"
	"os"
	"strings"
	"testing"

	"github.com/quorate-eeg/quorate/tuning/accuracy"
)

// The criterion ROC's AUC is the Mann–Whitney U/(m·n) with ties counted ½;
// testdata/mannwhitney.py computes it with scipy.stats.mannwhitneyu.
func TestCriterionAUCAgainstScipy(t *testing.T) {
	b, err := os.ReadFile("testdata/mannwhitney.json")
	if err != nil {
		t.Fatal(err)
	}
	var ref struct {
		Feature []float64
		Present []bool
		AUC     float64
	}
	if err := json.Unmarshal(b, &ref); err != nil {
		t.Fatal(err)
	}
	var ev []Event
	for i, x := range ref.Feature {
		e := Event{Subject: "s", Weight: 1, Reference: int8(i % 2)}
		for j := range 6 {
			e.Majority[j] = -1
			e.Features[j] = math.NaN()
		}
		e.Features[1] = x
		e.Majority[1] = 0
		if ref.Present[i] {
			e.Majority[1] = 1
		}
		ev = append(ev, e)
	}
	o := Options{Events: ev}
	s, _, err := prepare(&o)
	if err != nil {
		t.Fatal(err)
	}
	r, _ := criterionROC(s, 1, 0.95)
	if r.Skipped != "" || r.Direction != 1 {
		t.Fatalf("skipped %q, direction %d", r.Skipped, r.Direction)
	}
	if math.Abs(r.AUC.Value-ref.AUC) > 1e-12 || math.Abs(r.WeightedAUC-ref.AUC) > 1e-12 {
		t.Errorf("AUC %v (weighted %v), scipy U/(mn) %v", r.AUC.Value, r.WeightedAUC, ref.AUC)
	}
	if !(r.AUC.Lo < r.AUC.Value && r.AUC.Value < r.AUC.Hi) {
		t.Errorf("DeLong interval %+v", r.AUC)
	}
	// The cutoff is the Youden-optimal threshold: no other threshold on the
	// curve has a larger J (Youden 1950).
	best := math.Inf(-1)
	for _, p := range r.Curve {
		best = math.Max(best, p.Weighted.Youden())
	}
	if r.AtCutoff.Weighted.Youden() != best {
		t.Errorf("cutoff J %v, best on curve %v", r.AtCutoff.Weighted.Youden(), best)
	}
	if f := fitCriterion(s, 1, false); f.against != "" {
		t.Errorf("a feature with AUC %.2f warned: %s", ref.AUC, f.against)
	}
	// Reversing the feature keeps its defined direction (higher = met) and
	// reports AUC 1 − AUC (Mann & Whitney 1947: U + U' = mn),
	// with a warning: a criterion is never counted as met for a low value.
	for i := range ev {
		ev[i].Features[1] = -ev[i].Features[1]
	}
	s, _, _ = prepare(&o)
	r2, f2 := criterionROC(s, 1, 0.95)
	if r2.Direction != 1 || math.Abs(r2.AUC.Value-(1-ref.AUC)) > 1e-12 || f2.against == "" {
		t.Errorf("reversed: direction %d, AUC %v (want %v), warning %q", r2.Direction, r2.AUC.Value, 1-ref.AUC, f2.against)
	}
}

// False detections per hour in the score sweep, closed form: at threshold
// 0.5 the reference-negative candidates above it weigh 4 + 2 (the control is
// kept out of every rule's figures), over 3 hours = 2 per hour.
func TestScoreFalsePerHour(t *testing.T) {
	ev := []Event{
		{Score: 0.9, Reference: 1, Weight: 1, Kind: "candidate"},
		{Score: 0.8, Reference: 0, Weight: 4, Kind: "candidate"},
		{Score: 0.7, Reference: 0, Weight: 5, Kind: "control"},
		{Score: 0.5, Reference: 0, Weight: 2},
		{Score: 0.2, Reference: 1, Weight: 3, Kind: "candidate"},
		{Score: 0.1, Reference: 0, Weight: 1, Kind: "candidate"},
	}
	o := Options{Events: ev, RecordingHours: 3}
	s, _, err := prepare(&o)
	if err != nil {
		t.Fatal(err)
	}
	sw, _ := scoreSweep(s, accuracy.Policy{Kind: accuracy.Youden}, 0.95)
	for _, p := range sw.Curve {
		if p.Threshold == 0.5 {
			if p.FalsePerHour != 2 || p.Weighted.FP != 6 || p.Counts.FP != 2 || p.Weighted.TP != 1 {
				t.Errorf("at 0.5: %+v", p)
			}
			return
		}
	}
	t.Error("threshold 0.5 missing")
}

// Missed IEDs per hour from background controls, closed form: four controls drawn from
// M = 40 eligible epochs (weight 10 each), one of them an IED, over 5 hours: Ŷ = 10,
// 2 per hour; the interval is the Wilson interval of 1/4 (Newcombe 1998, method 3:
// 0.0456 to 0.6994 for 1 of 4, computed from its closed form) times 40/5 epochs per hour.
func TestControlSummary(t *testing.T) {
	ev := []Event{
		{Score: 0.9, Reference: 1, Weight: 1, Kind: "candidate"},
		{Score: 0.1, Reference: 0, Weight: 1, Kind: "candidate"},
		{Reference: 1, Weight: 10, Kind: "control", Stratum: "control"},
		{Reference: 0, Weight: 10, Kind: "control", Stratum: "control"},
		{Reference: 0, Weight: 10, Kind: "control", Stratum: "control"},
		{Reference: 0, Weight: 10, Kind: "control", Stratum: "control"},
	}
	o := Options{Events: ev, RecordingHours: 5}
	s, _, err := prepare(&o)
	if err != nil {
		t.Fatal(err)
	}
	if s.n() != 2 {
		t.Fatalf("%d events in the rule's figures, want the 2 candidates", s.n())
	}
	c := controlSummary(s, 0.95)
	if c.Rated != 4 || c.IEDs != 1 || math.Abs(c.MissedPerHour.Value-2) > 1e-12 {
		t.Fatalf("controls %+v", c)
	}
	// Wilson (1927): (x + z²/2 ± z√(x(n−x)/n + z²/4)) / (n + z²), x = 1, n = 4.
	z := 1.959963985
	lo := (1 + z*z/2 - z*math.Sqrt(0.75+z*z/4)) / (4 + z*z)
	hi := (1 + z*z/2 + z*math.Sqrt(0.75+z*z/4)) / (4 + z*z)
	if math.Abs(c.MissedPerHour.Lo-lo*8) > 1e-6 || math.Abs(c.MissedPerHour.Hi-hi*8) > 1e-6 {
		t.Errorf("interval %v–%v, want %v–%v", c.MissedPerHour.Lo, c.MissedPerHour.Hi, lo*8, hi*8)
	}
	// One control carries the figure: each moves it by w/H = 10/5 per hour.
	if !strings.Contains(c.Warning, "rests on 1 of 4") || !strings.Contains(c.Warning, "by 2 per hour") {
		t.Errorf("no warning that one control carries the missed-IED rate: %q", c.Warning)
	}
	// No IED among the controls still gives an upper bound above zero.
	for i := range ev {
		if ev[i].Kind == "control" {
			ev[i].Reference = 0
		}
	}
	s, _, _ = prepare(&o)
	if c := controlSummary(s, 0.95); !(c.MissedPerHour.Hi > 0) || c.MissedPerHour.Value != 0 {
		t.Errorf("zero IEDs: %+v", c.MissedPerHour)
	}
}

// TestCriterionTargets reads cutoffs off a hand-made ROC: thresholds run
// from +Inf down, sensitivity rises and specificity falls along them. A
// sensitivity target takes the highest threshold reaching it, a
// specificity target (negative) the lowest (definitions of
// criterionTargets, worked by hand).
func TestCriterionTargets(t *testing.T) {
	f := criterionFit{cut: 2, th: []float64{math.Inf(1), 3, 2, 1},
		weighed: []accuracy.Confusion{{TP: 0, FN: 10, TN: 10, FP: 0}, {TP: 4, FN: 6, TN: 9, FP: 1}, {TP: 8, FN: 2, TN: 6, FP: 4}, {TP: 10, FN: 0, TN: 0, FP: 10}}}
	for _, c := range []struct{ target, want float64 }{
		{0, 2}, {0.4, 3}, {0.5, 2}, {0.8, 2}, {0.9, 1}, {-0.9, 3}, {-0.8, 3}, {-0.6, 2}, {-0.5, 2}, {-1, math.Inf(1)},
	} {
		if got := f.at(c.target); got != c.want {
			t.Errorf("at(%v) = %v, want %v", c.target, got, c.want)
		}
	}
}
