package tuning

import (
	"math"

	"github.com/quorate-eeg/quorate/internal/progress"
	"github.com/quorate-eeg/quorate/tuning/accuracy"
)

// Event is one rated event as the tuner sees it.
type Event struct {
	EventID, Subject, Recording, Stratum string
	Kind                                 string     // "candidate" or "control"; empty means candidate
	Weight                               float64    // design weight 1/π, at least 1
	Features                             [6]float64 // headline feature per criterion, NaN when not measured
	AutoMet                              [6]bool    // automatic decision at the default cutoffs
	Score                                float64    // detector score; NaN leaves the event out of the score sweep
	Majority                             [6]int8    // panel majority per criterion: 1 present, 0 absent, −1 undetermined or no quorum
	Reference                            int8       // reference standard: 1 IED, 0 not, −1 unknown (excluded)
}

// Options configures Run.
type Options struct {
	Events []Event
	// RecordingHours is the total duration of the recordings the candidates
	// come from; it turns design-weighted false detections into a rate.
	RecordingHours float64
	Policy         accuracy.Policy
	Folds          int // subject-grouped cross-validation folds; 0 means 5
	Bootstrap      int // subject bootstrap replicates; 0 means 2000, negative skips
	// HeadlineReplicates are the replicates of the optimism-corrected
	// bootstrap behind OperatingPoint.Headline; 0 means 200, negative skips.
	// Each replicate repeats the whole fit, so this is the costly part of
	// Run; 200 is the count Harrell, Lee & Mark (1996) work with (from
	// memory), and the coverage study (README) was measured with it.
	HeadlineReplicates int
	// HeadlineVariants also computes, from the same replicates, the
	// estimators the headline was compared with (Headline.Variants); for
	// the coverage study's design work.
	HeadlineVariants bool
	// Method fits the automatic rule: MethodDefault (for ""),
	// MethodScoreVote, MethodCriterion, MethodVerdict or MethodJoint.
	// The default leaves two free choices against the verdict (one shared
	// ROC point and k) and adds the detector score as a seventh vote; why it
	// was chosen, and on which seeds, is in the README (performance). The
	// report shows the joint search beside the default.
	Method        string
	Seed          uint64  // seeds folds and bootstrap
	Level         float64 // two-sided confidence level; 0 means 0.95
	ReferenceName string  // e.g. "panel majority verdict"
	// Progress, when not nil, makes a bar for long steps.
	Progress func(total int, desc string) progress.Bar
}

// evset is the validated events that have a reference, as parallel slices.
type evset struct {
	src       []*Event
	truth     []bool
	weight    []float64
	stratum   []string
	subject   []string
	candidate []bool   // Kind is candidate: counts towards false detections per hour
	controls  []*Event // background controls with a reference, kept apart
	hours     float64
}

func (s *evset) n() int { return len(s.truth) }

// subset returns the events at idx, with hours scaled to the share of
// design-weighted candidates they hold: the hours a fold of subjects stands
// for are not known per subject, so they are apportioned by projected
// candidate count.
func (s *evset) subset(idx []int) *evset {
	t := &evset{}
	var all, part float64
	for i := range s.truth {
		if s.candidate[i] {
			all += s.weight[i]
		}
	}
	for _, i := range idx {
		t.src = append(t.src, s.src[i])
		t.truth = append(t.truth, s.truth[i])
		t.weight = append(t.weight, s.weight[i])
		t.stratum = append(t.stratum, s.stratum[i])
		t.subject = append(t.subject, s.subject[i])
		t.candidate = append(t.candidate, s.candidate[i])
		if s.candidate[i] {
			part += s.weight[i]
		}
	}
	t.hours = math.NaN()
	if all > 0 {
		t.hours = s.hours * part / all
	}
	return t
}

// prepare validates the events and keeps those with a reference.
func prepare(o *Options) (*evset, int, error) {
	if len(o.Events) == 0 {
		return nil, 0, &NoDataError{Msg: ErrNoEvents.Error(), Err: ErrNoEvents}
	}
	s := &evset{hours: o.RecordingHours}
	if !(o.RecordingHours > 0) {
		s.hours = math.NaN()
	}
	consensus := false
	excluded := 0
	for i := range o.Events {
		e := &o.Events[i]
		if !(e.Weight >= 1) || math.IsInf(e.Weight, 0) {
			return nil, 0, &InputError{Index: i, EventID: e.EventID, Field: "Weight", Msg: "design weight must be a finite 1/π ≥ 1"}
		}
		switch e.Kind {
		case "", "candidate", "control":
		default:
			return nil, 0, &InputError{Index: i, EventID: e.EventID, Field: "Kind", Msg: `want "candidate" or "control", got "` + e.Kind + `"`}
		}
		if e.Reference < -1 || e.Reference > 1 {
			return nil, 0, &InputError{Index: i, EventID: e.EventID, Field: "Reference", Msg: "want 1, 0 or −1"}
		}
		for _, m := range e.Majority {
			if m != -1 {
				consensus = true
			}
		}
		if e.Reference == -1 {
			excluded++
			continue
		}
		consensus = true
		if e.Kind == "control" {
			// Background epochs are not events a rule is applied to: counted among the
			// negatives they would inflate every specificity by the weight of all the
			// archive's quiet seconds. They measure what the finder misses instead.
			s.controls = append(s.controls, e)
			continue
		}
		s.src = append(s.src, e)
		s.truth = append(s.truth, e.Reference == 1)
		s.weight = append(s.weight, e.Weight)
		s.stratum = append(s.stratum, e.Stratum)
		s.subject = append(s.subject, e.Subject)
		s.candidate = append(s.candidate, e.Kind != "control")
	}
	if !consensus {
		return nil, 0, &NoDataError{Msg: "no event has a panel consensus or a reference", Err: ErrNoReference}
	}
	if s.n() == 0 && len(s.controls) > 0 {
		return nil, 0, &NoDataError{Msg: "only background controls have a reference: no candidate event to tune on"}
	}
	if s.n() == 0 {
		return nil, 0, &NoDataError{Msg: "no event has a reference standard (all unknown)", Err: ErrNoReference}
	}
	pos := 0
	for _, t := range s.truth {
		if t {
			pos++
		}
	}
	if pos == 0 || pos == s.n() {
		cl := "not IED"
		if pos > 0 {
			cl = "IED"
		}
		return nil, 0, &singleClassError{Reference: o.ReferenceName, Class: cl, N: s.n()}
	}
	return s, excluded, nil
}
