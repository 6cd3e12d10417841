package packet

// Chains of the standard montages, from ACNS Guideline 3 (Acharya et al.
// 2016, J Clin Neurophysiol 33:312–316; from memory), using the 10-10 names
// T7/T8/P7/P8.
var (
	longitudinalChains = [][]string{
		{"Fp1", "F7", "T7", "P7", "O1"},
		{"Fp1", "F3", "C3", "P3", "O1"},
		{"Fz", "Cz", "Pz"},
		{"Fp2", "F4", "C4", "P4", "O2"},
		{"Fp2", "F8", "T8", "P8", "O2"},
	}
	transverseChains = [][]string{
		{"Fp1", "Fp2"},
		{"F7", "F3", "Fz", "F4", "F8"},
		{"A1", "T7", "C3", "Cz", "C4", "T8", "A2"},
		{"P7", "P3", "Pz", "P4", "P8"},
		{"O1", "O2"},
	}
)

// DefaultMontages returns the referential, common average, longitudinal
// bipolar and transverse bipolar montages for the given electrodes. Bipolar
// links whose electrodes are missing are skipped, and a bipolar montage with
// no link is left out.
func DefaultMontages(electrodes []string) []Montage {
	idx := make(map[string]int, len(electrodes))
	for i, e := range electrodes {
		idx[e] = i
	}
	ref := Montage{Name: "Referential"}
	avg := Montage{Name: "Common average"}
	all := make([]int, len(electrodes))
	for i := range electrodes {
		all[i] = i
	}
	for i, e := range electrodes {
		ref.Derivations = append(ref.Derivations, Derivation{Label: e, Plus: i})
		avg.Derivations = append(avg.Derivations, Derivation{Label: e + "-Avg", Plus: i, Minus: all})
	}
	out := []Montage{ref, avg}
	for _, m := range []struct {
		name   string
		chains [][]string
	}{{"Longitudinal bipolar", longitudinalChains}, {"Transverse bipolar", transverseChains}} {
		mt := Montage{Name: m.name}
		for _, chain := range m.chains {
			for k := 0; k+1 < len(chain); k++ {
				a, okA := idx[chain[k]]
				b, okB := idx[chain[k+1]]
				if okA && okB {
					mt.Derivations = append(mt.Derivations, Derivation{Label: chain[k] + "-" + chain[k+1], Plus: a, Minus: []int{b}})
				}
			}
		}
		if len(mt.Derivations) > 0 {
			out = append(out, mt)
		}
	}
	return out
}
