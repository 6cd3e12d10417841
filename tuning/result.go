package tuning

import "github.com/quorate-eeg/quorate/tuning/accuracy"

// OperatingPoint is the final choice: the automatic rule "at least K of
// these cutoffs met" (six criteria and, by default, the detector score)
// that the policy picked, with its
// in-sample, cross-validated and bootstrap figures.
type OperatingPoint struct {
	Analysis  string // which analysis produced the rule
	Method    string // one of the Method constants
	Rule      string // the rule in words
	Policy    accuracy.Policy
	Reference string // the reference standard's name
	K         int
	Cutoffs   [6]Cutoff
	Score     Cutoff // the detector score's vote (MethodScoreVote); Direction 0 otherwise
	// Headline is what to expect on new recordings: the figures corrected
	// for the selection, with intervals that repeat it; nil when skipped.
	Headline *Headline
	// InSample are the figures on the events the rule was chosen on:
	// optimistic, because the choice saw them.
	InSample Metrics
	// CV repeats the whole selection in subject-grouped folds; nil when
	// there are too few subjects.
	CV *CrossValidated
	// Bootstrap holds subject-resampled intervals; nil when skipped.
	Bootstrap *BootstrapIntervals
}

// Result is everything Run found.
type Result struct {
	Reference      string
	Policy         accuracy.Policy
	Level          float64
	Seed           uint64
	RecordingHours float64
	Events         int // events with a reference, used throughout
	Excluded       int // events left out because their reference is unknown
	Positives      int // events whose reference is IED
	Subjects       int

	KSweep   KSweep          // analysis (a)
	Subsets  Subsets         // analysis (b)
	Criteria [6]CriterionROC // analysis (c), per criterion
	Auto     AutoRule        // analysis (c), the joint rule
	Score    ScoreSweep      // analysis (d)
	Final    OperatingPoint  // analysis (e) and the choice
	// Alternative is the rule the other fitting method chooses, with its
	// in-sample and headline figures, to show what the other method costs;
	// nil when the headline is skipped.
	Alternative *OperatingPoint
	Controls    Controls // what the background controls say about missed IEDs
	Warnings    []string
}

// Controls summarises the background controls: epochs drawn uniformly in recording time
// away from every candidate. An IED among them is one the finder missed, so their
// design-weighted count projects the IEDs missed per recording hour.
type Controls struct {
	Rated         int      // controls with a reference
	IEDs          int      // of which the reference calls IED
	MissedPerHour Estimate // design-weighted IEDs per recording hour outside the candidates
	// Warning says when MissedPerHour rests on fewer than five controls
	// called IED; empty otherwise.
	Warning string
}
