package packet

import "testing"

func TestDefaultMontages1020(t *testing.T) {
	ms := DefaultMontages(Electrodes1020)
	if len(ms) != 4 {
		t.Fatalf("%d montages, want 4", len(ms))
	}
	// The longitudinal bipolar ("double banana") montage of the 10-20 system
	// has 18 channels, Fp1-F7 first, P8-O2 among them (ACNS Guideline 3, 2016; from memory).
	lb := ms[2].Derivations
	has := false
	for _, d := range lb {
		has = has || d.Label == "P8-O2"
	}
	if len(lb) != 18 || lb[0].Label != "Fp1-F7" || !has {
		t.Errorf("longitudinal bipolar: %d channels, first %s, P8-O2 present %v", len(lb), lb[0].Label, has)
	}
	// The common average takes the 19 scalp electrodes; ear electrodes A1/A2 are not
	// scalp sites and stay out of the average (Offner 1950; common practice).
	for _, d := range ms[1].Derivations {
		if len(d.Minus) != 19 {
			t.Fatalf("common average %s averages %d electrodes, want 19", d.Label, len(d.Minus))
		}
	}
	// Missing electrodes drop their links, not the montage.
	if got := DefaultMontages([]string{"Fp1", "F7", "Cz"}); len(got) != 4 || len(got[2].Derivations) != 1 || got[2].Derivations[0].Label != "Fp1-F7" {
		t.Errorf("partial set: %d montages", len(got))
	}
}

func TestFirstMontage(t *testing.T) {
	ms := DefaultMontages(Electrodes1020)
	// study.yaml spells montages in lower case with hyphens.
	got := FirstMontage(ms, "longitudinal-bipolar")
	if got[0].Name != "Longitudinal bipolar" || got[1].Name != "Referential" || got[3].Name != "Transverse bipolar" || len(got) != 4 {
		t.Errorf("order %v", []string{got[0].Name, got[1].Name, got[2].Name, got[3].Name})
	}
	if got := FirstMontage(ms, "no-such"); got[0].Name != "Referential" {
		t.Errorf("unknown name reordered: %s first", got[0].Name)
	}
}
