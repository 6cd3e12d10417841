package synth

import "math"

// Waveform shapes, as functions of time t in ms relative to the main peak.
// The main phase of a sharp transient is a pair of squared ramps,
//
//	m(t) = ((t+R)/R)²  for −R ≤ t ≤ 0,   ((F−t)/F)²  for 0 ≤ t ≤ F,
//
// zero slope at the base and steepest slope at the apex, which makes the
// apex pointed (criterion 1); R < F makes the rise faster than the fall
// (criterion 3), R = F makes it symmetric.

func mainPhase(t, rise, fall float64) float64 {
	switch {
	case t >= -rise && t <= 0:
		u := (t + rise) / rise
		return u * u
	case t > 0 && t <= fall:
		u := (fall - t) / fall
		return u * u
	}
	return 0
}

// halfSine is a single rounded lobe of length d starting at 0.
func halfSine(t, d float64) float64 {
	if t < 0 || t > d || d <= 0 {
		return 0
	}
	return math.Sin(math.Pi * t / d)
}

// overshootMs is the length of the opposite-polarity phase that follows the
// main phase of an IED or vertex transient.
func overshootMs(fall float64) float64 {
	return math.Max(15, math.Min(40, 0.35*fall))
}

// shape returns the unit-peak waveform of a deterministic event kind at t ms
// from the peak; muscle bursts are random and built elsewhere.
func shape(e *Event, t float64) float64 {
	switch e.Kind {
	case Spike, SharpWave, Vertex:
		fall := e.Duration - e.Rise
		o := overshootMs(fall)
		v := mainPhase(t, e.Rise, fall)
		v -= e.overshoot * halfSine(t-fall, o)
		v += e.slowAmp * halfSine(t-fall-o, e.SlowWave)
		return v
	case Wicket:
		// Waves of period 2·Duration: a symmetric sharp phase then a
		// rounded opposite phase; the largest wave peaks at t = 0.
		period := 2 * e.Duration
		big := 0
		for i, a := range e.waves {
			if a > e.waves[big] {
				big = i
			}
		}
		var v float64
		for i, a := range e.waves {
			p := float64(i-big) * period // this wave's peak
			v += a * mainPhase(t-p, e.Duration/2, e.Duration/2)
			v -= a * 0.45 * halfSine(t-p-e.Duration/2, e.Duration)
		}
		return v
	case Blink:
		if math.Abs(t) > e.Duration/2 {
			return 0
		}
		c := math.Cos(math.Pi * t / e.Duration)
		return c * c
	case Pop:
		end := 5 * e.Duration
		if t < 0 || t > end {
			return 0
		}
		v := math.Exp(-t / e.Duration)
		if t > end-e.Duration { // taper the tail so it does not end in a step
			v *= 0.5 * (1 + math.Cos(math.Pi*(t-end+e.Duration)/e.Duration))
		}
		return v
	}
	return 0
}

// support returns how far the waveform extends before and after the peak, ms.
func support(e *Event) (pre, post float64) {
	switch e.Kind {
	case Spike, SharpWave, Vertex:
		fall := e.Duration - e.Rise
		return e.Rise, fall + overshootMs(fall) + e.SlowWave
	case Wicket:
		big := 0
		for i, a := range e.waves {
			if a > e.waves[big] {
				big = i
			}
		}
		period := 2 * e.Duration
		return float64(big)*period + e.Duration/2, float64(len(e.waves)-1-big)*period + 1.5*e.Duration
	case Blink:
		return e.Duration / 2, e.Duration / 2
	case Pop:
		return 0, 5 * e.Duration
	}
	return 0, 0
}

// attenuationEnvelope returns the depth of background attenuation at t ms
// from its start: a 50 ms raised-cosine onset, a plateau to 40 % of its
// length, then a raised-cosine recovery.
func attenuationEnvelope(t, length, depth float64) float64 {
	if t < 0 || t > length || depth == 0 {
		return 0
	}
	const on = 50.0
	v := 1.0
	if t < on {
		v = 0.5 * (1 - math.Cos(math.Pi*t/on))
	}
	if hold := 0.4 * length; t > hold {
		v *= 0.5 * (1 + math.Cos(math.Pi*(t-hold)/(length-hold)))
	}
	return depth * v
}
