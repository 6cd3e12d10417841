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
// half-wave lasts T/2) scores 0. f_bg is the frequency in 1–30 Hz maximising
// f·P(f), P the Welch (1967) power spectrum of the background ranges (see
// trace.background): Hann-windowed, mean-removed 2 s segments with 50 %
// overlap, periodograms averaged. Weighting by f reads the spectrum per
// octave, so the steep 1/f slope of ongoing EEG does not make the lowest
// frequency win by default and a background rhythm such as alpha is found
// where present. It also returns T/2 in ms (the c2_background_period_ms
// column holds the half-period the duration is compared with). NaN when no
// full segment fits.
func durationRatio(t *trace, ph phase, sc *scratch) (logRatio, halfMS float64) {
	n := int(math.Round(welchS * t.fs))
	if sc.fftN != n {
		sc.fftN, sc.fft = n, fourier.NewFFT(n)
		sc.win = make([]float64, n)
		for i := range sc.win {
			sc.win[i] = 0.5 - 0.5*math.Cos(2*math.Pi*float64(i)/float64(n))
		}
		sc.seg = make([]float64, n)
		sc.psd = make([]float64, n/2+1)
		sc.co = make([]complex128, n/2+1)
	}
	clear(sc.psd)
	segs := 0
	for _, r := range t.background(ph.peak) {
		for s := r[0]; s+n <= r[1]; s += n / 2 {
			var mean float64
			for _, v := range t.x[s : s+n] {
				mean += float64(v)
			}
			mean /= float64(n)
			for i, v := range t.x[s : s+n] {
				sc.seg[i] = (float64(v) - mean) * sc.win[i]
			}
			sc.co = sc.fft.Coefficients(sc.co, sc.seg)
			for k, c := range sc.co {
				sc.psd[k] += real(c)*real(c) + imag(c)*imag(c)
			}
			segs++
		}
	}
	if segs == 0 {
		return math.NaN(), math.NaN()
	}
	df := t.fs / float64(n)
	best, fb := -1.0, math.NaN()
	for k := int(math.Ceil(bgLowHz / df)); k < len(sc.psd) && float64(k)*df <= bgHighHz; k++ {
		f := float64(k) * df
		if v := f * sc.psd[k]; v > best {
			best, fb = v, f
		}
	}
	if math.IsNaN(fb) {
		return math.NaN(), math.NaN()
	}
	halfMS = 500 / fb
	d := float64(ph.right-ph.left) / t.fs * 1000
	return math.Abs(math.Log(d / halfMS)), halfMS
}
