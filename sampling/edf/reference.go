package edf

import (
	"fmt"
	"strings"
)

// commonReference finds signals recorded against one common reference
// electrode and labelled as derivations from it ("Fp1-Cz", "EEG F3-Cz",
// …), which NormalizeLabel, seeing two electrode names, leaves as Other,
// and makes them the EEG electrodes they are (Name "Fp1", Kind EEG): a
// derivation against a common reference is a referential recording, and
// the common average built from such channels is the same whatever the
// reference (the reference's own potential cancels; common practice). It
// acts only when at least minRefChannels signals share the second
// electrode and they are at least refShare of the two-electrode labels,
// so a bipolar chain ("Fp1-F7", "F7-T7", …), whose second electrodes
// differ, stays as it is. A derivation whose first electrode is already
// an EEG signal of its own is left alone. The reference electrode itself
// is not recorded and is missing from every montage and map; a warning
// says so.
func commonReference(h *Header) {
	type pair struct {
		sig           int
		first, second string
	}
	var pairs []pair
	count := map[string]int{}
	have := map[string]bool{}
	for i, s := range h.Signals {
		if s.Kind == EEG {
			have[s.Name] = true
		}
		if s.Kind != Other {
			continue
		}
		a, b, ok := electrodePair(s.Label)
		if !ok {
			continue
		}
		pairs = append(pairs, pair{i, a, b})
		count[b]++
	}
	ref, n := "", 0
	for r, c := range count {
		if c > n || (c == n && r < ref) {
			ref, n = r, c
		}
	}
	if n < minRefChannels || float64(n) < refShare*float64(len(pairs)) {
		return
	}
	var names []string
	for _, p := range pairs {
		if p.second != ref || have[p.first] {
			continue
		}
		have[p.first] = true
		h.Signals[p.sig].Name, h.Signals[p.sig].Kind = p.first, EEG
		names = append(names, h.Signals[p.sig].Label)
	}
	if len(names) > 0 {
		h.Warnings = append(h.Warnings, fmt.Sprintf("%d signals are derivations against %s (%s…): read as referential electrodes; %s itself is not recorded and is left out of every montage", len(names), ref, names[0], ref))
	}
}

const (
	minRefChannels = 3
	refShare       = 0.8
)

// electrodePair splits a label such as "EEG Fp1-Cz" into its two 10-10
// scalp electrodes, canonical, when it is one.
func electrodePair(label string) (first, second string, ok bool) {
	s := strings.TrimSpace(label)
	if i := strings.IndexAny(s, " :"); i > 0 && strings.EqualFold(s[:i], "EEG") {
		s = strings.TrimSpace(s[i+1:])
	}
	a, b, found := strings.Cut(s, "-")
	if !found || strings.Contains(b, "-") {
		return "", "", false
	}
	na, ka := NormalizeLabel(a)
	nb, kb := NormalizeLabel(b)
	if ka != EEG || kb != EEG {
		return "", "", false
	}
	return na, nb, true
}
