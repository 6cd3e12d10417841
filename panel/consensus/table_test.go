package consensus

import "testing"

func b(v bool) *bool { return &v }

func TestBuildCountsVotesAndSkipsDuplicates(t *testing.T) {
	yes, no := b(true), b(false)
	rs := []Rating{
		{EventID: "ev-1", Rater: "r1", C1: yes, C2: yes, C3: no, C4: yes, C5: yes, C6: yes, Epileptiform: yes},
		{EventID: "ev-1", Rater: "r2", C1: yes, C2: no, C3: no, C4: yes, C5: no, C6: yes, Epileptiform: yes},
		{EventID: "ev-1", Rater: "r3", C1: no, C2: no, C3: yes, C4: yes, C5: no, C6: yes, Epileptiform: no},
		// r3 again on a hidden duplicate, disagreeing with themself: must not count.
		{EventID: "ev-1", Rater: "r3", Duplicate: true, C1: yes, C2: yes, C3: yes, C4: yes, C5: yes, C6: yes, Epileptiform: yes},
		{EventID: "ev-2", Rater: "r1", C1: yes, Epileptiform: no},
		{EventID: "ev-2", Rater: "r2", C1: no, Epileptiform: yes},
	}
	ev := Build(rs, 2, TieUndetermined)
	if len(ev) != 2 {
		t.Fatalf("%d events, want 2", len(ev))
	}
	e := ev[0]
	if e.EventID != "ev-1" || e.Raters != 3 {
		t.Fatalf("event %s raters %d", e.EventID, e.Raters)
	}
	// Hand count: c1 2-1 present, c2 1-2 absent, c3 1-2 absent, c4 3-0, c5 1-2, c6 3-0.
	want := [6]string{"present", "absent", "absent", "present", "absent", "present"}
	if e.Decisions() != want {
		t.Errorf("decisions %v, want %v", e.Decisions(), want)
	}
	if e.C1Present != 2 || e.C1Absent != 1 || e.CriteriaPresent != 3 || e.Verdict != "epileptiform" || e.VerdictYes != 2 {
		t.Errorf("tallies %+v", e)
	}
	e2 := ev[1]
	if e2.C1 != "undetermined" || e2.Verdict != "undetermined" || e2.C2 != "no-quorum" {
		t.Errorf("ev-2: c1 %s verdict %s c2 %s, want undetermined, undetermined, no-quorum", e2.C1, e2.Verdict, e2.C2)
	}
}
