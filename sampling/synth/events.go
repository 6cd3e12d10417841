package synth

import (
	"cmp"
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"strings"
)

// forwardError reports a forward model answer that cannot be used.
type forwardError struct {
	Pos, Moment [3]float64
	Got, Want   int // lengths; equal when the values are all zero or not finite
}

func (e *forwardError) Error() string {
	if e.Got != e.Want {
		return fmt.Sprintf("synth: forward model returned %d potentials for %d electrodes (dipole at %v)", e.Got, e.Want, e.Pos)
	}
	return fmt.Sprintf("synth: forward model returned no usable field for dipole at %v moment %v", e.Pos, e.Moment)
}

// Unwrap gives ErrInput, for errors.Is.
func (e *forwardError) Unwrap() error { return ErrInput }

// plan is an event with its rendering relative to the peak sample.
type plan struct {
	ev      Event
	peak    int       // sample index of the peak, set on placement
	pre     int       // samples before the peak touched by the waveform
	post    int       // samples after the peak touched by waveform or attenuation
	tmpl    []float64 // unit waveform from peak−pre
	gains   []float64 // per channel (all channels), multiplies tmpl
	perChan [][]float64
	attOff  int       // attenuation start, samples after the peak
	att     []float64 // attenuation depth envelope
	attW    []float64 // per EEG channel weight of attenuation
}

// eventMaker builds event plans for one recording.
type eventMaker struct {
	cfg   *Config
	nEEG  int
	nChan int
	eog   int // channel index of EOG, or −1
	focus [3]float64
	bg    *background // for the dominant rhythm that criterion 2 compares with
}

func uni(r *rand.Rand, lo, hi float64) float64 { return lo + (hi-lo)*r.Float64() }

func logUni(r *rand.Rand, lo, hi float64) float64 {
	return math.Exp(uni(r, math.Log(lo), math.Log(hi)))
}

// field projects a dipole and returns per-channel gains scaled so that the
// largest absolute EEG gain is 1, with that channel.
func (m *eventMaker) field(pos, mom [3]float64) ([]float64, int, error) {
	v := m.cfg.Forward(m.cfg.Electrodes, pos, mom)
	if len(v) != m.nEEG {
		return nil, 0, &forwardError{Pos: pos, Moment: mom, Got: len(v), Want: m.nEEG}
	}
	best := -1
	for c, x := range v {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return nil, 0, &forwardError{Pos: pos, Moment: mom, Got: len(v), Want: m.nEEG}
		}
		if best < 0 || math.Abs(x) > math.Abs(v[best]) {
			best = c
		}
	}
	if v[best] == 0 {
		return nil, 0, &forwardError{Pos: pos, Moment: mom, Got: len(v), Want: m.nEEG}
	}
	g := make([]float64, m.nChan)
	for c, x := range v {
		g[c] = x / math.Abs(v[best])
	}
	return g, best, nil
}

// orient draws a moment for a source at unit direction d: radial half the
// time (surface negative 85 % of those), tangential a quarter, oblique (45°)
// a quarter.
func orient(r *rand.Rand, d [3]float64) ([3]float64, string) {
	sign := -1.0
	if r.Float64() < 0.15 {
		sign = 1
	}
	switch u := r.Float64(); {
	case u < 0.5:
		return scale(d, sign), "radial"
	case u < 0.75:
		return tangent(r, d), "tangential"
	default:
		t := tangent(r, d)
		return unit(add(scale(d, sign*math.Sqrt2/2), scale(t, math.Sqrt2/2))), "oblique"
	}
}

// ied builds a true IED near the subject's focus. About half are built to
// meet c1, c3, c4, c5 and c6; the rest are symmetric (fail c3), lack a slow
// wave (fail c4), lack background disruption (fail c5), or lack both c4 and
// c5. c2 depends on the background where it lands and is decided on
// placement, which keeps only places where the IED meets at least four.
func (m *eventMaker) ied(r *rand.Rand) (*plan, error) {
	e := Event{IsIED: true, Meets: [6]bool{true, false, true, true, true, true}} // c2 is decided on placement
	if r.Float64() < 0.6 {
		e.Kind, e.Duration = Spike, uni(r, 25, 65) // Kane et al. (2017): spike 20 to <70 ms
	} else {
		e.Kind, e.Duration = SharpWave, uni(r, 75, 190) // Kane et al. (2017): sharp wave 70–200 ms
	}
	u := r.Float64()
	symmetric := u < 0.12
	noSlow := (u >= 0.12 && u < 0.27) || (u >= 0.42 && u < 0.47)
	noDisrupt := u >= 0.27 && u < 0.47
	// F/R = 1.63–2.57: clearly asymmetric; R up to 0.42 of D (F/R 1.38)
	// lay within the measurement's spread of the 1.3 cutoff (GENERATOR.md)
	e.Rise = e.Duration * uni(r, 0.28, 0.38)
	if symmetric {
		e.Rise, e.Meets[C3Asymmetry] = e.Duration/2, false
	}
	e.overshoot, e.slowAmp, e.SlowWave = uni(r, 0.3, 0.5), uni(r, 0.6, 1), uni(r, 200, 400)
	if noSlow {
		e.slowAmp, e.SlowWave, e.Meets[C4SlowWave] = 0, 0, false
	}
	e.Attenuation, e.AttenuationMs = uni(r, 0.5, 0.8), uni(r, 500, 1000)
	if noDisrupt {
		e.Attenuation, e.AttenuationMs, e.Meets[C5Disruption] = 0, 0, false
	}
	d := jitter(r, m.focus, 15)
	e.DipolePos = scale(d, uni(r, 0.7, 0.85))
	e.DipoleMoment, e.Orientation = orient(r, d)
	e.SNR = logUni(r, 3, 6)
	return m.dipolar(e)
}

// vertex builds a vertex sharp transient of drowsiness: symmetric, no slow
// wave, no disruption, radial source under Cz. Meets c1 and c6, and c2 where
// its duration differs from the background's (decided on placement).
func (m *eventMaker) vertex(r *rand.Rand) (*plan, error) {
	e := Event{Kind: Vertex, Meets: [6]bool{C1Spiky: true, C6Field: true}}
	e.Duration = uni(r, 90, 170)
	e.Rise = e.Duration / 2
	e.overshoot = uni(r, 0.3, 0.45)
	d := jitter(r, dirCz, 8)
	e.DipolePos, e.DipoleMoment, e.Orientation = scale(d, 0.75), scale(d, -1), "radial"
	e.SNR = uni(r, 2, 5)
	return m.dipolar(e)
}

// wicket builds a short train of symmetric sharp alpha-band waves over one
// temporal region, without slow wave or disruption. Meets c1 and c6, and c2
// only where its half period differs from the background's (decided on
// placement).
func (m *eventMaker) wicket(r *rand.Rand) (*plan, error) {
	e := Event{Kind: Wicket, Meets: [6]bool{C1Spiky: true, C6Field: true}}
	e.Duration = 500 / uni(r, 7.5, 11) // half period of the train
	e.Rise = e.Duration / 2
	e.waves = []float64{0.6, 1, 0.8, 0.6}[:2+r.IntN(3)]
	side := dirT7
	if r.IntN(2) == 1 {
		side = dirT8
	}
	d := jitter(r, side, 10)
	e.DipolePos, e.DipoleMoment, e.Orientation = scale(d, 0.8), scale(d, -1), "radial"
	e.SNR = uni(r, 1.5, 3)
	return m.dipolar(e)
}

// dipolar finishes a plan whose unit waveform is given by shape and whose
// field comes from the event's dipole.
func (m *eventMaker) dipolar(e Event) (*plan, error) {
	g, best, err := m.field(e.DipolePos, e.DipoleMoment)
	if err != nil {
		return nil, err
	}
	e.Amplitude = e.SNR * m.cfg.BackgroundRMS
	e.PeakElectrode = m.cfg.Electrodes[best]
	e.Polarity = sign(g[best])
	p := m.sampled(&e)
	p.gains = g
	for c := range g {
		g[c] *= e.Amplitude
	}
	if e.Attenuation > 0 {
		fall := e.Duration - e.Rise
		p.attOff = msToSamples(fall+overshootMs(fall)+e.SlowWave, m.cfg.Rate)
		n := msToSamples(e.AttenuationMs, m.cfg.Rate)
		p.att = make([]float64, n+1)
		for i := range p.att {
			p.att[i] = attenuationEnvelope(float64(i)*1000/m.cfg.Rate, e.AttenuationMs, e.Attenuation)
		}
		p.attW = make([]float64, m.nEEG)
		for c := range p.attW {
			p.attW[c] = math.Abs(g[c]) / e.Amplitude
		}
		p.post = max(p.post, p.attOff+n)
	}
	p.ev = e
	return p, nil
}

// sampled samples the event's unit waveform around its peak.
func (m *eventMaker) sampled(e *Event) *plan {
	preMs, postMs := support(e)
	pre, post := msToSamples(preMs, m.cfg.Rate)+1, msToSamples(postMs, m.cfg.Rate)+1
	t := make([]float64, pre+post+1)
	for i := range t {
		t[i] = shape(e, float64(i-pre)*1000/m.cfg.Rate)
	}
	return &plan{ev: *e, pre: pre, post: post, tmpl: t}
}

// blink builds an eye blink: a smooth symmetric positive deflection over
// Fp1/Fp2 falling off steeply backwards, large on the EOG channel. Meets at
// most c2, where its 200–400 ms length differs from the background's.
func (m *eventMaker) blink(r *rand.Rand) (*plan, bool) {
	e := Event{Kind: Blink, Polarity: 1}
	e.Duration = uni(r, 200, 400)
	e.Rise = e.Duration / 2
	e.Amplitude = uni(r, 80, 200)
	g := make([]float64, m.nChan)
	best := -1
	for c, name := range m.cfg.Electrodes {
		w := blinkWeight(name) * uni(r, 0.95, 1.05)
		g[c] = w * e.Amplitude
		if w > 0 && (best < 0 || g[c] > g[best]) {
			best = c
		}
	}
	if best < 0 || blinkWeight(m.cfg.Electrodes[best]) < 1 {
		return nil, false // no frontopolar electrode to show it
	}
	for c := range m.nEEG {
		g[c] *= e.Amplitude / g[best]
	}
	if m.eog >= 0 {
		g[m.eog] = 2.5 * e.Amplitude
	}
	e.PeakElectrode = m.cfg.Electrodes[best]
	e.SNR = e.Amplitude / m.cfg.BackgroundRMS
	p := m.sampled(&e)
	p.gains = g
	return p, true
}

// blinkWeight is the relative size of a blink at an electrode: maximal
// frontopolar, falling off over a few centimetres (common practice).
func blinkWeight(name string) float64 {
	n := strings.ToLower(name)
	switch {
	case strings.HasPrefix(n, "fp"):
		return 1
	case strings.HasPrefix(n, "af"):
		return 0.55
	case n == "f7" || n == "f8" || n == "f9" || n == "f10":
		return 0.35
	case strings.HasPrefix(n, "f") && !strings.HasPrefix(n, "ft") && !strings.HasPrefix(n, "fc"):
		return 0.25
	case strings.HasPrefix(n, "fc") || strings.HasPrefix(n, "ft"):
		return 0.08
	}
	return 0.02
}

// pop builds a single-electrode pop: an abrupt one-sample rise and an
// exponential decay, on one electrode only. Meets c3, and c2 where its decay
// differs from the background's half-period (monophasic, so not c1; no
// field, so not c6).
func (m *eventMaker) pop(r *rand.Rand) *plan {
	e := Event{Kind: Pop, Meets: [6]bool{C3Asymmetry: true}}
	e.Duration = uni(r, 80, 250)
	e.Rise = 1000 / m.cfg.Rate
	e.Amplitude = uni(r, 50, 200)
	e.Polarity = 1 - 2*r.IntN(2)
	c := r.IntN(m.nEEG)
	e.PeakElectrode = m.cfg.Electrodes[c]
	e.SNR = e.Amplitude / m.cfg.BackgroundRMS
	p := m.sampled(&e)
	p.gains = make([]float64, m.nChan)
	p.gains[c] = float64(e.Polarity) * e.Amplitude
	return p
}

// muscleUnclear are the criteria a muscle burst is not built to meet or to
// fail. Its potentials are band-passed noise: the label "pointed" (c1) and
// the potential's duration (c2) describe its raw 4–8 ms potentials, which
// the EEG's 70 Hz low-pass smooths and the finder's 20 ms minimum main
// phase cannot anchor on, so a candidate on a burst is one of its random
// slower wiggles; its asymmetry (c3) is whatever the noise gives.
var muscleUnclear = [6]bool{C1Spiky: true, C2Duration: true, C3Asymmetry: true}

// muscle builds a burst of high-frequency activity over the electrodes near
// a frontotemporal landmark, independent on each channel. Meets c1 (its
// potentials are pointed), and c2 where its largest potential is shorter
// than half the background's half-period (nearly always).
func (m *eventMaker) muscle(r *rand.Rand) (*plan, error) {
	// Its potentials are random: the field (c6), the absence of a slow wave
	// (c4) and of disruption (c5) are built, their shape is not.
	e := Event{Kind: Muscle, Meets: [6]bool{C1Spiky: true}, Unclear: muscleUnclear}
	site := []([3]float64){dirF7, dirT7, dirF8, dirT8}[r.IntN(4)]
	d := jitter(r, site, 10)
	// The neighbourhood is where a superficial radial source would be seen.
	w, _, err := m.field(scale(d, 0.75), d)
	if err != nil {
		return nil, err
	}
	e.Duration = uni(r, 100, 400)
	n := msToSamples(e.Duration, m.cfg.Rate) + 1
	p := &plan{perChan: make([][]float64, m.nChan)}
	best, bestI, bestV := -1, 0, 0.0
	// At least the three nearest electrodes, and any seeing 30 % of the
	// largest field.
	order := make([]int, m.nEEG)
	for c := range order {
		order[c] = c
	}
	slices.SortStableFunc(order, func(a, b int) int { return cmp.Compare(math.Abs(w[b]), math.Abs(w[a])) })
	for rank, c := range order {
		if rank >= 3 && math.Abs(w[c]) < 0.3 {
			break
		}
		amp := uni(r, 1, 2.5) * m.cfg.BackgroundRMS * math.Abs(w[c])
		x := make([]float64, n)
		prev, prevD := r.NormFloat64(), 0.0
		var ss float64
		for i := range x {
			white := r.NormFloat64()
			diff := white - prev // first difference and two-tap mean: band-pass peaking near rate/4
			x[i], prev, prevD = 0.5*(diff+prevD), white, diff
			ss += x[i] * x[i]
		}
		rms := math.Sqrt(ss / float64(n))
		for i := range x {
			x[i] *= amp / rms * math.Pow(math.Sin(math.Pi*float64(i)/float64(n-1)), 2)
			if a := math.Abs(x[i]); a > bestV {
				best, bestI, bestV = c, i, a
			}
		}
		p.perChan[c] = x
	}
	e.PeakElectrode = m.cfg.Electrodes[best]
	e.Polarity = sign(p.perChan[best][bestI])
	// the largest potential's own main phase, turning point to turning
	// point, is the duration criterion 2 compares
	x, s := p.perChan[best], float64(e.Polarity)
	lo, hi := bestI, bestI
	for lo > 0 && s*x[lo-1] < s*x[lo] {
		lo--
	}
	for hi < n-1 && s*x[hi+1] < s*x[hi] {
		hi++
	}
	e.phaseMs = float64(hi-lo) * 1000 / m.cfg.Rate
	e.Amplitude = bestV
	e.SNR = bestV / m.cfg.BackgroundRMS
	e.Rise = float64(bestI) * 1000 / m.cfg.Rate
	p.pre, p.post = bestI, n-1-bestI
	p.ev = e
	return p, nil
}

func sign(x float64) int {
	if x < 0 {
		return -1
	}
	return 1
}

func msToSamples(ms, rate float64) int { return int(math.Ceil(ms * rate / 1000)) }
