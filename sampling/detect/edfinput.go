package detect

import (
	"fmt"
	"io"
	"math"
	"strings"

	"github.com/quorate-eeg/quorate/sampling/edf"
	"github.com/quorate-eeg/quorate/sampling/montage"
)

// edfSource serves the chosen signals of an EDF reader in µV, offset to
// one segment's first sample. Samples past the end of the file read as
// zero, which the caller never asks for within a segment.
type edfSource struct {
	r     *edf.Reader
	sigs  []int     // signal index, or −1−k for recovered electrode k (edf.Header.Recovered)
	scale []float32 // µV per physical unit of each signal (edf.Signal.Microvolts)
	first int64
}

func (s *edfSource) ReadAt(ch int, start int64, dst []float32) error {
	var n int
	var err error
	if k := s.sigs[ch]; k < 0 {
		n, err = s.r.ReadRecovered(-1-k, s.first+start, dst)
	} else {
		n, err = s.r.ReadSignal(k, s.first+start, dst)
	}
	if err == io.EOF && n == len(dst) {
		err = nil
	}
	if k := s.scale[ch]; k != 1 {
		for i := range dst[:n] {
			dst[i] *= k
		}
	}
	return err
}

// edfInputs splits an EDF-family recording into Inputs: one per contiguous
// segment (EDF+D is processed segment by segment, never across a gap), over
// the scalp EEG signals at the most common EEG sampling rate. Signals at
// other rates, and non-EEG signals, are left out with a warning. Each Input
// carries the vigilance spans of the recording's sleep-stage annotations.
func edfInputs(r *edf.Reader, recID, subject string) ([]Input, []string, error) {
	h := r.Header()
	var warns []string
	count := map[float64]int{}
	for _, s := range h.Signals {
		if s.Kind == edf.EEG && montage.IsElectrode(s.Name) {
			count[s.SampleRate(h.RecordDuration)]++
		}
	}
	if len(count) == 0 && len(h.Recovered) > 0 {
		return recoveredInputs(r, recID, subject)
	}
	if len(count) == 0 {
		return nil, []string{"no scalp EEG channels; recording skipped"}, nil
	}
	var rate float64
	for f, c := range count {
		if c > count[rate] || (c == count[rate] && f > rate) {
			rate = f
		}
	}
	var labels []string
	var sigs []int
	var scale []float32
	var ranges [][2]float64
	for i, s := range h.Signals {
		if s.Kind != edf.EEG || !montage.IsElectrode(s.Name) {
			continue
		}
		if f := s.SampleRate(h.RecordDuration); f != rate {
			warns = append(warns, fmt.Sprintf("channel %s at %g Hz, not %g Hz: left out", s.Name, f, rate))
			continue
		}
		if g := s.Gain(); math.IsNaN(g) || math.IsInf(g, 0) || g == 0 {
			warns = append(warns, fmt.Sprintf("channel %s: unusable scaling (physical %g…%g, digital %d…%d): left out", s.Name, s.PhysMin, s.PhysMax, s.DigMin, s.DigMax))
			continue
		}
		k, _ := s.Microvolts()
		labels = append(labels, s.Name)
		sigs = append(sigs, i)
		scale = append(scale, float32(k))
		ranges = append(ranges, [2]float64{k * s.PhysMin, k * s.PhysMax})
	}
	warns = append(warns, oddUnits(h, sigs)...)
	if len(labels) == 0 {
		return nil, append(warns, "no usable scalp EEG channels; recording skipped"), nil
	}
	spr := int64(h.Signals[sigs[0]].SamplesPerRecord)
	return segmentInputs(r, recID, subject, labels, ranges, rate, spr, &edfSource{r: r, sigs: sigs, scale: scale}, warns)
}

// oddUnits warns once about the signals among sigs whose physical
// dimension is no voltage unit edf.Signal.Microvolts knows, which are read
// as µV.
func oddUnits(h *edf.Header, sigs []int) []string {
	var odd []string
	for _, i := range sigs {
		if s := h.Signals[i]; !unitKnown(s) {
			odd = append(odd, fmt.Sprintf("%s %q", s.Name, s.PhysDim))
		}
	}
	if len(odd) == 0 {
		return nil
	}
	more := map[bool]string{true: ", …"}[len(odd) > 3]
	return []string{fmt.Sprintf("physical dimension not uV, mV, V or nV on %d channel(s) (%s%s): read as µV", len(odd), strings.Join(odd[:min(3, len(odd))], ", "), more)}
}

func unitKnown(s edf.Signal) bool { _, ok := s.Microvolts(); return ok }

// recoveredInputs is edfInputs for a recording stored as bipolar
// derivations, over the electrodes the edf package recovered from them
// (edf.Header.Recovered), with a warning that says so. A recovered
// electrode has no physical range of its own: its range is the largest
// the derivations' ranges allow, so it never reads as saturated.
func recoveredInputs(r *edf.Reader, recID, subject string) ([]Input, []string, error) {
	h := r.Header()
	rate, spr := h.RecoveredRate()
	var labels []string
	var sigs []int
	var scale []float32
	var ranges [][2]float64
	for k, e := range h.Recovered {
		var span float64
		for _, t := range e.Terms {
			s := h.Signals[t.Signal]
			span += math.Abs(t.Weight) * max(math.Abs(s.PhysMin), math.Abs(s.PhysMax))
		}
		labels = append(labels, e.Name)
		sigs = append(sigs, -1-k)
		scale = append(scale, 1)
		ranges = append(ranges, [2]float64{-span, span})
	}
	warn := fmt.Sprintf("stored as bipolar derivations: read from the %d electrodes recovered from them (%s, …), each less the mean of its linked group", len(labels), strings.Join(labels[:min(3, len(labels))], ", "))
	ins, warns, err := segmentInputs(r, recID, subject, labels, ranges, rate, int64(spr), &edfSource{r: r, sigs: sigs, scale: scale}, append([]string{warn}, oddUnits(h, h.TermSignals())...))
	for i := range ins {
		ins[i].SplitMap = h.Recovered[len(h.Recovered)-1].Group > 0
	}
	return ins, warns, err
}

// segmentInputs makes one Input per contiguous segment of the recording
// over the channels src serves.
func segmentInputs(r *edf.Reader, recID, subject string, labels []string, ranges [][2]float64, rate float64, spr int64, src *edfSource, warns []string) ([]Input, []string, error) {
	segs, err := r.Segments()
	if err != nil {
		return nil, warns, err
	}
	states, err := recordingStates(r)
	if err != nil {
		return nil, warns, fmt.Errorf("annotations: %w", err)
	}
	var ins []Input
	for _, sg := range segs {
		first := sg.FirstRecord * spr
		ins = append(ins, Input{
			RecordingID: recID, SubjectKey: subject,
			Labels: labels, PhysRange: ranges, Rate: rate,
			Len: sg.Records * spr, StartS: sg.Start, FirstSample: first,
			Src: &edfSource{r: r, sigs: src.sigs, scale: src.scale, first: first}, States: states,
		})
	}
	return ins, warns, nil
}

func formatS(t float64) string { return fmt.Sprintf("%.3f s", t) }
