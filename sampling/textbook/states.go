package textbook

import (
	"math/rand/v2"

	"github.com/quorate-eeg/quorate/sampling/synth"
)

// Vigilance states as sampling/detect names them; N2 is this generator's own.
const (
	Awake  = synth.Awake
	Drowsy = synth.Drowsy
	N2     = synth.State("n2")
)

// span is a stretch of one state; eyes open only while awake.
type span struct {
	State      synth.State
	EyesOpen   bool
	Start, End float64
}

// drawStates lays out a routine recording's course: awake with eyes closed,
// eyes opened, closed again, then drowsiness (N1) and light sleep (N2), the
// sequence a routine EEG with sleep follows (Schomer & Lopes da Silva 2018,
// ch. on normal EEG of wakefulness and sleep; from memory). The shares are
// jittered so recordings differ.
func drawStates(r *rand.Rand, dur float64) []span {
	shares := []struct {
		s    synth.State
		open bool
		w    float64
	}{
		{Awake, false, uni(r, 0.15, 0.25)},
		{Awake, true, uni(r, 0.1, 0.2)},
		{Awake, false, uni(r, 0.05, 0.15)},
		{Drowsy, false, uni(r, 0.2, 0.3)},
		{N2, false, uni(r, 0.2, 0.35)},
	}
	tot := 0.0
	for _, s := range shares {
		tot += s.w
	}
	var out []span
	t := 0.0
	for i, s := range shares {
		end := t + dur*s.w/tot
		if i == len(shares)-1 {
			end = dur
		}
		out = append(out, span{State: s.s, EyesOpen: s.open, Start: t, End: end})
		t = end
	}
	return out
}

// stateAt returns the span holding t s.
func stateAt(spans []span, t float64) span {
	for _, s := range spans {
		if t < s.End {
			return s
		}
	}
	return spans[len(spans)-1]
}

// merged returns the spans as synth.StateSpans, joining neighbours of one
// state (eyes open and closed are both "awake").
func merged(spans []span) []synth.StateSpan {
	var out []synth.StateSpan
	for _, s := range spans {
		if n := len(out); n > 0 && out[n-1].State == s.State {
			out[n-1].End = s.End
			continue
		}
		out = append(out, synth.StateSpan{State: s.State, Start: s.Start, End: s.End})
	}
	return out
}
