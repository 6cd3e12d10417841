package detect

import (
	"math"

	"gonum.org/v1/gonum/dsp/fourier"
)

// Dominant background rhythm search band, Hz (common practice: delta to beta).
const (
	bgLowHz  = 1.0
	bgHighHz = 30.0
	welchS   = 2.0 // Welch segment length, s: 0.5 Hz resolution
)

// durationRatio measures criterion 2, duration unlike the ongoing background
// (Kane et al. 2017):
//
//	c2 = |ln(D / (T/2))|
//
// with D the main-phase duration and T = 1/f_bg the period of the dominant
// background rhythm, so that a background wave of the same period (whose
// half-wave lasts T/2) scores 0. D is the main phase base to base when an
// opposite phase of at least phaseFloor follows it (oppositePhase), and
// otherwise the larger of that and the width to its return (waveDuration):
// a slow return is the duration only of a monophasic wave, while after a
// spike it runs into the after-going slow wave. When the phase after the
// main one is the larger, by more than a turning point's hysteresis (r > 1
// + turnTol, so that the near-equal phases of a rhythm keep theirs), the
// main phase is a wiggle on the flank of a larger wave, as c1 reads it
// (spikiness), most often the zero-phase low-pass's ringing lobe just
// before a pop's step; D is then that larger wave's (largerWave). f_bg is
// the frequency in 1–30 Hz maximising f·P(f), P the Welch (1967) power
// spectrum of the background ranges within specSpanS (16 s) of the peak
// (see trace.backgroundSpan) and within the event's vigilance state when
// the recording's annotations give it (trace.sameState; the whole span when
// that leaves no full segment): Hann-windowed, mean-removed 2 s segments
// with 50 % overlap, periodograms averaged. Weighting by f reads the spectrum per octave, so the steep 1/f
// slope of ongoing EEG does not make the lowest frequency win by default
// and a background rhythm such as alpha is found where present. Keeping to
// one state compares the event with the background it interrupts:
// drowsiness replaces the posterior alpha rhythm by slower activity
// (Berry et al. 2017, stage N1), and a spectrum reaching across a change of
// state averages two backgrounds. It also returns T/2 in ms (the
// c2_background_period_ms column holds the half-period the duration is
// compared with). NaN when no full segment fits.
func durationRatio(t *trace, ph phase, sc *scratch) (logRatio, halfMS float64) {
	fb := dominantHz(t.sameState(), ph.peak, specSpanS, sc)
	if math.IsNaN(fb) {
		fb = dominantHz(t, ph.peak, specSpanS, sc)
	}
	if math.IsNaN(fb) {
		return math.NaN(), math.NaN()
	}
	halfMS = 500 / fb
	r := oppositePhase(t, ph, sc)
	if r > 1+turnTol {
		ph = largerWave(t, ph)
		r = oppositePhase(t, ph, sc)
	}
	d := float64(ph.right - ph.left)
	if !(r >= phaseFloor) {
		d = waveDuration(t, ph, sc)
	}
	d = d / t.fs * 1000
	return math.Abs(math.Log(d / halfMS)), halfMS
}

// largerWave returns the main phase of the opposite-polarity wave whose
// extremum oppositePhase found after ph: the largest excursion of the other
// polarity within one main-phase duration, at most oppMaxS, after ph's
// right base, walked to its bases as the finder walks a detection's.
func largerWave(t *trace, ph phase) phase {
	D := min(ph.right-ph.left, int(math.Round(oppMaxS*t.fs)))
	q := ph.right
	for i := ph.right; i <= ph.right+D && i < t.hi; i++ {
		if -ph.sign*float64(t.x[i]) > -ph.sign*float64(t.x[q]) {
			q = i
		}
	}
	return mainPhase(t.x[:t.hi], q, -ph.sign, int(math.Ceil(maxPhaseS*t.fs)), 0)
}

// dominantHz returns the frequency in 1–30 Hz maximising f·P(f), P the
// Welch (1967) spectrum of the background ranges within span s of p (see
// trace.backgroundSpan), or NaN when no full segment fits.
func dominantHz(t *trace, p int, span float64, sc *scratch) float64 {
	n := int(math.Round(welchS * t.fs))
	sc.spectrumOf(n)
	// only the bins of the search band are read
	df := t.fs / float64(n)
	k0 := int(math.Ceil(bgLowHz / df))
	k1 := min(n/2, int(math.Floor(bgHighHz/df))+1)
	clear(sc.psd)
	segs := 0
	for _, r := range t.backgroundSpan(p, span) {
		for s := r[0]; s+n <= r[1]; s += n / 2 {
			var mean float64
			for _, v := range t.x[s : s+n] {
				mean += float64(v)
			}
			mean /= float64(n)
			for i, v := range t.x[s : s+n] {
				sc.seg[i] = (float64(v) - mean) * sc.win[i]
			}
			sc.coefficients(k0, k1)
			for k, c := range sc.co[k0 : k1+1] {
				sc.psd[k0+k] += real(c)*real(c) + imag(c)*imag(c)
			}
			segs++
		}
	}
	if segs == 0 {
		return math.NaN()
	}
	best, fb := -1.0, math.NaN()
	for k := k0; k <= k1 && float64(k)*df <= bgHighHz; k++ {
		f := float64(k) * df
		if v := f * sc.psd[k]; v > best {
			best, fb = v, f
		}
	}
	return fb
}

// phaseFloor is the opposite phase, as a share of the peak's height, from
// which durationRatio takes a wave to be di- or triphasic and its main
// phase to end at its base; the floor c1_phases counts (20 %).
const phaseFloor = 0.2

// returnFrac is the share of the peak's height above the local baseline at
// which waveDuration takes a slowly returning wave to have ended.
const returnFrac = 0.1

// returnMaxS bounds the search for the return to baseline, s each side.
const returnMaxS = 1.0

// waveDuration returns the duration, in samples, that criterion 2 compares
// with the background: the larger of the main phase base to base and its
// width at returnFrac of the peak's height above the local baseline b (the
// median of the preBaseS before the left base, as in oppositePhase),
// searched up to returnMaxS from the peak, linearly interpolated. A main
// phase ends at its base; where a wave returns slowly, as the decay of a
// pop, the walk to the base stops at the first background ripple on
// its tail, or at the 200 ms limit of the finder, long before the wave has
// returned; the tenth-height width then measures it. For a wave that
// starts and ends at the baseline the base-to-base duration is the larger
// and is kept. Falls back to base to base when the baseline is undefined.
func waveDuration(t *trace, ph phase, sc *scratch) float64 {
	d := float64(ph.right - ph.left)
	b, ok := localBaseline(t, ph, sc)
	if !ok {
		return d
	}
	top := ph.sign * (float64(t.x[ph.peak]) - b)
	if !(top > 0) {
		return d
	}
	level := returnFrac * top
	n := int(math.Round(returnMaxS * t.fs))
	return max(d, levelWidth(t, ph, b, -1, n, level)+levelWidth(t, ph, b, +1, n, level))
}

// spectrumOf readies the scratch's Welch buffers (Hann window, segment,
// transform) for segments of n samples.
func (sc *scratch) spectrumOf(n int) {
	if sc.fftN == n {
		return
	}
	sc.fftN, sc.fft, sc.rfft = n, fourier.NewFFT(n), newRFFT(n)
	sc.win = make([]float64, n)
	for i := range sc.win {
		sc.win[i] = 0.5 - 0.5*math.Cos(2*math.Pi*float64(i)/float64(n))
	}
	sc.seg = make([]float64, n)
	sc.psd = make([]float64, n/2+1)
	sc.co = make([]complex128, n/2+1)
}

// coefficients writes the transform of sc.seg to sc.co, at least bins k0 … k1.
func (sc *scratch) coefficients(k0, k1 int) {
	if sc.rfft != nil {
		sc.rfft.coefficients(sc.co, sc.seg, k0, k1)
	} else {
		sc.co = sc.fft.Coefficients(sc.co, sc.seg)
	}
}
