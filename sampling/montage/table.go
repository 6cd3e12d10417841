package montage

// Bipolar chains, each a list of electrodes joined neighbour to neighbour
// (a chain a, b, c gives derivations a−b and b−c). Electrode names are
// the 10-10 ones (T7/T8/P7/P8 for the 10-20 T3/T4/T5/T6).

// longitudinal is the 18-channel longitudinal bipolar ("double banana")
// montage of ACNS Guideline 3 (Acharya et al. 2016, J Clin Neurophysiol
// 33(4):312–316): left temporal, right temporal, left parasagittal, right
// parasagittal, midline; each chain front to back (from memory).
var longitudinal = [][]string{
	{"Fp1", "F7", "T7", "P7", "O1"},
	{"Fp2", "F8", "T8", "P8", "O2"},
	{"Fp1", "F3", "C3", "P3", "O1"},
	{"Fp2", "F4", "C4", "P4", "O2"},
	{"Fz", "Cz", "Pz"},
}

// transverse is the transverse bipolar montage of ACNS Guideline 3
// (Acharya et al. 2016): one chain per coronal row, front to back, each
// left to right (from memory).
var transverse = [][]string{
	{"F7", "Fp1", "Fp2", "F8"},
	{"F7", "F3", "Fz", "F4", "F8"},
	{"T7", "C3", "Cz", "C4", "T8"},
	{"P7", "P3", "Pz", "P4", "P8"},
	{"O1", "O2"},
}

// Chains returns the bipolar chains of a bipolar kind (nil otherwise), as
// a copy, for display and for checking against the guideline.
func Chains(k Kind) [][]string {
	var t [][]string
	switch k {
	case LongitudinalBipolar:
		t = longitudinal
	case TransverseBipolar:
		t = transverse
	default:
		return nil
	}
	out := make([][]string, len(t))
	for i, c := range t {
		out[i] = append([]string(nil), c...)
	}
	return out
}
