package synth

import (
	"fmt"
	"io"
	"math"
	"math/rand/v2"
	"slices"
)

// Random streams: each part of the recording draws from its own stream so
// that, for example, adding an ECG channel does not move the events.
const (
	streamEvents = iota + 1
	streamLayout
	streamNoise
	streamECG
	streamStates
)

// Generator streams a synthetic recording sample by sample. The truth table
// and state spans are known before the first sample is read.
type Generator struct {
	cfg    Config
	labels []string
	kinds  []Kind
	ecgCh  int // −1 if absent
	eogCh  int
	n      int // total samples
	pos    int // next sample to produce
	states []StateSpan
	plans  []*plan
	first  int // first plan that may still touch pos
	bg     *background
	ecg    *ecgSource
	truth  []Event
}

// chunkError reports a destination buffer of the wrong shape.
type chunkError struct {
	Channel   int // −1 when the number of channels is wrong
	Got, Want int
}

func (e *chunkError) Error() string {
	if e.Channel < 0 {
		return fmt.Sprintf("synth: chunk has %d channels, want %d", e.Got, e.Want)
	}
	return fmt.Sprintf("synth: chunk channel %d has %d samples, want %d", e.Channel, e.Got, e.Want)
}

// Unwrap gives ErrInput, for errors.Is.
func (e *chunkError) Unwrap() error { return ErrInput }

// NewGenerator validates cfg, lays out the sources and schedules the events.
func NewGenerator(cfg Config) (*Generator, error) {
	c, err := cfg.withDefaults()
	if err != nil {
		return nil, err
	}
	stream := func(k uint64) *rand.Rand { return rand.New(rand.NewPCG(c.Seed, k)) }
	layout := stream(streamLayout)
	if c.AlphaFreq == 0 {
		c.AlphaFreq = uni(layout, 8.5, 11)
	}
	if c.Focus == ([3]float64{}) {
		c.Focus = cortical(layout)
	}
	g := &Generator{cfg: c, ecgCh: -1, eogCh: -1}
	g.labels = slices.Clone(c.Electrodes)
	for range c.Electrodes {
		g.kinds = append(g.kinds, EEG)
	}
	if !c.OmitECG {
		g.ecgCh = len(g.labels)
		g.labels, g.kinds = append(g.labels, "ECG"), append(g.kinds, ECG)
	}
	if !c.OmitEOG {
		g.eogCh = len(g.labels)
		g.labels, g.kinds = append(g.labels, "EOG"), append(g.kinds, EOG)
	}
	g.n = int(math.Round(c.Duration * c.Rate))
	g.states = c.States
	if g.states == nil {
		g.states = []StateSpan{{State: Awake, Start: 0, End: c.Duration}}
		if !c.AwakeOnly {
			g.states = drawStates(stream(streamStates), c.Duration)
		}
	}
	if g.bg, err = newBackground(&c, layout, stream(streamNoise)); err != nil {
		return nil, err
	}
	g.ecg = newECG(stream(streamECG))
	m := &eventMaker{cfg: &c, nEEG: len(c.Electrodes), nChan: len(g.labels), eog: g.eogCh, focus: unit(c.Focus), bg: g.bg}
	if g.plans, err = schedule(stream(streamEvents), m, g.n, g.states); err != nil {
		return nil, err
	}
	for _, p := range g.plans {
		g.truth = append(g.truth, p.ev)
	}
	return g, nil
}

// Labels returns the channel labels: the EEG electrodes, then ECG and EOG.
func (g *Generator) Labels() []string { return slices.Clone(g.labels) }

// Kinds returns the signal type of each channel.
func (g *Generator) Kinds() []Kind { return slices.Clone(g.kinds) }

// Rate returns the sampling rate in Hz.
func (g *Generator) Rate() float64 { return g.cfg.Rate }

// Len returns the total number of samples per channel.
func (g *Generator) Len() int { return g.n }

// Truth returns the events, ordered by onset.
func (g *Generator) Truth() []Event { return slices.Clone(g.truth) }

// States returns the vigilance spans.
func (g *Generator) States() []StateSpan { return slices.Clone(g.states) }

// Config returns the configuration with defaults and drawn subject
// parameters (alpha frequency, focus) filled in.
func (g *Generator) Config() Config { return g.cfg }

// Read fills dst[channel][0:k] with the next k samples in µV, where k is the
// smaller of len(dst[0]) and the samples left, and returns k. It returns
// 0, io.EOF once the recording is exhausted. The output does not depend on
// how the recording is cut into chunks.
func (g *Generator) Read(dst [][]float32) (int, error) {
	if len(dst) != len(g.labels) {
		return 0, &chunkError{Channel: -1, Got: len(dst), Want: len(g.labels)}
	}
	k := min(len(dst[0]), g.n-g.pos)
	for c := range dst {
		if len(dst[c]) < k {
			return 0, &chunkError{Channel: c, Got: len(dst[c]), Want: k}
		}
	}
	if k <= 0 {
		if g.pos >= g.n {
			return 0, io.EOF
		}
		return 0, nil
	}
	nEEG := len(g.cfg.Electrodes)
	for i := range k {
		t := float64(g.pos+i) / g.cfg.Rate
		g.bg.step(drowsiness(g.states, t))
		for c := range nEEG {
			dst[c][i] = float32(g.bg.eeg(c))
		}
		if g.ecgCh >= 0 {
			dst[g.ecgCh][i] = float32(g.ecg.at(t))
		}
		if g.eogCh >= 0 {
			dst[g.eogCh][i] = float32(g.bg.eogNoise())
		}
	}
	lo, hi := g.pos, g.pos+k // [lo, hi)
	for g.first < len(g.plans) && g.plans[g.first].peak+g.plans[g.first].post < lo {
		g.first++
	}
	for _, p := range g.plans[g.first:] {
		if p.peak-p.pre >= hi {
			break
		}
		g.render(dst, p, lo, hi, nEEG)
	}
	g.pos = hi
	return k, nil
}

// render applies one event's attenuation to the ongoing activity and adds
// its waveform, for the samples of [lo, hi).
func (g *Generator) render(dst [][]float32, p *plan, lo, hi, nEEG int) {
	if p.att != nil {
		s := p.peak + p.attOff
		for n := max(lo, s); n < min(hi, s+len(p.att)); n++ {
			a := p.att[n-s]
			for c, w := range p.attW {
				dst[c][n-lo] *= float32(1 - a*w)
			}
		}
	}
	s := p.peak - p.pre
	if p.tmpl != nil {
		for n := max(lo, s); n < min(hi, s+len(p.tmpl)); n++ {
			v := p.tmpl[n-s]
			for c, gain := range p.gains {
				if gain != 0 {
					dst[c][n-lo] += float32(v * gain)
				}
			}
		}
	}
	for c, x := range p.perChan {
		for n := max(lo, s); n < min(hi, s+len(x)); n++ {
			dst[c][n-lo] += float32(x[n-s])
		}
	}
}

// Generate produces a whole recording in memory.
func Generate(cfg Config) (*Recording, error) {
	g, err := NewGenerator(cfg)
	if err != nil {
		return nil, err
	}
	rec := g.header()
	rec.Data = make([][]float32, len(g.labels))
	for c := range rec.Data {
		rec.Data[c] = make([]float32, g.n)
	}
	if _, err := g.Read(rec.Data); err != nil {
		return nil, err
	}
	return rec, nil
}

// GenerateTo streams a recording to fn in chunks of at most chunk samples
// per channel (the last may be shorter). The chunk slices are reused between
// calls. It returns the recording without Data.
func GenerateTo(cfg Config, chunk int, fn func(chunk [][]float32) error) (*Recording, error) {
	if chunk <= 0 {
		return nil, &ConfigError{Field: "chunk", Value: chunk, Reason: "must be positive"}
	}
	g, err := NewGenerator(cfg)
	if err != nil {
		return nil, err
	}
	buf := make([][]float32, len(g.labels))
	for c := range buf {
		buf[c] = make([]float32, chunk)
	}
	for {
		k, err := g.Read(buf)
		if err == io.EOF {
			return g.header(), nil
		}
		if err != nil {
			return nil, err
		}
		view := make([][]float32, len(buf))
		for c := range buf {
			view[c] = buf[c][:k]
		}
		if err := fn(view); err != nil {
			return nil, err
		}
	}
}

func (g *Generator) header() *Recording {
	return &Recording{Labels: g.Labels(), Kinds: g.Kinds(), Rate: g.cfg.Rate, Truth: g.Truth(), States: g.States()}
}
