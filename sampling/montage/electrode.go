package montage

import (
	"strconv"
	"strings"
)

// rows are the 10-10 name prefixes, longest first so "FT" is not read as
// "F". N and I only take "z" (nasion, inion) and I1/I2.
var rows = []string{"Fp", "AF", "FC", "FT", "CP", "TP", "PO", "F", "C", "T", "P", "O", "I", "N"}

// split parses a 10-10 scalp electrode name into its row prefix and its
// position: 0 for midline "z", otherwise 1…10 (odd left, even right).
func split(name string) (row string, pos int, ok bool) {
	for _, r := range rows {
		rest, found := strings.CutPrefix(name, r)
		if !found || rest == "" {
			continue
		}
		if rest == "z" {
			if r == "FT" || r == "TP" || r == "T" {
				return "", 0, false // no midline temporal sites
			}
			return r, 0, true
		}
		n, err := strconv.Atoi(rest)
		if err != nil || n < 1 || n > 10 || rest[0] == '0' {
			return "", 0, false
		}
		switch r {
		case "N":
			return "", 0, false
		case "Fp", "O", "I":
			if n > 2 {
				return "", 0, false
			}
		case "T", "FT", "TP":
			if n < 7 {
				return "", 0, false
			}
		case "C":
			if n > 6 {
				return "", 0, false // lateral central sites are T7/T8
			}
		}
		return r, n, true
	}
	return "", 0, false
}

// IsElectrode reports whether name is a 10-10 scalp electrode such as
// "Fp1", "T7" or "Cz". Ear and mastoid sites (A1, A2, M1, M2) and
// non-EEG channels are not.
func IsElectrode(name string) bool {
	_, _, ok := split(name)
	return ok
}

// Present returns the labels that are 10-10 scalp electrodes, in order.
func Present(labels []string) []string {
	var out []string
	for _, l := range labels {
		if IsElectrode(l) {
			out = append(out, l)
		}
	}
	return out
}

// Region returns the lobe ("frontal", "temporal", "central", "parietal",
// "occipital") and side ("left", "right", "midline") under a 10-10
// electrode, or two empty strings for other names. The row prefix decides
// the lobe: Fp, AF, F, N frontal; FT, T, TP temporal; FC, C, CP central;
// P, PO parietal; O, I occipital. Exception: F7–F10 are reported as
// temporal, because they lie over the anterior temporal region and
// anterior temporal discharges are maximal there (common practice; the
// older 10-20 teaching groups F7/F8 with the temporal chain, as the
// longitudinal bipolar montage does). Odd numbers are left, even right,
// z midline.
func Region(name string) (lobe, side string) {
	row, pos, ok := split(name)
	if !ok {
		return "", ""
	}
	switch {
	case pos == 0:
		side = "midline"
	case pos%2 == 1:
		side = "left"
	default:
		side = "right"
	}
	switch row {
	case "Fp", "AF", "N":
		lobe = "frontal"
	case "F":
		lobe = "frontal"
		if pos >= 7 {
			lobe = "temporal"
		}
	case "FT", "T", "TP":
		lobe = "temporal"
	case "FC", "C", "CP":
		lobe = "central"
	case "P", "PO":
		lobe = "parietal"
	case "O", "I":
		lobe = "occipital"
	}
	return lobe, side
}
