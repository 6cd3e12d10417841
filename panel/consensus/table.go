package consensus

import (
	"math"
	"sort"
)

// Rating is one rater's answers to one item: a row of consensus/ratings.parquet. A nil
// answer is a question the rater left blank.
type Rating struct {
	EventID      string `parquet:"event_id"`
	Rater        string `parquet:"rater,dict"`
	Packet       string `parquet:"packet,dict"`
	ItemCode     string `parquet:"item_code"`
	C1           *bool  `parquet:"c1,optional"`
	C2           *bool  `parquet:"c2,optional"`
	C3           *bool  `parquet:"c3,optional"`
	C4           *bool  `parquet:"c4,optional"`
	C5           *bool  `parquet:"c5,optional"`
	C6           *bool  `parquet:"c6,optional"`
	Epileptiform *bool  `parquet:"epileptiform,optional"`
	Confidence   int32  `parquet:"confidence"` // 1…5, 0 when not given
	Comment      string `parquet:"comment"`
	Duplicate    bool   `parquet:"duplicate"` // the second showing of a hidden duplicate
	ReturnSHA256 string `parquet:"return_sha256,dict"`
}

// Criteria returns the six answers in order.
func (r *Rating) Criteria() [6]*bool { return [6]*bool{r.C1, r.C2, r.C3, r.C4, r.C5, r.C6} }

// Event is the panel's decision on one event: a row of consensus/consensus.parquet.
type Event struct {
	EventID         string  `parquet:"event_id"`
	Raters          int32   `parquet:"raters"` // raters who returned any answer on it
	C1Present       int32   `parquet:"c1_present_votes"`
	C1Absent        int32   `parquet:"c1_absent_votes"`
	C1              string  `parquet:"c1_majority,dict"`
	C2Present       int32   `parquet:"c2_present_votes"`
	C2Absent        int32   `parquet:"c2_absent_votes"`
	C2              string  `parquet:"c2_majority,dict"`
	C3Present       int32   `parquet:"c3_present_votes"`
	C3Absent        int32   `parquet:"c3_absent_votes"`
	C3              string  `parquet:"c3_majority,dict"`
	C4Present       int32   `parquet:"c4_present_votes"`
	C4Absent        int32   `parquet:"c4_absent_votes"`
	C4              string  `parquet:"c4_majority,dict"`
	C5Present       int32   `parquet:"c5_present_votes"`
	C5Absent        int32   `parquet:"c5_absent_votes"`
	C5              string  `parquet:"c5_majority,dict"`
	C6Present       int32   `parquet:"c6_present_votes"`
	C6Absent        int32   `parquet:"c6_absent_votes"`
	C6              string  `parquet:"c6_majority,dict"`
	CriteriaPresent int32   `parquet:"criteria_present"` // criteria whose majority is present
	VerdictYes      int32   `parquet:"epileptiform_votes"`
	VerdictNo       int32   `parquet:"not_epileptiform_votes"`
	Verdict         string  `parquet:"verdict,dict"`   // epileptiform, not-epileptiform, undetermined or no-quorum (VerdictString)
	DSProbability   float64 `parquet:"ds_probability"` // Dawid–Skene P(IED), NaN if not fitted
}

// Decisions returns the six criterion decisions parsed back from their strings.
func (e *Event) Decisions() [6]string { return [6]string{e.C1, e.C2, e.C3, e.C4, e.C5, e.C6} }

// Build computes one Event per event id from the ratings. The second showing of a hidden
// duplicate is left out: it measures a rater against themself, and counting it would give
// that rater two votes.
func Build(ratings []Rating, quorum int, tie TiePolicy) []Event {
	type tally struct {
		present, absent [7]int // 0…5 criteria, 6 the verdict
		raters          map[string]bool
	}
	by := map[string]*tally{}
	for i := range ratings {
		r := &ratings[i]
		if r.Duplicate {
			continue
		}
		t := by[r.EventID]
		if t == nil {
			t = &tally{raters: map[string]bool{}}
			by[r.EventID] = t
		}
		crit := r.Criteria()
		answers := append(crit[:], r.Epileptiform)
		answered := false
		for q, a := range answers {
			if a == nil {
				continue
			}
			answered = true
			if *a {
				t.present[q]++
			} else {
				t.absent[q]++
			}
		}
		if answered {
			t.raters[r.Rater] = true
		}
	}
	ids := make([]string, 0, len(by))
	for id := range by {
		ids = append(ids, id)
	}
	sort.Strings(ids)
	out := make([]Event, len(ids))
	for i, id := range ids {
		t := by[id]
		e := Event{EventID: id, Raters: int32(len(t.raters))}
		var dec [7]Decision
		for q := range 7 {
			dec[q] = Majority(t.present[q], t.absent[q], quorum, tie)
		}
		votes := [6]struct {
			p, a *int32
			d    *string
		}{
			{&e.C1Present, &e.C1Absent, &e.C1}, {&e.C2Present, &e.C2Absent, &e.C2},
			{&e.C3Present, &e.C3Absent, &e.C3}, {&e.C4Present, &e.C4Absent, &e.C4},
			{&e.C5Present, &e.C5Absent, &e.C5}, {&e.C6Present, &e.C6Absent, &e.C6},
		}
		for c, v := range votes {
			*v.p, *v.a, *v.d = int32(t.present[c]), int32(t.absent[c]), dec[c].String()
			if dec[c] == Present {
				e.CriteriaPresent++
			}
		}
		e.VerdictYes, e.VerdictNo, e.Verdict = int32(t.present[6]), int32(t.absent[6]), dec[6].VerdictString()
		e.DSProbability = math.NaN()
		out[i] = e
	}
	return out
}
