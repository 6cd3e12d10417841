package textbook

import (
	"math"
	"math/rand/v2"
)

// Waveform primitives, each a function of time t in seconds relative to the
// wave's apex (or start, where said), returning a value on a unit scale.

// peaked is a pointed lobe: rises over rise s to an apex at t = 0 and falls
// over fall s, each flank (1−u)² in the distance u from the apex as a share of
// the flank. The slope is steepest at the apex (a point, as a spike's or sharp
// wave's apex is drawn, Kane et al. 2017 glossary) and zero at both bases.
func peaked(t, rise, fall float64) float64 {
	u := flank(t, rise, fall)
	if u >= 1 {
		return 0
	}
	return (1 - u) * (1 - u)
}

// flank is the distance of t from the apex as a share of its flank: rise
// before the apex, fall after.
func flank(t, rise, fall float64) float64 {
	if t < 0 {
		return -t / rise
	}
	return t / fall
}

// rounded is a blunt lobe: half-cosine flanks with zero slope at the apex.
func rounded(t, rise, fall float64) float64 {
	u := flank(t, rise, fall)
	if u >= 1 {
		return 0
	}
	return 0.5 * (1 + math.Cos(math.Pi*u))
}

// slowLobe is a smooth slow wave from t = 0 to t = length, sin^1.5 shaped, its
// maximum a little before the middle as after-going slow waves are drawn.
func slowLobe(t, length float64) float64 {
	if t <= 0 || t >= length {
		return 0
	}
	return math.Pow(math.Sin(math.Pi*t/length), 1.5)
}

// arch is one cycle of an arciform (comb-like) rhythm at frequency f with its
// pointed phase at t = 0 pointing to +1 and its rounded phase dipping to
// about −0.5, zero mean over a cycle: |sin| rectified with the cusp turned to
// the apex. Mu rhythm, wicket spikes and the 14 and 6 Hz bursts share this
// shape (Niedermeyer's Electroencephalography, ch. on normal variants; from
// memory).
func arch(t, f float64) float64 {
	return 2/math.Pi - math.Abs(math.Sin(math.Pi*f*t))
}

// hann is a Hann window over [0, length].
func hann(t, length float64) float64 {
	if t <= 0 || t >= length {
		return 0
	}
	return 0.5 * (1 - math.Cos(2*math.Pi*t/length))
}

func uni(r *rand.Rand, lo, hi float64) float64 { return lo + (hi-lo)*r.Float64() }

// logUni draws log-uniformly from [lo, hi].
func logUni(r *rand.Rand, lo, hi float64) float64 {
	return math.Exp(uni(r, math.Log(lo), math.Log(hi)))
}

func abs(x float64) float64 { return math.Abs(x) }

func sqrt(x float64) float64 { return math.Sqrt(x) }

// sign draws ±1.
func sign(r *rand.Rand) float64 {
	if r.IntN(2) == 0 {
		return -1
	}
	return 1
}
