package synth

import (
	"math"
	"math/cmplx"
)

// Dominant background rhythm search grid, Hz: delta to beta in 0.5 Hz steps
// (common practice).
const (
	domLowHz  = 1.0
	domHighHz = 30.0
	domStepHz = 0.5
)

// arPower returns gain²/|A(e^{iω})|², the power spectral density (up to a
// factor common to all sources) at f Hz of the all-pole filter with
// coefficients a[1..p] driven by unit white noise and scaled by gain.
func arPower(a []float64, gain, f, fs float64) float64 {
	w := 2 * math.Pi * f / fs
	s := complex(1, 0)
	for k, ak := range a {
		s += complex(ak, 0) * cmplx.Exp(complex(0, -w*float64(k+1)))
	}
	m := cmplx.Abs(s)
	return gain * gain / (m * m)
}

// dominantHz returns the dominant background frequency at EEG channel c at
// drowsiness d, from the generator's own source spectra (not from a sample):
//
//	f_bg = argmax over 1–30 Hz of f·P_c(f),
//	P_c(f) = Σ_k g_ck² s_k(d)² S_k(f) + g_local² S_pink(f)
//
// with g_ck the mixing gain of source k at the channel, s_k(d) the state
// scaling of alpha (1−0.75d, times the envelope's RMS √(1+0.4²)) and theta
// (0.25+0.75d), and S_k the exact AR spectrum of the source. Weighting by f
// reads the spectrum per octave (power per unit log-frequency), so the 1/f
// slope does not make the lowest frequency win by default wherever a rhythm
// stands out (Kane et al. 2017 compare a transient's duration with that of
// "the ongoing background activity").
func (b *background) dominantHz(c int, d, fs float64) float64 {
	f, v := b.perOctave(c, d, fs)
	best := 0
	for i := range v {
		if v[i] > v[best] {
			best = i
		}
	}
	return f[best]
}

// perOctave returns the search grid and f·P_c(f) on it (see dominantHz).
func (b *background) perOctave(c int, d, fs float64) (freq, v []float64) {
	for f := domLowHz; f <= domHighHz+1e-9; f += domStepHz {
		pink := arPower(b.src[0].a, b.src[0].gain, f, fs)
		var p float64
		for k, g := range b.mix[c] {
			s := pink
			if k >= b.nPink {
				s = arPower(b.src[k].a, b.src[k].gain, f, fs)
			}
			p += g * g * b.stateGain2(k, d) * s
		}
		p += b.localG * b.localG * pink
		freq, v = append(freq, f), append(v, f*p)
	}
	return freq, v
}

// c2Factor is how far, as a ratio, a transient's main phase must be from the
// background's half-period to count as a different duration: half or twice
// (common practice).
const c2Factor = 2.0

// mainPhaseMs is the base-to-base length of the event's main phase, ms, the
// duration criterion 2 compares: for a pop the one-sample step plus the decay
// to a tenth of its height (τ ln 10, where its slope has fallen to a tenth);
// for a muscle burst one of its potentials, half a period at the band's peak
// near rate/4.
func mainPhaseMs(e *Event, rate float64) float64 {
	switch e.Kind {
	case Pop:
		return 1000/rate + e.Duration*math.Ln10
	case Muscle:
		return e.phaseMs
	}
	return e.Duration
}

// c2Margin is the clear margin of a criterion 2 label, in natural-log
// units of D/(T/2) on either side of ln c2Factor, and c2Rival the share of
// the dominant rhythm's power per octave at which another frequency that
// would reverse the label makes the label unclear. A duration is read off
// a few samples of a noisy wave and the background's period off seconds of
// it (measured durations scatter by a median of 0.25 in log against the
// built ones; sampling/detect/FEATURES.md, c2), so an event within 0.2 of
// the boundary, or over a background with two near-equal rhythms on either
// side of it, was not built to meet or to fail criterion 2: it is labelled
// by the nearer side and marked Unclear.
const (
	c2Margin = 0.2
	c2Rival  = 0.6
)

// differentDuration decides criterion 2 for an event peaking at EEG channel
// c at drowsiness d: met ⇔ |ln(D / (T/2))| ≥ ln 2, D the main-phase length
// and T the period of the dominant background rhythm there (dominantHz).
// unclear reports a label within c2Margin of the boundary, or one that a
// rival rhythm (c2Rival) would reverse.
func (m *eventMaker) differentDuration(e *Event, c int, d float64) (met, unclear bool) {
	D := mainPhaseMs(e, m.cfg.Rate)
	freq, v := m.bg.perOctave(c, d, m.cfg.Rate)
	best := 0
	for i := range v {
		if v[i] > v[best] {
			best = i
		}
	}
	dist := func(f float64) float64 { return math.Abs(math.Log(D/(500/f))) - math.Log(c2Factor) }
	x := dist(freq[best])
	e.C2DurationMs, e.BackgroundHalfMs = D, 500/freq[best]
	met = x >= 0
	unclear = math.Abs(x) < c2Margin
	for i := range v {
		if v[i] >= c2Rival*v[best] && (dist(freq[i]) >= 0) != met {
			unclear = true
		}
	}
	return met, unclear
}
