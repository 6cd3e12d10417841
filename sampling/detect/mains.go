package detect

import (
	"fmt"
	"math"
	"slices"
	"strings"
)

// mainsHz are the mains frequencies of the world's grids (IEC 60038).
var mainsHz = [2]float64{50, 60}

// Line search: mainsSegs Hann-windowed segments of mainsSegS, spread evenly
// over the recording, averaged per channel; a line is present on a channel
// when the largest power within mainsHalfHz of a mains frequency is
// mainsRatio times the median power of the bins 2–5 Hz either side of it.
const (
	mainsSegs   = 16
	mainsSegS   = 8.0 // s: 0.125 Hz bins, so that a line stands four times higher above a flat floor than in 2 s segments
	mainsHalfHz = 0.5
	mainsRatio  = 10.0 // 10 dB

)

// mainsLines returns the mains frequencies (50, 60 Hz) whose line stands out
// of the recording's spectrum on at least one channel, and for each the
// channels it stands out on. Interference reaches the EEG through the
// electrodes' impedances, so it may be on a few channels only; a notch,
// applied to every channel, costs the others nothing the features read
// (its −3 dB band is f/q, 1.7–2 Hz wide at q = 30). EEG has no narrow line of its
// own between 44 and 66 Hz, so ten times the neighbouring bins is
// interference: lines of 2 µV are found over the generated backgrounds,
// and on ten recordings of each generator no channel without a line
// reached even three times (TestMainsLine). Unknown, and so no line, when
// the recording is shorter than one segment or a read fails.
func mainsLines(in *Input) map[float64][]int {
	var sc scratch
	n := int(math.Round(mainsSegS * in.Rate))
	if in.Len < int64(n) || 0.5*in.Rate <= mainsHz[1]+5 {
		return nil
	}
	sc.spectrumOf(n)
	df := in.Rate / float64(n)
	k0, k1 := int((mainsHz[0]-6)/df), int(math.Ceil((mainsHz[1]+6)/df))
	segs := min(mainsSegs, int(in.Len/int64(n)))
	step := (in.Len - int64(n)) / int64(max(segs-1, 1))
	buf := make([]float32, n)
	psd := make([]float64, k1+1)
	out := map[float64][]int{}
	for ch := range in.Labels {
		clear(psd)
		for s := range segs {
			if err := in.Src.ReadAt(ch, int64(s)*step, buf); err != nil {
				return nil
			}
			var mean float64
			for _, v := range buf {
				mean += float64(v)
			}
			mean /= float64(n)
			for i, v := range buf {
				sc.seg[i] = (float64(v) - mean) * sc.win[i]
			}
			sc.coefficients(k0, k1)
			for k := k0; k <= k1; k++ {
				c := sc.co[k]
				psd[k] += real(c)*real(c) + imag(c)*imag(c)
			}
		}
		for _, f := range mainsHz {
			var line float64
			for k := int(math.Ceil((f - mainsHalfHz) / df)); float64(k)*df <= f+mainsHalfHz; k++ {
				line = max(line, psd[k])
			}
			var nb []float64
			for k := k0; k <= k1; k++ {
				if d := math.Abs(float64(k)*df - f); d >= 2 && d <= 5 {
					nb = append(nb, psd[k])
				}
			}
			slices.Sort(nb)
			if med := nb[len(nb)/2]; line > mainsRatio*med && line > 0 {
				out[f] = append(out[f], ch)
			}
		}
	}
	return out
}

// notches returns the notch frequencies for the recording: the mains lines
// found in it (mainsLines) or, when none is found, the one asked for. A
// recording from a 60 Hz grid read with the 50 Hz default is thus notched
// at 60 Hz only, with a warning naming the line and its channels: each
// notch rings a little on a sharp transient, so one the recording does
// not need is left out when another is needed. With no notch asked for
// (Options.NotchHz negative) a line found is warned of but not notched.
func (e *engine) notches() []float64 {
	lines := mainsLines(e.in)
	var out []float64
	for _, f := range mainsHz {
		chs, ok := lines[f]
		if !ok {
			continue
		}
		if f == e.s.notch {
			out = append(out, f)
			continue
		}
		var names []string
		for _, c := range chs {
			names = append(names, e.in.Labels[c])
		}
		where := fmt.Sprintf("%d of %d channels: %s", len(chs), len(e.in.Labels), strings.Join(names, " "))
		switch {
		case e.s.notch == 0:
			e.warn("a %g Hz mains line is present (%s) and no notch was asked for: features near it read the interference", f, where)
		case lines[e.s.notch] == nil:
			e.warn("a %g Hz mains line is present (%s) and none at %g Hz: notched at %g Hz instead of the %g Hz asked for", f, where, e.s.notch, f, e.s.notch)
			out = append(out, f)
		default:
			e.warn("a %g Hz mains line is present (%s): notched at %g Hz as well as at the %g Hz asked for", f, where, f, e.s.notch)
			out = append(out, f)
		}
	}
	if len(out) == 0 && e.s.notch > 0 {
		out = append(out, e.s.notch)
	}
	return out
}
