package tuning

import (
	"math"
	"strings"

	"github.com/quorate-eeg/quorate/panel/consensus"
	"github.com/quorate-eeg/quorate/sampling/candidate"
	"github.com/quorate-eeg/quorate/sampling/draw"
)

// Reference standard kinds for Join.
const (
	ReferencePanel      = "panel"       // the panel's majority verdict
	ReferenceDawidSkene = "dawid-skene" // Dawid–Skene probability ≥ 0.5
	ReferenceExternal   = "external"    // a table keyed by event (ReadExternalReference)
)

// Join builds the tuner's events from the draw (design, subject, stratum),
// the consensus (majority per criterion and the reference) and the candidate
// table (features, automatic decisions, detector score). Drawn events not
// rated yet are left out; a drawn event with no candidate row (a background
// control) has NaN features and score. An imported detector's score is its
// own (candidate.Row.Imported). With kind ReferenceExternal, external gives
// the reference by event ID and an event it lacks has reference −1.
func Join(rows []draw.Row, cons []consensus.Event, cands []candidate.Row, kind string, external map[string]int8) []Event {
	byEvent := make(map[string]*consensus.Event, len(cons))
	for i := range cons {
		byEvent[cons[i].EventID] = &cons[i]
	}
	byCand := make(map[string]*candidate.Row, len(cands))
	for i := range cands {
		byCand[cands[i].EventID] = &cands[i]
	}
	var events []Event
	for _, r := range rows {
		ce := byEvent[r.EventID]
		if ce == nil {
			continue // not rated (yet)
		}
		e := Event{EventID: r.EventID, Subject: r.SubjectKey, Recording: r.RecordingID, Stratum: r.Stratum,
			Kind: r.Kind, Weight: r.Weight, Score: math.NaN()}
		for i := range e.Features {
			e.Features[i] = math.NaN()
		}
		if c := byCand[r.EventID]; c != nil {
			e.Features, e.AutoMet, e.Score = c.Features(), c.Met(), c.Score
			if strings.HasPrefix(c.Source, "import:") {
				e.Score = c.Imported
			}
		}
		for q, d := range ce.Decisions() {
			e.Majority[q] = decisionCode(d)
		}
		switch kind {
		case ReferenceExternal:
			v, ok := external[r.EventID]
			e.Reference = -1
			if ok {
				e.Reference = v
			}
		case ReferenceDawidSkene:
			e.Reference = ReferenceFromDS(ce.DSProbability)
		default:
			e.Reference = ReferenceFromPanel(ce.Verdict)
		}
		events = append(events, e)
	}
	return events
}

// decisionCode turns a consensus decision into Event.Majority's code.
func decisionCode(d string) int8 {
	switch d {
	case "present":
		return 1
	case "absent":
		return 0
	}
	return -1
}
