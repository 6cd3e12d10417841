package signal

import (
	"fmt"
	"math"
)

// MaxOrder is the largest Butterworth order accepted (per edge for
// band-pass and band-stop). Higher orders gain little for EEG and put poles
// so close together that rounding in the section coefficients matters.
const MaxOrder = 12

// Butterworth designs a digital Butterworth filter of the given kind and
// order as second-order sections, for sampling rate fs Hz and edge
// frequencies in Hz (one for LowPass/HighPass, two ascending for
// BandPass/BandStop). Band filters have 2·order poles.
//
// Each edge f is pre-warped to Ω = 2fs·tan(πf/fs) so that, after the
// bilinear transform s = 2fs(z−1)/(z+1), the response is exactly
// 1/√2 (−3.01 dB) at f (Oppenheim & Schafer 2010, §7.2.2). The prototype
// 1/Bₙ(s) (see ButterworthPoles) is mapped by s → s/Ω, s → Ω/s,
// s → (s²+Ω₀²)/(sB) or s → sB/(s²+Ω₀²) with Ω₀ = √(Ω₁Ω₂), B = Ω₂−Ω₁
// (Parks & Burrus, Digital Filter Design, 1987, §7.2), then grouped into
// sections by nearest pole–zero pairing (see toSOS).
func Butterworth(kind Kind, order int, fs float64, edges ...float64) (SOS, error) {
	if kind < LowPass || kind > BandStop {
		return nil, &designError{Field: "kind", Value: float64(kind), Msg: "unknown filter kind"}
	}
	if order < 1 || order > MaxOrder {
		return nil, &designError{Field: "order", Value: float64(order), Msg: fmt.Sprintf("must be 1…%d", MaxOrder)}
	}
	if !(fs > 0) || math.IsInf(fs, 0) {
		return nil, &designError{Field: "fs", Value: fs, Msg: "must be positive and finite"}
	}
	if len(edges) != kind.edges() {
		return nil, &designError{Field: "edges", Value: float64(len(edges)), Msg: fmt.Sprintf("%s needs %d edge frequencies", kind, kind.edges())}
	}
	// Design at a normalised rate of 2 (Nyquist = 1) so coefficients do
	// not depend on the scale of fs.
	const fsn = 2.0
	w := make([]float64, len(edges))
	for i, e := range edges {
		if !(e > 0 && e < fs/2) {
			return nil, &designError{Field: fmt.Sprintf("edges[%d]", i), Value: e, Msg: fmt.Sprintf("must lie strictly between 0 and fs/2 = %g", fs/2)}
		}
		w[i] = 2 * fsn * math.Tan(math.Pi*e/fs)
	}
	if len(w) == 2 && !(edges[0] < edges[1]) {
		return nil, &designError{Field: "edges[1]", Value: edges[1], Msg: "must exceed edges[0]"}
	}
	proto := zpk{p: ButterworthPoles(order), k: 1}
	var a zpk
	switch kind {
	case LowPass:
		a = lowToLow(proto, w[0])
	case HighPass:
		a = lowToHigh(proto, w[0])
	case BandPass:
		a = lowToBand(proto, math.Sqrt(w[0]*w[1]), w[1]-w[0])
	case BandStop:
		a = lowToStop(proto, math.Sqrt(w[0]*w[1]), w[1]-w[0])
	}
	return toSOS(bilinear(a, fsn)), nil
}

// Notch designs a second-order IIR notch at f0 Hz with quality factor
// q = f0/Δf, where Δf is the −3 dB rejection bandwidth:
//
//	ω₀ = 2πf0/fs,  β = tan(πf0/(q·fs)),  g = 1/(1+β)
//	H(z) = g(1 − 2cos ω₀ z⁻¹ + z⁻²) / (1 − 2g·cos ω₀ z⁻¹ + (2g−1) z⁻²)
//
// (Orfanidis, Introduction to Signal Processing, 1996, §11.3, notch design
// from the bilinear transform of an analogue notch; the section from
// memory, the coefficients checked against scipy.signal.iirnotch in
// TestNotchScipy, testdata/gen_scipy.py). It is
// one section whose zeros lie on the unit circle at exactly f0, so mains
// interference is removed completely while the response is within 3 dB of
// unity outside f0 ± Δf/2. A narrow Butterworth band-stop was not chosen:
// for the same width it needs 2·order poles, all just inside the unit
// circle, so it costs more sections and rings longer around transients
// such as spikes. Typical use: f0 = 50 or 60, q = 30 (Δf ≈ 2 Hz).
func Notch(f0, q, fs float64) (SOS, error) {
	if !(fs > 0) || math.IsInf(fs, 0) {
		return nil, &designError{Field: "fs", Value: fs, Msg: "must be positive and finite"}
	}
	if !(f0 > 0 && f0 < fs/2) {
		return nil, &designError{Field: "f0", Value: f0, Msg: fmt.Sprintf("must lie strictly between 0 and fs/2 = %g", fs/2)}
	}
	if !(q > 0) || math.IsInf(q, 0) {
		return nil, &designError{Field: "q", Value: q, Msg: "must be positive and finite"}
	}
	w0 := 2 * math.Pi * f0 / fs
	beta := math.Tan(w0 / (2 * q))
	g := 1 / (1 + beta)
	c := math.Cos(w0)
	return SOS{{g, -2 * g * c, g, 1, -2 * g * c, 2*g - 1}}, nil
}

// Cascade joins designs into one filter applied left to right, e.g. a
// band-pass followed by a mains notch.
func Cascade(parts ...SOS) SOS {
	var out SOS
	for _, p := range parts {
		out = append(out, p...)
	}
	return out
}
