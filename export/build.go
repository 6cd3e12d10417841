package export

import (
	"fmt"
	"math"
	"sort"
	"time"

	"github.com/quorate-eeg/quorate/panel/consensus"
	"github.com/quorate-eeg/quorate/sampling/candidate"
)

// dateShiftError reports a subject without a date offset when dates are to be shifted.
type dateShiftError struct{ SubjectKey string }

func (e *dateShiftError) Error() string {
	return fmt.Sprintf("export: shifting dates: no offset for subject %s", e.SubjectKey)
}

// Unwrap gives ErrReference, for errors.Is.
func (e *dateShiftError) Unwrap() error { return ErrReference }

func ptr[T any](v T) *T { return &v }

// fptr maps NaN to null: NaN marks a value that was not measured.
func fptr(v float64) *float64 {
	if math.IsNaN(v) {
		return nil
	}
	return &v
}

func sptr(s string) *string {
	if s == "" {
		return nil
	}
	return &s
}

// decision maps a majority string to a nullable boolean: only "present" and "absent"
// decide; "undetermined" and "no-quorum" are missing.
func decision(s string) *bool {
	switch s {
	case consensus.Present.String():
		return ptr(true)
	case consensus.Absent.String():
		return ptr(false)
	}
	return nil
}

// verdict maps the consensus verdict column to the export's verdict word (the returns'
// words: epileptiform, not-epileptiform; undetermined, no-quorum as written) and the
// panel reference: epileptiform → true, not-epileptiform → false, otherwise null.
// Consensus tables of an older release held present/absent there; they export in the
// same words. An unknown word is kept as it is, with a null reference.
func verdict(s string) (*string, *bool) {
	d, ok := consensus.ParseVerdict(s)
	if !ok {
		return sptr(s), nil
	}
	return sptr(d.VerdictString()), decision(d.String())
}

// buildEvents joins the draw with the candidates, the consensus, the external
// reference and the operating point: one row per drawn unit, ordered by subject,
// recording, onset and id.
func buildEvents(o *Options) ([]EventRow, error) {
	cand := make(map[string]*candidate.Row, len(o.Candidates))
	for i := range o.Candidates {
		cand[o.Candidates[i].EventID] = &o.Candidates[i]
	}
	cons := make(map[string]*consensus.Event, len(o.Consensus))
	for i := range o.Consensus {
		cons[o.Consensus[i].EventID] = &o.Consensus[i]
	}
	recs := make(map[string]bool, len(o.Recordings))
	for _, r := range o.Recordings {
		recs[r.RecordingID] = true
	}
	out := make([]EventRow, len(o.Draw))
	for i, d := range o.Draw {
		e := EventRow{EventID: d.EventID, Kind: d.Kind, Stratum: d.Stratum, Pi: d.Pi, Weight: d.Weight,
			Phase: int32(d.Phase), RecordingID: d.RecordingID, SubjectKey: d.SubjectKey, OnsetS: d.OnsetS}
		if c := cand[d.EventID]; c != nil {
			fillCandidate(&e, c)
		} else if d.Kind != "control" {
			return nil, &referenceError{EventID: d.EventID, Field: "candidate", Value: d.EventID}
		}
		if e.RecordingID == "" || !recs[e.RecordingID] {
			return nil, &referenceError{EventID: d.EventID, Field: "recording_id", Value: e.RecordingID}
		}
		if e.Channels == nil {
			e.Channels = []string{} // a control involves no channel in particular
		}
		if c := cons[d.EventID]; c != nil {
			fillConsensus(&e, c)
		}
		if x, ok := o.External[d.EventID]; ok && x != nil {
			e.RefExternal = ptr(*x)
		}
		if o.OperatingPoint != nil {
			if v, ok := o.OperatingPoint.Decision[d.EventID]; ok {
				e.OPDecision = ptr(v)
			}
		}
		out[i] = e
	}
	sort.Slice(out, func(i, j int) bool {
		a, b := &out[i], &out[j]
		if a.SubjectKey != b.SubjectKey {
			return a.SubjectKey < b.SubjectKey
		}
		if a.RecordingID != b.RecordingID {
			return a.RecordingID < b.RecordingID
		}
		if a.OnsetS != b.OnsetS {
			return a.OnsetS < b.OnsetS
		}
		return a.EventID < b.EventID
	})
	return out, nil
}

func fillCandidate(e *EventRow, c *candidate.Row) {
	e.RecordingID, e.SubjectKey, e.OnsetS = c.RecordingID, c.SubjectKey, c.OnsetS
	e.Source, e.Region, e.Lobe, e.Side = sptr(c.Source), sptr(c.Region), sptr(c.Lobe), sptr(c.Side)
	e.PeakChannel, e.Polarity, e.State = sptr(c.PeakChannel), sptr(c.Polarity), sptr(c.State)
	e.Channels = c.Channels
	e.AmplitudeUV = fptr(c.AmplitudeUV)
	e.C1DurationMS, e.C1Sharpness, e.C1Phases = fptr(c.C1DurationMS), fptr(c.C1Sharpness), ptr(c.C1Phases)
	e.C2DurationLogRatio, e.C2BackgroundMS = fptr(c.C2DurationLogRatio), fptr(c.C2BackgroundMS)
	e.C3Asymmetry, e.C3RiseMS, e.C3FallMS = fptr(c.C3Asymmetry), fptr(c.C3RiseMS), fptr(c.C3FallMS)
	e.C4SlowWaveRatio, e.C5Disruption = fptr(c.C4SlowWaveRatio), fptr(c.C5Disruption)
	e.C6DipoleGOF, e.C6DipoleX, e.C6DipoleY, e.C6DipoleZ = fptr(c.C6DipoleGOF), fptr(c.C6DipoleX), fptr(c.C6DipoleY), fptr(c.C6DipoleZ)
	e.C6Orientation = sptr(c.C6Orientation)
	if !math.IsNaN(c.C6DipoleGOF) {
		e.C6FieldExtent = ptr(c.C6FieldExtent)
	}
	e.C1Met, e.C2Met, e.C3Met = ptr(c.C1Met), ptr(c.C2Met), ptr(c.C3Met)
	e.C4Met, e.C5Met, e.C6Met = ptr(c.C4Met), ptr(c.C5Met), ptr(c.C6Met)
	e.AutoCount, e.Score, e.Imported = ptr(c.AutoCount), fptr(c.Score), fptr(c.Imported)
}

func fillConsensus(e *EventRow, c *consensus.Event) {
	e.Raters = ptr(c.Raters)
	e.C1Present, e.C1Absent, e.C1Majority = ptr(c.C1Present), ptr(c.C1Absent), sptr(c.C1)
	e.C2Present, e.C2Absent, e.C2Majority = ptr(c.C2Present), ptr(c.C2Absent), sptr(c.C2)
	e.C3Present, e.C3Absent, e.C3Majority = ptr(c.C3Present), ptr(c.C3Absent), sptr(c.C3)
	e.C4Present, e.C4Absent, e.C4Majority = ptr(c.C4Present), ptr(c.C4Absent), sptr(c.C4)
	e.C5Present, e.C5Absent, e.C5Majority = ptr(c.C5Present), ptr(c.C5Absent), sptr(c.C5)
	e.C6Present, e.C6Absent, e.C6Majority = ptr(c.C6Present), ptr(c.C6Absent), sptr(c.C6)
	e.CriteriaPresent = ptr(c.CriteriaPresent)
	e.VerdictYes, e.VerdictNo = ptr(c.VerdictYes), ptr(c.VerdictNo)
	e.Verdict, e.RefPanel = verdict(c.Verdict)
	e.DSProbability = fptr(c.DSProbability)
	if e.DSProbability != nil {
		// The Dawid–Skene label is the class of highest posterior probability (Dawid &
		// Skene 1979); with two classes that is P(IED) ≥ 0.5, ties going to IED.
		e.RefDS = ptr(*e.DSProbability >= 0.5)
	}
}

// buildRatings copies the ratings in long form, ordered by event, rater, packet and
// item. A confidence of 0 (not given) becomes null; comments are kept only on request.
func buildRatings(o *Options) []RatingRow {
	out := make([]RatingRow, len(o.Ratings))
	for i, r := range o.Ratings {
		row := RatingRow{EventID: r.EventID, Rater: r.Rater, Packet: r.Packet, ItemCode: r.ItemCode,
			C1: r.C1, C2: r.C2, C3: r.C3, C4: r.C4, C5: r.C5, C6: r.C6, Epileptiform: r.Epileptiform,
			Duplicate: r.Duplicate}
		if r.Confidence > 0 {
			row.Confidence = ptr(r.Confidence)
		}
		if o.Comments {
			row.Comment = sptr(r.Comment)
		}
		out[i] = row
	}
	sort.SliceStable(out, func(i, j int) bool {
		a, b := &out[i], &out[j]
		if a.EventID != b.EventID {
			return a.EventID < b.EventID
		}
		if a.Rater != b.Rater {
			return a.Rater < b.Rater
		}
		if a.Packet != b.Packet {
			return a.Packet < b.Packet
		}
		if a.ItemCode != b.ItemCode {
			return a.ItemCode < b.ItemCode
		}
		return !a.Duplicate && b.Duplicate
	})
	return out
}

// buildRecordings de-identifies the index rows. The calendar date of a recording is a
// date of care, an identifier under the HIPAA Safe Harbor rule (45 CFR
// 164.514(b)(2)(i)(C), "all elements of dates (except year)"): it is written only
// shifted by the subject's offset, and otherwise reduced to the year. The time of day
// is kept either way (whole-day shifts leave it unchanged and vigilance depends on it).
func buildRecordings(o *Options) ([]RecordingRow, error) {
	out := make([]RecordingRow, len(o.Recordings))
	for i, r := range o.Recordings {
		st := r.StartTime.UTC()
		midnight := time.Date(st.Year(), st.Month(), st.Day(), 0, 0, 0, 0, time.UTC)
		row := RecordingRow{RecordingID: r.RecordingID, SubjectKey: r.SubjectKey, Format: r.Format,
			StartTimeOfDayS: st.Sub(midnight).Seconds(), DurationS: r.DurationS, RecordCount: r.RecordCount,
			RecordDurationS: r.RecordDurationS, EEGChannelCount: int32(len(r.EEGChannels)),
			EEGChannels: r.EEGChannels, SampleRatesHz: r.SampleRatesHz, AnnotationCount: r.AnnotationCount,
			Discontinuities: r.Discontinuities}
		if o.ShiftDates {
			days, ok := o.DateShiftDays[r.SubjectKey]
			if !ok {
				return nil, &dateShiftError{SubjectKey: r.SubjectKey}
			}
			row.StartDate, row.DateShifted = ptr(midnight.AddDate(0, 0, days)), true
		} else {
			row.StartYear = ptr(int32(st.Year()))
		}
		if row.EEGChannels == nil {
			row.EEGChannels = []string{}
		}
		if row.SampleRatesHz == nil {
			row.SampleRatesHz = []float64{}
		}
		out[i] = row
	}
	sort.Slice(out, func(i, j int) bool { return out[i].RecordingID < out[j].RecordingID })
	return out, nil
}
