package tuning

import (
	"math"
	"testing"

	"github.com/quorate-eeg/quorate/panel/consensus"
	"github.com/quorate-eeg/quorate/sampling/candidate"
	"github.com/quorate-eeg/quorate/sampling/draw"
)

// Join keeps the drawn, rated events in draw order with their design and the reference
// the study chose; an unrated draw is left out and a control has no features.
func TestJoin(t *testing.T) {
	rows := []draw.Row{
		{EventID: "a", Kind: "candidate", Stratum: "hi", SubjectKey: "s1", RecordingID: "r1", Weight: 1.5},
		{EventID: "b", Kind: "candidate", Stratum: "lo", SubjectKey: "s2", RecordingID: "r2", Weight: 4},
		{EventID: "c", Kind: "control", Stratum: "control", SubjectKey: "s2", RecordingID: "r2", Weight: 90},
	}
	cons := []consensus.Event{
		{EventID: "c", C1: "absent", C2: "absent", C3: "absent", C4: "absent", C5: "absent", C6: "tie", Verdict: "absent", DSProbability: 0.7},
		{EventID: "a", C1: "present", C2: "absent", C3: "present", C4: "present", C5: "no quorum", C6: "present", Verdict: "present", DSProbability: 0.2},
	}
	cands := []candidate.Row{
		{EventID: "a", Source: "import:other", C1Sharpness: 2.5, Score: 0.9, Imported: 7},
		{EventID: "b", Source: "builtin", C1Sharpness: 1, Score: 0.1, Imported: math.NaN()},
	}
	ev := Join(rows, cons, cands, ReferencePanel, nil)
	if len(ev) != 2 || ev[0].EventID != "a" || ev[1].EventID != "c" {
		t.Fatalf("joined %+v, want a then c (b is not rated)", ev)
	}
	a, c := ev[0], ev[1]
	if a.Subject != "s1" || a.Stratum != "hi" || a.Weight != 1.5 || a.Features[0] != 2.5 || a.Score != 7 || a.Reference != 1 {
		t.Errorf("event a: %+v", a)
	}
	if a.Majority != [6]int8{1, 0, 1, 1, -1, 1} {
		t.Errorf("majority of a %v, want present→1, absent→0, no quorum→−1", a.Majority)
	}
	if c.Kind != "control" || !math.IsNaN(c.Features[0]) || !math.IsNaN(c.Score) || c.Reference != 0 {
		t.Errorf("control c: %+v", c)
	}
	if ds := Join(rows, cons, cands, ReferenceDawidSkene, nil); ds[0].Reference != 0 || ds[1].Reference != 1 {
		t.Errorf("Dawid–Skene references %d, %d; want 0 (p 0.2), 1 (p 0.7)", ds[0].Reference, ds[1].Reference)
	}
	if x := Join(rows, cons, cands, ReferenceExternal, map[string]int8{"c": 1}); x[0].Reference != -1 || x[1].Reference != 1 {
		t.Errorf("external references %d, %d; want −1 (absent from the table), 1", x[0].Reference, x[1].Reference)
	}
}
