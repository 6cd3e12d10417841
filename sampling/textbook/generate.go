package textbook

import (
	"fmt"
	"math"
	"math/rand/v2"
	"sort"

	"github.com/quorate-eeg/quorate/sampling/synth"
)

// Generate makes one recording: EEG channels only, µV, common average
// reference, truth rows ordered by onset, and the vigilance states (awake,
// drowsy, n2). The same Config gives the same recording.
func Generate(cfg Config) (*synth.Recording, error) {
	c, err := cfg.withDefaults()
	if err != nil {
		return nil, err
	}
	r := rand.New(rand.NewPCG(c.Seed, 0x54455854)) // "TEXT"
	if c.AlphaFreq == 0 {
		c.AlphaFreq = uni(r, 8.5, 11.5)
	}
	if c.Focus == ([3]float64{}) {
		c.Focus = drawFocus(r)
	}
	h, err := newHead(c.Electrodes)
	if err != nil {
		return nil, err
	}
	n := int(c.Duration * c.Rate)
	spans := drawStates(r, c.Duration)
	bg, bgRMS := background(r, h, spans, c.Rate, n, c.AlphaFreq)
	m := &maker{r: r, h: h, rate: c.Rate, nch: len(c.Electrodes), alpha: c.AlphaFreq, focus: c.Focus, bgRMS: bgRMS}
	events := m.schedule(spans, c)

	for _, b := range events {
		if a := b.atten; a != nil {
			for k := 0; k < a.n; k++ {
				if i := a.start + k; i >= 0 && i < n {
					w := 1 - a.depth*hann(float64(k), float64(a.n))
					for ch := range bg {
						bg[ch][i] *= 1 - (1-w)*a.gain[ch]
					}
				}
			}
		}
	}
	var truth []synth.Event
	for _, b := range events {
		for ch := range b.w {
			for k, y := range b.w[ch] {
				if i := b.start + k; i < n {
					bg[ch][i] += y
				}
			}
		}
		for _, rw := range b.rows {
			ev := rw.ev
			k := rw.peak
			best := 0
			for ch := range b.w {
				if math.Abs(b.w[ch][k]) > math.Abs(b.w[best][k]) {
					best = ch
				}
			}
			ev.PeakElectrode = c.Electrodes[best]
			ev.Amplitude = math.Abs(b.w[best][k])
			ev.Polarity = 1
			if b.w[best][k] < 0 {
				ev.Polarity = -1
			}
			ev.SNR = ev.Amplitude / bgRMS
			ev.Onset = float64(b.start+k) / c.Rate
			ev.Start = float64(b.start) / c.Rate
			ev.End = float64(b.start+len(b.w[0])-1) / c.Rate
			truth = append(truth, ev)
		}
	}
	sort.SliceStable(truth, func(i, j int) bool { return truth[i].Onset < truth[j].Onset })
	for i := range truth {
		truth[i].ID = fmt.Sprintf("tb-%04d", i+1)
	}
	rec := &synth.Recording{Labels: append([]string(nil), c.Electrodes...), Rate: c.Rate, Truth: truth, States: merged(spans)}
	rec.Kinds = make([]synth.Kind, len(c.Electrodes))
	rec.Data = make([][]float32, len(c.Electrodes))
	for ch := range bg {
		rec.Kinds[ch] = synth.EEG
		rec.Data[ch] = make([]float32, n)
		for i, v := range bg[ch] {
			rec.Data[ch][i] = float32(v)
		}
	}
	return rec, nil
}

// drawFocus draws the direction of a subject's irritative zone: temporal
// (anterior to mid temporal, either side) half the time, else a frontal,
// central, parietal or occipital convexity point.
func drawFocus(r *rand.Rand) [3]float64 {
	s := sign(r)
	if r.IntN(2) == 0 {
		return unitv([3]float64{s * 0.9, uni(r, -0.1, 0.35), uni(r, -0.05, 0.25)})
	}
	cands := [][3]float64{{0.4, 0.75, 0.5}, {0.45, 0.1, 0.85}, {0.5, -0.55, 0.65}, {0.3, -0.9, 0.2}}
	f := cands[r.IntN(len(cands))]
	f[0] *= s
	return unitv(f)
}

// schedule lays events one after another with exponential gaps (Poisson
// arrivals at the combined rate), never overlapping, each an IED with
// probability IEDRate/(IEDRate+LookalikeRate), else a look-alike that
// belongs to the state the event falls in.
func (m *maker) schedule(spans []span, c Config) []*built {
	total := c.IEDRate + c.LookalikeRate
	if total == 0 {
		return nil
	}
	var out []*built
	t := 1.0 + m.r.ExpFloat64()*60/total
	for t < c.Duration-3 {
		s := stateAt(spans, t)
		var b *built
		if m.r.Float64() < c.IEDRate/total {
			b = m.ied(t, s)
		} else {
			b = m.lookalike(t, s)
		}
		end := float64(b.start+len(b.w[0])) / m.rate
		if end >= c.Duration {
			break
		}
		out = append(out, b)
		t = end + 0.5 + m.r.ExpFloat64()*60/total
	}
	return out
}

// lookalike draws a benign variant or artefact that occurs in state s
// (Niedermeyer's Electroencephalography, chapters on normal variants, sleep
// and artefacts; from memory).
func (m *maker) lookalike(t float64, s span) *built {
	type pick struct {
		w float64
		f func() *built
	}
	var ps []pick
	switch {
	case s.State == Awake && s.EyesOpen:
		ps = []pick{{3, func() *built { return m.blink(t, s) }}, {2, func() *built { return m.eyeMovement(t) }},
			{2, func() *built { return m.lambda(t, s) }}, {1, func() *built { return m.mu(t) }},
			{2, func() *built { return m.muscle(t, s) }}, {1, func() *built { return m.chewing(t, s) }},
			{1, func() *built { return m.pop(t, s) }}, {0.3, func() *built { return m.ecg(t, s) }}}
	case s.State == Awake:
		ps = []pick{{1, func() *built { return m.blink(t, s) }}, {1, func() *built { return m.mu(t) }},
			{2, func() *built { return m.muscle(t, s) }}, {1, func() *built { return m.chewing(t, s) }},
			{1, func() *built { return m.pop(t, s) }}, {0.3, func() *built { return m.ecg(t, s) }}}
	case s.State == Drowsy:
		ps = []pick{{2, func() *built { return m.vertex(t, s) }}, {1.5, func() *built { return m.posts(t, s) }},
			{1.5, func() *built { return m.wicket(t) }}, {1.5, func() *built { return m.smallSharp(t, s) }},
			{1, func() *built { return m.positive146(t) }}, {1, func() *built { return m.eyeMovement(t) }},
			{1, func() *built { return m.muscle(t, s) }}, {1, func() *built { return m.pop(t, s) }},
			{0.3, func() *built { return m.ecg(t, s) }}}
	default:
		ps = []pick{{2, func() *built { return m.kComplex(t) }}, {2, func() *built { return m.vertex(t, s) }},
			{1.5, func() *built { return m.posts(t, s) }}, {1.5, func() *built { return m.smallSharp(t, s) }},
			{1, func() *built { return m.wicket(t) }}, {1, func() *built { return m.positive146(t) }},
			{1, func() *built { return m.pop(t, s) }}, {0.3, func() *built { return m.ecg(t, s) }}}
	}
	tot := 0.0
	for _, p := range ps {
		tot += p.w
	}
	u := m.r.Float64() * tot
	for _, p := range ps[:len(ps)-1] {
		if u < p.w {
			return p.f()
		}
		u -= p.w
	}
	return ps[len(ps)-1].f()
}
