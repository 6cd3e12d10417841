package merge

import (
	"strings"
	"testing"

	"github.com/quorate-eeg/quorate/internal/jsonx"
	"github.com/quorate-eeg/quorate/panel/consensus"
)

func TestReadinessWarnings(t *testing.T) {
	st := Status{Owed: 7, Packets: []PacketStatus{{Owes: 0}, {Owes: 5}, {Owes: 2}}}
	evs := []consensus.Event{{Verdict: "no-quorum"}, {Verdict: "no-quorum"}}
	// κ = 0.15 is "slight" on Landis & Koch's (1977) scale (0.00–0.20).
	agr := &consensus.Agreement{Questions: []consensus.QuestionAgreement{{Question: "verdict", Fleiss: consensus.Estimate{Value: jsonx.Float(0.15)}}}}
	r := PanelReadiness(st, evs, agr, 2)
	if r.OutstandingPackets != 2 || !r.NoEventReachedQuorum() {
		t.Errorf("%+v", r)
	}
	w := strings.Join(r.Warnings(), "\n")
	for _, want := range []string{"2 of 3 packets are outstanding (7 items owed)", "2 of 2 events lack the quorum of 2", "slight (Fleiss' kappa 0.15)"} {
		if !strings.Contains(w, want) {
			t.Errorf("warnings %q lack %q", w, want)
		}
	}
	// κ = 0.56 is moderate: no warning about agreement.
	agr.Questions[0].Fleiss.Value = 0.56
	st.Packets, st.Owed = st.Packets[:1], 0
	if w := PanelReadiness(st, []consensus.Event{{Verdict: "present"}}, agr, 2).Warnings(); len(w) != 0 {
		t.Errorf("a complete, moderate panel warns: %v", w)
	}
}
