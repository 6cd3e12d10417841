package detect

import (
	"context"

	"github.com/quorate-eeg/quorate/sampling/candidate"
	"github.com/quorate-eeg/quorate/sampling/edf"
	"sync"
	"testing"

	"github.com/quorate-eeg/quorate/sampling/headmodel"
	"github.com/quorate-eeg/quorate/sampling/synth"
)

// memSource serves an in-memory recording as a signal.Source.
type memSource [][]float32

func (m memSource) ReadAt(ch int, start int64, dst []float32) error {
	copy(dst, m[ch][start:])
	return nil
}

// headForward is synth.Forward backed by the three-shell head of
// headmodel.DefaultHead: unit-sphere positions scaled to the scalp radius,
// potentials in µV per unit moment (the generator rescales amplitudes).
func headForward(electrodes []string, pos, moment [3]float64) []float64 {
	head := headmodel.DefaultHead()
	R := head.Radius()
	el := make([]headmodel.Vec3, len(electrodes))
	for i, n := range electrodes {
		p, ok := headmodel.Position(n)
		if !ok {
			p = headmodel.Vec3{0, 0, 1}
		}
		el[i] = p.Scale(R)
	}
	v := make([]float64, len(electrodes))
	head.Potentials(v, el, headmodel.Vec3(pos).Scale(R), headmodel.Vec3(moment))
	var mean float64
	for _, x := range v {
		mean += x
	}
	mean /= float64(len(v))
	for i := range v {
		v[i] = (v[i] - mean) * 1e6
	}
	return v
}

var (
	genOnce sync.Map
)

// generated returns a cached synthetic recording for a seed, at 256 Hz.
func generated(t testing.TB, seed uint64, minutes float64) *synth.Recording {
	t.Helper()
	return generatedAt(t, seed, minutes, 256)
}

// generatedAt is generated at another sampling rate.
func generatedAt(t testing.TB, seed uint64, minutes, rate float64) *synth.Recording {
	t.Helper()
	key := [3]float64{float64(seed), minutes, rate}
	if r, ok := genOnce.Load(key); ok {
		return r.(*synth.Recording)
	}
	rec, err := synth.Generate(synth.Config{
		Seed: seed, Duration: minutes * 60, Forward: headForward,
		IEDRate: 6, LookalikeRate: 6, Rate: rate,
	})
	if err != nil {
		t.Fatal(err)
	}
	genOnce.Store(key, rec)
	return rec
}

// inputOf wraps a synthetic recording's EEG channels as an Input.
func inputOf(rec *synth.Recording) Input {
	var labels []string
	var data memSource
	for i, k := range rec.Kinds {
		if k == synth.EEG {
			labels = append(labels, rec.Labels[i])
			data = append(data, rec.Data[i])
		}
	}
	var states []StateSpan
	for _, sp := range rec.States {
		states = append(states, StateSpan{Start: sp.Start, End: sp.End, State: string(sp.State)})
	}
	return Input{RecordingID: "synth", Labels: labels, Rate: rec.Rate, Len: int64(len(data[0])), Src: data, States: states}
}

// detectFileRows collects detectFile's rows.
func detectFileRows(s *settings, r *edf.Reader, recID string) ([]candidate.Row, []string, error) {
	var rows []candidate.Row
	warns, err := detectFile(context.Background(), s, r, recID, "", func(w []candidate.Row) error {
		rows = append(rows, w...)
		return nil
	})
	return rows, warns, err
}
