package consensus

import "testing"

// A "cannot judge" answer (nil) is an abstention: with three raters, a quorum
// of three and one abstaining on c1, c1 has no decision while c2, answered by
// all three, has one (panels decide by majority of those who answered —
// common practice).
func TestCannotJudgeAbstains(t *testing.T) {
	yes, no := true, false
	r := func(rater string, c1 *bool) Rating {
		return Rating{EventID: "ev", Rater: rater, C1: c1, C2: &yes, C3: &no, C4: &no, C5: &no, C6: &no, Epileptiform: &yes}
	}
	evs := Build([]Rating{r("a", &yes), r("b", &yes), r("c", nil)}, 3, TieAbsent)
	e := evs[0]
	if e.C1Present != 2 || e.C1Absent != 0 || e.C1 != NoQuorum.String() {
		t.Errorf("c1 with one abstention: %d/%d %s, want 2/0 no-quorum", e.C1Present, e.C1Absent, e.C1)
	}
	if e.C2 != Present.String() || e.Raters != 3 {
		t.Errorf("c2 %s, raters %d", e.C2, e.Raters)
	}
	// With a quorum of two the two answers decide.
	if e := Build([]Rating{r("a", &yes), r("b", &yes), r("c", nil)}, 2, TieAbsent)[0]; e.C1 != Present.String() {
		t.Errorf("quorum 2: c1 %s", e.C1)
	}
}
