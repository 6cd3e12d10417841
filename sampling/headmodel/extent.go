package headmodel

import "math"

// FieldExtent returns the number of channels whose value has the sign of
// the map's peak (the channel of largest |v|) and at least half its
// magnitude: the half-maximum spread of the field (common practice). A
// cerebral field usually involves several neighbouring electrodes, an
// electrode artefact one. It returns 0 for an empty or all-zero map and
// ignores NaN channels.
func FieldExtent(v []float64) int {
	peak := 0.0
	for _, x := range v {
		if math.Abs(x) > math.Abs(peak) {
			peak = x
		}
	}
	if peak == 0 {
		return 0
	}
	n := 0
	for _, x := range v {
		if x*peak > 0 && math.Abs(x) >= 0.5*math.Abs(peak) {
			n++
		}
	}
	return n
}
