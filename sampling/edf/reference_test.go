package edf

import (
	"strings"
	"testing"
)

// TestCommonReference checks which two-part labels are read as
// electrodes recorded against a common reference: a set sharing Cz, or a
// reference the amplifier names, is (a referential recording; common
// practice), a bipolar chain is not
// (its second electrodes differ), nor are two unrelated derivations
// (too few), and a derivation of an electrode that is also recorded on its
// own stays a derivation.
func TestCommonReference(t *testing.T) {
	for _, c := range []struct {
		name   string
		labels []string
		want   []string // Name of each signal that ends as EEG, in order
		ref    string   // the reference a warning names; "" for no warning
	}{
		{"against Cz", []string{"EEG Fp1-Cz", "EEG F3-Cz", "C3-Cz", "EEG O1-Cz", "ECG"}, []string{"Fp1", "F3", "C3", "O1"}, "Cz"},
		{"old temporal names", []string{"T3-Cz", "T4-Cz", "T5-Cz", "F7-Cz"}, []string{"T7", "T8", "P7", "F7"}, "Cz"},
		{"a reference the amplifier names", []string{"EEG Fp1-G19", "EEG F3-G19", "EEG C3-g19", "EEG O1-G19"}, []string{"Fp1", "F3", "C3", "O1"}, "G19"},
		{"bipolar chain", []string{"Fp1-F7", "F7-T7", "T7-P7", "P7-O1", "Fp2-F8", "F8-T8"}, nil, ""},
		{"two derivations", []string{"EEG Fpz-Cz", "EEG Pz-Oz"}, nil, ""},
		{"too few against one", []string{"Fp1-Cz", "F3-Cz", "Fp2"}, []string{"Fp2"}, ""},
		{"mostly against Cz, one bipolar", []string{"Fp1-Cz", "F3-Cz", "C3-Cz", "P3-Cz", "O1-Cz", "Fp1-F7"}, []string{"Fp1", "F3", "C3", "P3", "O1"}, "Cz"},
		{"already recorded", []string{"Fp1", "Fp1-Cz", "F3-Cz", "C3-Cz"}, []string{"Fp1", "F3", "C3"}, "Cz"},
		{"not electrodes", []string{"Resp-Flow", "Leg-L", "Leg-R", "Leg-X"}, nil, ""},
	} {
		h := &Header{}
		for _, l := range c.labels {
			n, k := NormalizeLabel(l)
			h.Signals = append(h.Signals, Signal{Label: l, Name: n, Kind: k})
		}
		commonReference(h)
		var got []string
		for _, s := range h.Signals {
			if s.Kind == EEG {
				got = append(got, s.Name)
			}
		}
		if strings.Join(got, ",") != strings.Join(c.want, ",") {
			t.Errorf("%s: EEG %v, want %v", c.name, got, c.want)
		}
		if warned := len(h.Warnings) > 0; warned != (c.ref != "") {
			t.Errorf("%s: warnings %q", c.name, h.Warnings)
		} else if warned && !strings.Contains(h.Warnings[0], "against "+c.ref) {
			t.Errorf("%s: warning %q does not name the reference %s", c.name, h.Warnings[0], c.ref)
		}
	}
}
