package tuning

import (
	"math"
	"strconv"
)

// gapCut returns a cutoff strictly between lo and hi (lo < hi), the largest
// observed value not meeting a criterion and the smallest one meeting it, in
// direction-adjusted units: the midpoint rounded to the fewest significant
// digits that keep it inside the gap. No observed value equals it, so the
// rule "met when x ≥ cut" gives the same decisions on the fitting events
// however the cutoff is printed, and the shortest round-trip form
// (strconv 'g', −1) of a value parsed from few digits is those digits.
// Without a lower neighbour (lo = −Inf) the cutoff sits half a unit (or half
// of |hi|) below hi.
func gapCut(lo, hi float64) float64 {
	if math.IsInf(lo, -1) {
		lo = hi - math.Max(1, math.Abs(hi))
	}
	mid := lo + (hi-lo)/2
	for p := 1; p <= 17; p++ {
		c, err := strconv.ParseFloat(strconv.FormatFloat(mid, 'g', p, 64), 64)
		if err == nil && c > lo && c < hi {
			return c
		}
	}
	return mid
}

// placeCuts moves each active cutoff of f (cuts, direction-adjusted) into
// the gap below it among the events of s, keeping every decision on s.
func placeCuts(s *evset, f *autoFit, cut *[votes]float64) {
	for j := range votes {
		if !f.active[j] {
			continue
		}
		lo, hi := math.Inf(-1), math.Inf(1)
		for _, e := range s.src {
			v := f.dir[j] * value(e, j)
			if math.IsNaN(v) {
				continue
			}
			if v < cut[j] {
				lo = math.Max(lo, v)
			} else {
				hi = math.Min(hi, v)
			}
		}
		if math.IsInf(hi, 1) {
			// Nothing meets the cutoff: keep it above every value.
			cut[j] = gapCut(lo, lo+math.Max(1, math.Abs(lo)))
			continue
		}
		cut[j] = gapCut(lo, hi)
	}
}

// formatCut prints a cutoff exactly: the shortest form that parses back to
// the same float64.
func formatCut(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }
