package edf

import (
	"strconv"
	"strings"
)

// ChannelKind classifies a signal by what it records.
type ChannelKind int

const (
	Other            ChannelKind = iota // anything not recognised, including bipolar derivations
	EEG                                 // one scalp electrode of the 10-10 system, referential
	ECG                                 // electrocardiogram (ECG, EKG)
	EOG                                 // electro-oculogram (EOG, LOC, ROC)
	EMG                                 // electromyogram (EMG, chin)
	Photic                              // photic stimulation marker
	AnnotationSignal                    // the EDF+ "EDF Annotations" signal
)

var kindNames = [...]string{"Other", "EEG", "ECG", "EOG", "EMG", "Photic", "Annotation"}

func (k ChannelKind) String() string {
	if k < 0 || int(k) >= len(kindNames) {
		return "ChannelKind(" + strconv.Itoa(int(k)) + ")"
	}
	return kindNames[k]
}

// tenTen maps upper-case electrode names to their canonical spelling: the
// 10-10 positions (American Clinical Neurophysiology Society Guideline 2,
// Acharya et al. 2016, Figure 1; Oostenveld & Praamstra 2001, Figure 1 for
// the AF/PO intermediate numbers), the nasion and inion, and the ear and
// mastoid reference sites.
var tenTen = func() map[string]string {
	m := map[string]string{}
	add := func(prefix string, nums ...int) {
		for _, n := range nums {
			name := prefix + strconv.Itoa(n)
			m[strings.ToUpper(name)] = name
		}
	}
	seq := func(a, b int) []int {
		var s []int
		for i := a; i <= b; i++ {
			s = append(s, i)
		}
		return s
	}
	add("Fp", 1, 2)
	add("AF", seq(1, 10)...)
	add("F", seq(1, 10)...)
	add("FT", 7, 8, 9, 10)
	add("FC", seq(1, 6)...)
	add("C", seq(1, 6)...)
	add("T", 7, 8, 9, 10)
	add("TP", 7, 8, 9, 10)
	add("CP", seq(1, 6)...)
	add("P", seq(1, 10)...)
	add("PO", seq(1, 10)...)
	add("O", 1, 2, 9, 10)
	add("I", 1, 2)
	add("A", 1, 2)
	add("M", 1, 2)
	for _, z := range []string{"Nz", "Fpz", "AFz", "Fz", "FCz", "Cz", "CPz", "Pz", "POz", "Oz", "Iz"} {
		m[strings.ToUpper(z)] = z
	}
	return m
}()

// oldNames maps the 10-20 temporal names that the 10-10 system renamed
// (ACNS Guideline 2, Acharya et al. 2016: T3→T7, T4→T8, T5→P7, T6→P8).
var oldNames = map[string]string{"T3": "T7", "T4": "T8", "T5": "P7", "T6": "P8"}

// refSuffixes are reference designations that do not change which scalp
// site is recorded. // common practice
var refSuffixes = []string{"-REF", "-LE", "-RE", "-A1", "-A2", "-M1", "-M2", "-AVG", "-AV", "-CAR"}

// typePrefixes are the EDF+ signal-type words that may precede a label
// (Kemp & Olivan 2003, section 2.1.3.1: "EEG Fpz-Cz").
var typePrefixes = map[string]ChannelKind{"EEG": EEG, "ECG": ECG, "EKG": ECG, "EOG": EOG, "EMG": EMG}

// NormalizeLabel maps a raw EDF signal label to a canonical 10-10 electrode
// name and a channel kind. It trims spaces, drops a leading signal-type word
// ("EEG Fp1"), drops one reference suffix ("Fp1-REF", "C3-A2", "Cz-AVG"),
// folds case to the canonical spelling (FP1 → Fp1, CZ → Cz) and renames the
// old 10-20 temporal electrodes. Only a single 10-10 site is ever EEG; a
// bipolar derivation such as "Fp1-F7" is Other, as is anything unknown.
// For non-EEG kinds the trimmed label is returned as the name.
func NormalizeLabel(raw string) (name string, kind ChannelKind) {
	s := strings.TrimSpace(raw)
	if s == "EDF Annotations" {
		return s, AnnotationSignal
	}
	hint := Other
	if i := strings.IndexAny(s, " :"); i > 0 {
		if k, ok := typePrefixes[strings.ToUpper(s[:i])]; ok {
			hint = k
			s = strings.TrimSpace(s[i+1:])
		}
	}
	up := strings.ToUpper(s)
	for _, suf := range refSuffixes {
		if len(up) > len(suf) && strings.HasSuffix(up, suf) {
			up = up[:len(up)-len(suf)]
			s = s[:len(s)-len(suf)]
			break
		}
	}
	up = strings.TrimSpace(up)
	s = strings.TrimSpace(s)
	if hint == Other || hint == EEG {
		if n, ok := oldNames[up]; ok {
			return n, EEG
		}
		if n, ok := tenTen[up]; ok {
			return n, EEG
		}
	}
	if hint != Other && hint != EEG {
		return s, hint
	}
	switch {
	case strings.HasPrefix(up, "ECG"), strings.HasPrefix(up, "EKG"):
		return s, ECG
	case strings.HasPrefix(up, "EOG"), up == "LOC", up == "ROC":
		return s, EOG
	case strings.HasPrefix(up, "EMG"), strings.HasPrefix(up, "CHIN"):
		return s, EMG
	case strings.HasPrefix(up, "PHOTIC"), up == "PHOT":
		return s, Photic
	}
	return s, Other
}
