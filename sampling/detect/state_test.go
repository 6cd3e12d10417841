package detect

import (
	"testing"

	"github.com/quorate-eeg/quorate/sampling/edf"
)

// Stage names of the AASM manual (Berry et al. 2017) and of Rechtschaffen & Kales (1968),
// as annotation texts commonly carry them.
func TestStageOf(t *testing.T) {
	cases := map[string]string{
		"Sleep stage W": StateAwake, "W": StateAwake, "awake": StateAwake,
		"Sleep stage N1": StateDrowsy, "Sleep stage 1": StateDrowsy, "drowsy": StateDrowsy,
		"Sleep stage N2": StateN2, "Sleep stage 3": StateN3, "Sleep stage 4": StateN3, "N3": StateN3,
		"Sleep stage R": StateREM, "REM": StateREM,
		"Stage 2": StateN2, "stage N2": StateN2, "sleep_stage_2": StateN2, "Stage: N2": StateN2, "NREM 2": StateN2,
		"NREM2": StateN2, "N 2": StateN2, "NREM 4": StateN3, "Stage W": StateAwake, "Stage R": StateREM,
		"spike": "", "Wicket": "", "eyes closed": "", "Sleep stage ?": "", "stage": "", "N22": "", "Stage 5": "",
	}
	for text, want := range cases {
		if got := StageOf(text); got != want {
			t.Errorf("StageOf(%q) = %q, want %q", text, got, want)
		}
	}
}

func TestStatesAndStateAt(t *testing.T) {
	anns := []edf.Annotation{
		{Onset: 0, Text: "Sleep stage W"},
		{Onset: 30, Duration: 30, HasDuration: true, Text: "Sleep stage N1"},
		{Onset: 12, Text: "spike"},
		{Onset: 90, Text: "Sleep stage N2"},
	}
	spans := States(anns)
	cases := []struct {
		t    float64
		want string
	}{{-1, StateUnknown}, {0, StateAwake}, {29.9, StateAwake}, {30, StateDrowsy}, {59.9, StateDrowsy},
		{60, StateUnknown}, {90, StateN2}, {1e6, StateN2}}
	for _, c := range cases {
		if got := StateAt(spans, c.t); got != c.want {
			t.Errorf("StateAt(%v) = %q, want %q", c.t, got, c.want)
		}
	}
}
