package consensus

import "testing"

// A strict majority of those who answered decides; ties follow the policy; too few
// answers give no decision (common practice: panels decide by majority).
func TestMajority(t *testing.T) {
	cases := []struct {
		p, a, q int
		tie     TiePolicy
		want    Decision
	}{
		{4, 3, 2, TieAbsent, Present},  // 7 raters, 4 say present
		{3, 4, 2, TieAbsent, Absent},   //
		{3, 3, 2, TieAbsent, Absent},   // even panel, tie → absent
		{3, 3, 2, TiePresent, Present}, // tie → present
		{3, 3, 2, TieUndetermined, Undetermined},
		{2, 0, 3, TieAbsent, NoQuorum}, // quorum of 3 not reached
		{1, 1, 2, TieUndetermined, Undetermined},
		{0, 0, 0, TieAbsent, NoQuorum}, // nobody answered
		{2, 1, 3, TieAbsent, Present},  // quorum exactly met
	}
	for _, c := range cases {
		if got := Majority(c.p, c.a, c.q, c.tie); got != c.want {
			t.Errorf("Majority(%d present, %d absent, quorum %d, tie %d) = %v, want %v", c.p, c.a, c.q, c.tie, got, c.want)
		}
	}
}

func TestParseTiePolicy(t *testing.T) {
	for s, want := range map[string]TiePolicy{"absent": TieAbsent, "present": TiePresent, "undetermined": TieUndetermined} {
		if got, err := ParseTiePolicy(s); err != nil || got != want {
			t.Errorf("ParseTiePolicy(%q) = %v, %v", s, got, err)
		}
	}
	if _, err := ParseTiePolicy("coin"); err == nil {
		t.Error("ParseTiePolicy(coin) accepted")
	}
}
