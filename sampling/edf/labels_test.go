package edf

import "testing"

// TestNormalizeLabel checks canonical 10-10 spelling (ACNS Guideline 2,
// Acharya et al. 2016, Figure 1), the renamed temporal electrodes
// T3/T4/T5/T6 → T7/T8/P7/P8 (same guideline), the EDF+ "type space
// name" convention (Kemp & Olivan 2003, section 2.1.3.1) and the
// classification of non-EEG channels (common practice).
func TestNormalizeLabel(t *testing.T) {
	for _, c := range []struct {
		raw  string
		name string
		kind ChannelKind
	}{
		{"EEG Fp1-REF", "Fp1", EEG},
		{"FP1", "Fp1", EEG},
		{"fp2-Ref", "Fp2", EEG},
		{"EEG CZ-LE", "Cz", EEG},
		{" Fz ", "Fz", EEG},
		{"ft9", "FT9", EEG},
		{"AF7-AVG", "AF7", EEG},
		{"C3-A2", "C3", EEG},
		{"Pz-M1", "Pz", EEG},
		{"T3", "T7", EEG},
		{"T4-REF", "T8", EEG},
		{"EEG T5-REF", "P7", EEG},
		{"T6", "P8", EEG},
		{"POZ", "POz", EEG},
		{"Fp1-F7", "Fp1-F7", Other}, // bipolar derivation, not one site
		{"EEG Fpz-Cz", "Fpz-Cz", Other},
		{"ECG", "ECG", ECG},
		{"EKG1-REF", "EKG1", ECG},
		{"ECG LA-RA", "LA-RA", ECG},
		{"LOC-A2", "LOC", EOG},
		{"ROC", "ROC", EOG},
		{"EOG E1", "E1", EOG},
		{"EMG Chin", "Chin", EMG},
		{"CHIN1", "CHIN1", EMG},
		{"Photic-REF", "Photic", Photic},
		{"PHOTIC", "PHOTIC", Photic},
		{"EDF Annotations", "EDF Annotations", AnnotationSignal},
		{"DC01", "DC01", Other},
		{"T11", "T11", Other}, // not a 10-10 site
		{"ECG Cz", "Cz", ECG}, // type word wins: never reported as EEG
	} {
		name, kind := NormalizeLabel(c.raw)
		if name != c.name || kind != c.kind {
			t.Errorf("NormalizeLabel(%q) = %q, %v; want %q, %v", c.raw, name, kind, c.name, c.kind)
		}
	}
}
