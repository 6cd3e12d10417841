package edf

import (
	"fmt"
	"strings"
)

// commonReference finds signals recorded against one common reference and
// labelled as derivations from it ("Fp1-Cz", "EEG F3-Cz", …, or against a
// reference the amplifier names, "Fp1-G19"), which NormalizeLabel, seeing
// two names, leaves as Other, and makes them the EEG electrodes they are
// (Name "Fp1", Kind EEG): a derivation against a common reference is a
// referential recording, and the common average built from such channels
// is the same whatever the reference (the reference's own potential
// cancels; common practice). It acts only when at least minRefChannels
// signals share the reference and they are at least refShare of the
// two-part labels, so a bipolar chain ("Fp1-F7", "F7-T7", …), whose second
// electrodes differ, stays as it is. A derivation whose first electrode is
// already an EEG signal of its own is left alone. A reference electrode is
// not recorded and is missing from every montage and map; a warning says
// so.
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
		w := fmt.Sprintf("%d signals are derivations against %s (%s…): read as referential electrodes", len(names), ref, names[0])
		if _, k := NormalizeLabel(ref); k == EEG {
			w += "; " + ref + " itself is not recorded and is left out of every montage"
		}
		h.Warnings = append(h.Warnings, w)
	}
}

const (
	minRefChannels = 3
	refShare       = 0.8
)

// electrodePair splits a label such as "EEG Fp1-Cz" into its 10-10 scalp
// electrode and what it is measured against: another electrode
// (canonical) or a reference's name (upper case, one word).
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
	if ka != EEG {
		return "", "", false
	}
	if nb, kb := NormalizeLabel(b); kb == EEG {
		return na, nb, true
	}
	// a reference named by the amplifier rather than a site ("G19", "Ref2")
	b = strings.TrimSpace(b)
	if b == "" || strings.ContainsAny(b, " \t") {
		return "", "", false
	}
	return na, strings.ToUpper(b), true
}
