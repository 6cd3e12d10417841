package synth

import (
	"math"
	"math/rand/v2"
)

// ecgWaves are the P, Q, R, S, T waves as (angle θᵢ in radians, aᵢ, bᵢ) of
// McSharry et al. (2003), "A dynamical model for generating synthetic
// electrocardiogram signals", IEEE Trans Biomed Eng 50(3):289–294, Table 1
// (from memory). Each wave is drawn as aᵢbᵢ²·exp(−Δθ²/2bᵢ²), the shape the
// model's trajectory takes at unit angular speed.
var ecgWaves = [5][3]float64{
	{-math.Pi / 3, 1.2, 0.25},
	{-math.Pi / 12, -5, 0.1},
	{0, 30, 0.1},
	{math.Pi / 12, -7.5, 0.1},
	{math.Pi / 2, 0.75, 0.4},
}

const ecgR = 1000.0 // R-wave amplitude, µV (common practice for a chest lead)

// ecgSource produces a beat train with slightly varying RR intervals.
type ecgSource struct {
	rng        *rand.Rand
	meanRR, rr float64 // s
	beat       float64 // start of the current beat, s
	norm       float64
}

func newECG(r *rand.Rand) *ecgSource {
	e := &ecgSource{rng: r, meanRR: 60 / uni(r, 60, 85)}
	e.rr = e.meanRR
	e.beat = -e.rr * r.Float64()
	e.norm = ecgR / ecgShape(0)
	return e
}

func ecgShape(theta float64) float64 {
	var z float64
	for _, w := range ecgWaves {
		d := math.Remainder(theta-w[0], 2*math.Pi)
		z += w[1] * w[2] * w[2] * math.Exp(-d*d/(2*w[2]*w[2]))
	}
	return z
}

// at returns the ECG at time t; t must not decrease between calls.
func (e *ecgSource) at(t float64) float64 {
	for t >= e.beat+e.rr {
		e.beat += e.rr
		e.rr = e.meanRR * (1 + 0.04*max(-2.5, min(2.5, e.rng.NormFloat64())))
	}
	theta := 2*math.Pi*(t-e.beat)/e.rr - math.Pi
	return e.norm*ecgShape(theta) + 5*e.rng.NormFloat64()
}
