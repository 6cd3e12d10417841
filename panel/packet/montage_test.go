package packet

import "testing"

func TestDefaultMontages1020(t *testing.T) {
	ms := DefaultMontages(Electrodes1020)
	if len(ms) != 4 {
		t.Fatalf("%d montages, want 4", len(ms))
	}
	// The longitudinal bipolar ("double banana") montage of the 10-20 system
	// has 18 channels, Fp1-F7 first and P8-O2 last (ACNS Guideline 3, 2016; from memory).
	lb := ms[2].Derivations
	if len(lb) != 18 || lb[0].Label != "Fp1-F7" || lb[17].Label != "P8-O2" {
		t.Errorf("longitudinal bipolar: %d channels, first %s last %s", len(lb), lb[0].Label, lb[len(lb)-1].Label)
	}
	for _, d := range ms[1].Derivations {
		if len(d.Minus) != len(Electrodes1020) {
			t.Fatalf("common average %s averages %d electrodes, want %d", d.Label, len(d.Minus), len(Electrodes1020))
		}
	}
	// Missing electrodes drop their links, not the montage.
	if got := DefaultMontages([]string{"Fp1", "F7", "Cz"}); len(got) != 3 || len(got[2].Derivations) != 1 {
		t.Errorf("partial set: %d montages", len(got))
	}
}
