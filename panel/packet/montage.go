package packet

import (
	"strings"

	"github.com/quorate-eeg/quorate/sampling/montage"
)

// DefaultMontages returns the referential, common average, longitudinal
// bipolar and transverse bipolar montages for the given electrodes, as
// sampling/montage defines them once for the whole program. Derivations whose
// electrodes are missing are left out, and a montage with none is left out.
func DefaultMontages(electrodes []string) []Montage {
	names := map[montage.Kind]string{
		montage.Referential: "Referential", montage.CommonAverage: "Common average",
		montage.LongitudinalBipolar: "Longitudinal bipolar", montage.TransverseBipolar: "Transverse bipolar",
	}
	var out []Montage
	for _, k := range []montage.Kind{montage.Referential, montage.CommonAverage, montage.LongitudinalBipolar, montage.TransverseBipolar} {
		m, _, err := montage.Build(k, electrodes, nil)
		if err != nil {
			continue
		}
		mt := Montage{Name: names[k]}
		for _, d := range m.Derivations() {
			mt.Derivations = append(mt.Derivations, Derivation{Label: d.Name, Plus: d.Plus, Minus: d.Minus})
		}
		out = append(out, mt)
	}
	return out
}

// FirstMontage returns ms with the montage named first moved to the front,
// the others keeping their order. Names are compared ignoring case, with
// '-' and '_' read as spaces, so "longitudinal-bipolar" finds "Longitudinal
// bipolar". An unknown or empty name leaves ms as it is.
func FirstMontage(ms []Montage, first string) []Montage {
	norm := func(s string) string {
		return strings.ToLower(strings.NewReplacer("-", " ", "_", " ").Replace(strings.TrimSpace(s)))
	}
	for i, m := range ms {
		if norm(m.Name) == norm(first) && first != "" {
			out := append([]Montage{m}, ms[:i]...)
			return append(out, ms[i+1:]...)
		}
	}
	return ms
}
