package tuning

import (
	"context"
	"errors"
	"fmt"

	"github.com/quorate-eeg/quorate/internal/progress"
	"github.com/quorate-eeg/quorate/tuning/accuracy"
)

// Run performs the analyses (a)–(e) on the events with a reference and
// chooses the final operating point, the automatic rule of AutoRule, under
// o.Policy.
//
// Errors: *NoDataError when there are no events or no consensus,
// *InputError for an unusable event, *singleClassError when the reference
// has one class, and an error wrapping *accuracy.NoPointError (with the
// closest rules) when no automatic rule satisfies the policy. Results are
// deterministic given the events, options and seed.
func Run(ctx context.Context, o Options) (*Result, error) {
	if o.Level == 0 {
		o.Level = 0.95
	}
	if !(o.Level > 0 && o.Level < 1) {
		return nil, &InputError{Index: -1, Field: "Level", Msg: fmt.Sprintf("confidence level %v outside (0,1)", o.Level)}
	}
	if o.Folds < 0 || o.Folds == 1 {
		return nil, &InputError{Index: -1, Field: "Folds", Msg: fmt.Sprintf("%d folds: want 0 (the default, 5) or at least 2", o.Folds)}
	}
	if o.Folds == 0 {
		o.Folds = 5
	}
	if o.Bootstrap == 0 {
		o.Bootstrap = 2000
	}
	if o.HeadlineReplicates == 0 {
		o.HeadlineReplicates = 200
	}
	if o.ReferenceName == "" {
		o.ReferenceName = "reference standard"
	}
	newBar := o.Progress
	if newBar == nil {
		newBar = func(int, string) progress.Bar { return progress.Silent{} }
	}
	s, excluded, err := prepare(&o)
	if err != nil {
		return nil, err
	}
	res := &Result{Reference: o.ReferenceName, Policy: o.Policy, Level: o.Level, Seed: o.Seed,
		RecordingHours: o.RecordingHours, Events: s.n(), Excluded: excluded}
	for _, t := range s.truth {
		if t {
			res.Positives++
		}
	}
	subjects := map[string]bool{}
	for _, x := range s.subject {
		subjects[x] = true
	}
	res.Subjects = len(subjects)
	warn := func(format string, a ...any) { res.Warnings = append(res.Warnings, fmt.Sprintf(format, a...)) }
	if excluded > 0 {
		warn("%d events without a reference (%s) were left out", excluded, o.ReferenceName)
	}
	if !(o.RecordingHours > 0) {
		warn("recording hours unknown: false detections per hour cannot be given")
	}
	var folds [][]int
	switch k := min(o.Folds, res.Subjects); {
	case k < 2:
		warn("only %d subject(s): no cross-validation; the in-sample figures are optimistic", res.Subjects)
	default:
		if k < o.Folds {
			warn("%d folds asked for but only %d subjects: using %d folds", o.Folds, res.Subjects, k)
		}
		folds = accuracy.GroupKFold(s.subject, k, o.Seed)
	}

	res.Controls = controlSummary(s, o.Level)
	if res.Controls.Warning != "" {
		warn("%s", res.Controls.Warning)
	}
	res.KSweep = kSweep(s, &o, o.Level)
	res.Subsets = subsetAnalysis(s, folds, o.Level)
	for j := range 6 {
		r, _ := criterionROC(s, j, o.Level)
		if r.Skipped != "" {
			res.Warnings = append(res.Warnings, r.Skipped)
		}
		res.Criteria[j] = r
	}
	var missing int
	res.Score, missing = scoreSweep(s, o.Policy, o.Level)
	if missing > 0 {
		warn("%d events have no detector score and are left out of the score sweep", missing)
	}
	if res.Score.N > 0 && res.Score.Chosen < 0 {
		warn("no detector score threshold meets %s", o.Policy)
	}

	method := o.Method
	if method == "" {
		method = MethodDefault
	}
	f, fw, err := fitRule(s, method, o.Policy)
	for _, w := range fw {
		if !contains(res.Warnings, w) {
			res.Warnings = append(res.Warnings, w)
		}
	}
	if err != nil {
		var npe *accuracy.NoPointError
		if errors.As(err, &npe) {
			return nil, fmt.Errorf("tuning: automatic rule (at least k criteria at tuned cutoffs): %w", err)
		}
		return nil, err
	}
	res.Auto = AutoRule{Method: method, Chosen: f.k - 1, K: f.k, Cutoffs: f.cutoffs(f.cut), Score: f.slot(f.cut, scoreSlot)}
	for k := 1; k <= f.slots; k++ {
		bk := f.byK[k-1]
		hits := make([]bool, s.n())
		for i, e := range s.src {
			hits[i] = f.hits(e, &bk.cut, k)
		}
		c := accuracy.Tally(hits, s.truth, nil)
		res.Auto.ByK = append(res.Auto.ByK, AutoCandidate{K: k, Cutoffs: f.cutoffs(bk.cut), Score: f.slot(bk.cut, scoreSlot),
			Point: Point{Rule: f.name(bk.cut, k), Threshold: float64(k), Counts: c, Weighted: bk.w, FalsePerHour: falsePerHour(bk.fp, s.hours)}})
	}

	hit := f.decide(s)
	res.Final = OperatingPoint{
		Analysis:  analysisName(method),
		Method:    method,
		Rule:      f.name(f.cut, f.k),
		Policy:    o.Policy,
		Reference: o.ReferenceName,
		K:         f.k,
		Cutoffs:   f.cutoffs(f.cut),
		Score:     f.slot(f.cut, scoreSlot),
		InSample:  measure(s, hit, o.Level),
	}
	if o.HeadlineReplicates >= 0 {
		bar := newBar(o.HeadlineReplicates, "repeating the selection on resampled subjects")
		res.Final.Headline, err = headline(ctx, s, f, method, o.Policy, o.HeadlineReplicates, o.Seed, o.Level, bar, o.HeadlineVariants)
		bar.Finish()
		if err != nil {
			return nil, err
		}
		res.Warnings = append(res.Warnings, res.Final.Headline.Notes...)
		// The other fitting method, side by side with its own honest figures.
		other := MethodJoint
		if method == MethodJoint {
			other = MethodDefault
		}
		if g, _, err := fitRule(s, other, o.Policy); g != nil {
			_ = err // a policy no rule meets still shows the nearest rule
			alt := &OperatingPoint{Analysis: analysisName(other), Method: other, Rule: g.name(g.cut, g.k), Policy: o.Policy,
				Reference: o.ReferenceName, K: g.k, Cutoffs: g.cutoffs(g.cut), Score: g.slot(g.cut, scoreSlot), InSample: measure(s, g.decide(s), o.Level)}
			alt.Headline, err = headline(ctx, s, g, other, o.Policy, o.HeadlineReplicates, o.Seed, o.Level, progress.Silent{}, o.HeadlineVariants)
			if err != nil {
				return nil, err
			}
			res.Alternative = alt
		}
	}
	if folds != nil {
		bar := newBar(len(folds), "cross-validating")
		cv, cw, err := crossValidateAuto(ctx, s, folds, method, o.Policy, o.Level, bar)
		bar.Finish()
		if err != nil {
			return nil, err
		}
		res.Final.CV = cv
		res.Warnings = append(res.Warnings, cw...)
	}
	if o.Bootstrap > 0 {
		bar := newBar(o.Bootstrap, "bootstrapping subjects")
		bi, err := bootstrapPoint(ctx, s, hit, o.Bootstrap, o.Seed, o.Level, bar)
		bar.Finish()
		if err != nil {
			return nil, err
		}
		res.Final.Bootstrap = bi
	}
	return res, nil
}

func contains(v []string, s string) bool {
	for _, x := range v {
		if x == s {
			return true
		}
	}
	return false
}

func analysisName(method string) string {
	if method == MethodJoint {
		return "automatic rule: at least k criteria met, six cutoffs and k searched jointly against the reference standard"
	}
	if method == MethodScoreVote {
		return "automatic rule: at least k of seven votes (six criteria, each cutoff fitted to its panel majority; the detector score, fitted to the reference standard), all read at one shared ROC point (Youden's J or a sensitivity or specificity target), that point and k chosen against the reference standard"
	}
	if method == MethodVerdict {
		return "automatic rule: at least k criteria met, each cutoff read off its feature's ROC against the reference standard at one shared point (Youden's J or a sensitivity or specificity target), that point and k chosen against the reference standard"
	}
	return "automatic rule: at least k criteria met, each cutoff fitted to its criterion's panel majority at one shared point of their ROCs (Youden's J or a sensitivity or specificity target), that point and k chosen against the reference standard"
}
