package edf

import "strings"

// Microvolts is the factor that turns the signal's physical values into
// microvolts, read from its physical dimension with the SI prefixes the
// EDF+ specification recommends for it (Kemp & Olivan 2003, section
// 2.1.3.2: "uV", "mV", "V", "nV"): 1 for uV (also written µV, with the
// micro sign — the header reader turns a Latin-1 one into it — or the
// Greek mu, in either case), 1000 for mV, 10⁶ for V,
// 0.001 for nV. ok is false for an empty or any other dimension, for which
// the factor is 1: scalp EEG is recorded in µV almost everywhere, and
// "MV" (megavolt) or a blank field is far likelier a careless µV than
// anything else (common practice). EEG features are ratios and do not
// depend on the unit, but flat-channel tests, amplitudes and the raters'
// calipers do.
func (s *Signal) Microvolts() (factor float64, ok bool) {
	d := strings.TrimSpace(s.PhysDim)
	switch d {
	case "V":
		return 1e6, true
	case "mV":
		return 1e3, true
	case "nV":
		return 1e-3, true
	}
	switch strings.ToLower(d) {
	case "uv", "µv", "μv":
		return 1, true
	}
	return 1, false
}
