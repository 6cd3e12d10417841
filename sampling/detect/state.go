package detect

import (
	"math"
	"regexp"
	"sort"
	"strings"

	"github.com/quorate-eeg/quorate/sampling/edf"
)

// Vigilance states a recording's annotations may give.
const (
	StateUnknown = "unknown"
	StateAwake   = "awake"
	StateDrowsy  = "drowsy" // also N1
	StateN2      = "n2"
	StateN3      = "n3"
	StateREM     = "rem"
)

// stagePatterns recognise the usual wordings of sleep-stage annotations (the stages of
// the AASM scoring manual, Berry et al. 2017: W, N1, N2, N3, R; and the older
// Rechtschaffen & Kales 1968 stages 1–4 and REM), with or without a "sleep stage" or
// "stage" in front ("Sleep stage N2", "Stage 2", "sleep_stage_2", "stage: N2") and with
// the NREM stages also written "NREM 2" or "N 2". The first match wins.
var stagePatterns = []struct {
	re    *regexp.Regexp
	state string
}{
	{stagePattern(`w|wake|awake|wakefulness`), StateAwake},
	{stagePattern(`n\s?1|nrem\s?1|s1|1|drowsy|drowsiness`), StateDrowsy},
	{stagePattern(`n\s?2|nrem\s?2|s2|2`), StateN2},
	{stagePattern(`n\s?3|nrem\s?[34]|s3|s4|3|4`), StateN3},
	{stagePattern(`r|rem`), StateREM},
}

// stagePattern matches one stage's names, whole and in any case, after an optional
// "sleep stage" or "stage" (spaces, underscores or a colon between the words).
func stagePattern(names string) *regexp.Regexp {
	return regexp.MustCompile(`(?i)^\s*((sleep[\s_]*)?stage[\s_:]*)?(` + names + `)\s*$`)
}

// StageOf returns the vigilance state an annotation text names, or "" when it names
// none.
func StageOf(text string) string {
	t := strings.TrimSpace(text)
	for _, p := range stagePatterns {
		if p.re.MatchString(t) {
			return p.state
		}
	}
	return ""
}

// StateSpan is a stretch of one vigilance state.
type StateSpan struct {
	Start, End float64 // seconds from the recording start; End is +Inf for "until the next"
	State      string
}

// States turns sleep-stage annotations into spans. An annotation with a duration covers
// [onset, onset+duration); one without covers until the next stage annotation.
func States(anns []edf.Annotation) []StateSpan {
	var spans []StateSpan
	for _, a := range anns {
		if s := StageOf(a.Text); s != "" {
			end := math.Inf(1)
			if a.HasDuration && a.Duration > 0 {
				end = a.Onset + a.Duration
			}
			spans = append(spans, StateSpan{a.Onset, end, s})
		}
	}
	sort.SliceStable(spans, func(i, j int) bool { return spans[i].Start < spans[j].Start })
	for i := range spans {
		if i+1 < len(spans) && spans[i].End > spans[i+1].Start {
			spans[i].End = spans[i+1].Start
		}
	}
	return spans
}

// StateAt returns the state at time t, or StateUnknown.
func StateAt(spans []StateSpan, t float64) string {
	if sp, ok := spanAt(spans, t); ok {
		return sp.State
	}
	return StateUnknown
}

// spanAt returns the span holding time t, if any.
func spanAt(spans []StateSpan, t float64) (StateSpan, bool) {
	i := sort.Search(len(spans), func(i int) bool { return spans[i].Start > t }) - 1
	if i >= 0 && t < spans[i].End {
		return spans[i], true
	}
	return StateSpan{}, false
}

// recordingStates reads the vigilance states an EDF+ recording's annotations give (none
// for plain EDF and BDF). Only the annotation signal is read.
func recordingStates(r *edf.Reader) ([]StateSpan, error) {
	if !r.Header().Format.IsPlus() {
		return nil, nil
	}
	var anns []edf.Annotation
	for a, err := range r.AllAnnotations() {
		if err != nil {
			return nil, err
		}
		if StageOf(a.Text) != "" {
			anns = append(anns, a)
		}
	}
	return States(anns), nil
}
