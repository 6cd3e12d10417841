package tuning

import (
	"fmt"
	"math"

	"github.com/quorate-eeg/quorate/sampling/design"
	"github.com/quorate-eeg/quorate/tuning/accuracy"
)

// minCarrying is the fewest controls called IED for which the missed-IED rate
// is given without a warning: below five events a count's relative standard
// error exceeds 45 % (√5/5; common practice for Poisson counts).
const minCarrying = 5

// controlSummary projects the IEDs the finder missed from the background controls:
// Ŷ/H with Ŷ = Σ w·[reference IED] over the controls (a Horvitz–Thompson total; Horvitz
// & Thompson 1952) and H the recording hours.
func controlSummary(s *evset, level float64) Controls {
	c := Controls{Rated: len(s.controls), MissedPerHour: pointOnly(math.NaN())}
	if c.Rated == 0 {
		return c
	}
	y := make([]float64, c.Rated)
	w := make([]float64, c.Rated)
	st := make([]string, c.Rated)
	for i, e := range s.controls {
		if e.Reference == 1 {
			y[i] = 1
			c.IEDs++
		}
		w[i], st[i] = e.Weight, "control"
	}
	if !(s.hours > 0) || c.Rated < 2 {
		return c
	}
	// The controls are one simple random sample of the eligible epochs, so the sampling
	// fraction is π = 1/w, the same for every control.
	r, err := design.RatePerHour(design.Sample{Stratum: st, Weight: w, FPC: map[string]float64{"control": 1 / w[0]}}, y, s.hours)
	if err != nil {
		return c
	}
	// The interval is the Wilson interval of the share of epochs holding an IED, scaled
	// by the eligible epochs per hour (M/H): unlike a Wald interval it does not collapse
	// to a point when no control holds one (Newcombe 1998). It leaves out the finite
	// population correction, which only narrows it.
	M := w[0] * float64(c.Rated)
	lo, hi := accuracy.Wilson(float64(c.IEDs), float64(c.Rated), level)
	c.MissedPerHour = Estimate{r.Value, lo * M / s.hours, hi * M / s.hours}
	if c.IEDs < minCarrying {
		c.Warning = fmt.Sprintf("missed IEDs per hour (%.3g, interval %.3g–%.3g) rests on %d of %d background controls called IED by the panel: each such control moves it by %.3g per hour, and one chance majority makes or unmakes it; read the interval, not the value",
			r.Value, c.MissedPerHour.Lo, c.MissedPerHour.Hi, c.IEDs, c.Rated, w[0]/s.hours)
	}
	return c
}
