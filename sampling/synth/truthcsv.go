package synth

import (
	"encoding/csv"
	"io"
	"math"
	"sort"
	"strconv"
	"strings"
)

// TruthHeader is the header row written by WriteTruthCSV.
var TruthHeader = []string{
	"id", "kind", "is_ied", "onset_s", "start_s", "end_s", "peak_electrode", "polarity",
	"c1", "c2", "c3", "c4", "c5", "c6", "amplitude_uv", "duration_ms", "rise_ms",
	"slow_wave_ms", "attenuation", "attenuation_ms", "snr",
	"dipole_x", "dipole_y", "dipole_z", "moment_x", "moment_y", "moment_z", "orientation",
	"c2_duration_ms", "background_half_period_ms", "unclear",
}

// WriteTruthCSV writes the truth table as RFC 4180 CSV with TruthHeader.
// Times are in seconds, exact (shortest round-trip form); booleans are 0/1.
// unclear lists the criteria whose label is not settled by construction
// (Event.Unclear), space-separated ("c2 c3"), empty when none.
func WriteTruthCSV(w io.Writer, evs []Event) error {
	cw := csv.NewWriter(w)
	if err := cw.Write(TruthHeader); err != nil {
		return err
	}
	f := func(x float64, prec int) string { return strconv.FormatFloat(x, 'f', prec, 64) }
	b := func(v bool) string {
		if v {
			return "1"
		}
		return "0"
	}
	for _, e := range evs {
		row := []string{e.ID, e.Kind, b(e.IsIED), f(e.Onset, -1), f(e.Start, -1), f(e.End, -1),
			e.PeakElectrode, strconv.Itoa(e.Polarity)}
		for _, m := range e.Meets {
			row = append(row, b(m))
		}
		row = append(row, f(e.Amplitude, 3), f(e.Duration, 3), f(e.Rise, 3), f(e.SlowWave, 3),
			f(e.Attenuation, 4), f(e.AttenuationMs, 3), f(e.SNR, 4))
		for _, v := range [][3]float64{e.DipolePos, e.DipoleMoment} {
			for _, x := range v {
				row = append(row, f(x, 6))
			}
		}
		row = append(row, e.Orientation, f(e.C2DurationMs, 3), f(e.BackgroundHalfMs, 3), unclearList(e.Unclear))
		if err := cw.Write(row); err != nil {
			return err
		}
	}
	cw.Flush()
	return cw.Error()
}

// unclearList names the set criteria of u, "c1".."c6", space-separated.
func unclearList(u [6]bool) string {
	var out []string
	for j, v := range u {
		if v {
			out = append(out, "c"+strconv.Itoa(j+1))
		}
	}
	return strings.Join(out, " ")
}

// Nearest returns the truth event whose peak lies closest to onset, within tol seconds.
// evs must be sorted by onset, as Generate returns them.
func Nearest(evs []Event, onset, tol float64) (Event, bool) {
	i := sort.Search(len(evs), func(i int) bool { return evs[i].Onset >= onset })
	best, ok := Event{}, false
	bestD := tol
	for _, j := range []int{i - 1, i} {
		if j >= 0 && j < len(evs) {
			if d := math.Abs(evs[j].Onset - onset); d <= bestD {
				best, ok, bestD = evs[j], true, d
			}
		}
	}
	return best, ok
}
