package textbook

import (
	"math"
	"math/rand/v2"
	"sort"
)

// rhythm is one component of the background: many cortical dipoles, each
// driven by its own damped resonator (an AR(2) filter of white noise, centre
// Hz and bandwidth bw Hz), weighted towards a region, with an RMS per state.
// A sum of independent resonant cortical patches seen through the head is the
// classic linear model of the EEG background (Lopes da Silva et al. 1974,
// Kybernetik 15:27; from memory) — unlike synth's 1/f noise with added rhythms.
type rhythm struct {
	centre, bw float64
	region     func(p [3]float64) float64 // weight of a source at unit position p
	rms        func(s span) float64       // median-channel RMS, µV, in a state
	waxing     bool                       // amplitude waxes and wanes over seconds
}

func rhythms(alphaHz float64) []rhythm {
	everywhere := func([3]float64) float64 { return 1 }
	return []rhythm{
		// delta-range irregular activity, grows in sleep
		{1.5, 3, everywhere, byState(5, 8, 20), false},
		// theta, frontocentral, the drowsy rhythm
		{6, 3, func(p [3]float64) float64 { return 0.3 + clamp01(p[2]) + clamp01(p[1]+0.3) }, byState(3, 11, 9), false},
		// posterior dominant (alpha) rhythm: reactive to eye opening, gone in
		// drowsiness and sleep (Kane et al. 2017, "alpha rhythm")
		{alphaHz, 0.9, func(p [3]float64) float64 { return clamp01(-p[1] - 0.35) }, alphaRMS, true},
		// low-voltage beta, frontocentral
		{20, 8, func(p [3]float64) float64 { return 0.5 + clamp01(p[1]) }, byState(3, 4, 2), false},
	}
}

// byState returns an RMS function for awake, drowsy and N2.
func byState(awake, drowsy, n2 float64) func(span) float64 {
	return func(s span) float64 {
		switch s.State {
		case Drowsy:
			return drowsy
		case N2:
			return n2
		}
		return awake
	}
}

func alphaRMS(s span) float64 {
	switch {
	case s.State == Drowsy:
		return 1.5 // alpha drop-out of drowsiness
	case s.State == N2:
		return 0
	case s.EyesOpen:
		return 2 // blocked by eye opening
	}
	return 9
}

func clamp01(x float64) float64 { return math.Max(0, math.Min(1, x)) }

// nSources is the number of cortical patches per rhythm.
const nSources = 48

// background returns the background [channel][sample] in µV and the median
// channel RMS over the recording.
func background(r *rand.Rand, h *head, spans []span, rate float64, n int, alphaHz float64) ([][]float64, float64) {
	nch := len(h.labels)
	bg := make([][]float64, nch)
	for i := range bg {
		bg[i] = make([]float64, n)
	}
	acc := make([][]float64, nch)
	for i := range acc {
		acc[i] = make([]float64, n)
	}
	x := make([]float64, n)
	for _, rh := range rhythms(alphaHz) {
		for i := range acc {
			clear(acc[i])
		}
		for range nSources {
			pos, m := patch(r)
			w := rh.region(pos)
			if w <= 0 {
				continue
			}
			resonate(r, x, rh.centre, rh.bw, rate)
			v := h.project(pos, m)
			for c := range acc {
				g := w * v[c]
				for k, xk := range x {
					acc[c][k] += g * xk
				}
			}
		}
		scale := 1 / medianRMS(acc)
		gain := stateGain(spans, rh.rms, rate, n)
		if rh.waxing {
			env := waxWane(r, rate, n)
			for k := range gain {
				gain[k] *= env[k]
			}
		}
		for c := range bg {
			for k := range bg[c] {
				bg[c][k] += acc[c][k] * scale * gain[k]
			}
		}
	}
	addSpindles(r, h, bg, spans, rate)
	for c := range bg {
		for k := range bg[c] {
			bg[c][k] += r.NormFloat64() // 1 µV amplifier and electrode noise
		}
	}
	return bg, medianRMS(bg)
}

// patch draws a cortical source: a position on a shell at 0.72–0.80 of the
// scalp radius above the skull base, its moment near the local normal.
func patch(r *rand.Rand) (pos, m [3]float64) {
	for {
		d := randUnit(r)
		if d[2] < -0.2 {
			continue
		}
		rad := uni(r, 0.72, 0.8)
		t := randUnit(r)
		for i := range m {
			pos[i] = d[i] * rad
			m[i] = d[i] + 0.4*t[i]
		}
		return pos, m
	}
}

// randUnit draws a direction uniformly on the sphere (normal deviates,
// normalised; Muller 1959).
func randUnit(r *rand.Rand) [3]float64 {
	for {
		v := [3]float64{r.NormFloat64(), r.NormFloat64(), r.NormFloat64()}
		n := math.Sqrt(v[0]*v[0] + v[1]*v[1] + v[2]*v[2])
		if n > 1e-9 {
			return [3]float64{v[0] / n, v[1] / n, v[2] / n}
		}
	}
}

// resonate fills x with white noise through the AR(2) resonator with poles at
// radius exp(−π bw/rate) and angle 2π f/rate, scaled to unit variance, after
// a discarded warm-up.
func resonate(r *rand.Rand, x []float64, f, bw, rate float64) {
	rho := math.Exp(-math.Pi * bw / rate)
	a1, a2 := 2*rho*math.Cos(2*math.Pi*f/rate), -rho*rho
	var y1, y2 float64
	for range int(4 * rate) {
		y1, y2 = a1*y1+a2*y2+r.NormFloat64(), y1
	}
	ss := 0.0
	for k := range x {
		y := a1*y1 + a2*y2 + r.NormFloat64()
		y1, y2 = y, y1
		x[k] = y
		ss += y * y
	}
	s := 1 / math.Sqrt(ss/float64(len(x)))
	for k := range x {
		x[k] *= s
	}
}

// stateGain is the per-sample RMS of a rhythm, the state values smoothed over
// 3 s so that transitions are gradual.
func stateGain(spans []span, rms func(span) float64, rate float64, n int) []float64 {
	g := make([]float64, n)
	for k := range g {
		g[k] = rms(stateAt(spans, float64(k)/rate))
	}
	return boxSmooth(g, int(3*rate))
}

// waxWane is a slow amplitude envelope around 1 (0.3–1.7), as the alpha
// rhythm waxes and wanes over seconds.
func waxWane(r *rand.Rand, rate float64, n int) []float64 {
	e := make([]float64, n)
	resonate(r, e, 0, 0.4, rate)
	for k := range e {
		e[k] = math.Max(0.3, math.Min(1.7, 1+0.4*e[k]))
	}
	return e
}

// boxSmooth is a centred moving average of width w samples.
func boxSmooth(x []float64, w int) []float64 {
	n := len(x)
	cum := make([]float64, n+1)
	for i, v := range x {
		cum[i+1] = cum[i] + v
	}
	out := make([]float64, n)
	for i := range x {
		lo, hi := max(0, i-w/2), min(n, i+w/2+1)
		out[i] = (cum[hi] - cum[lo]) / float64(hi-lo)
	}
	return out
}

// addSpindles puts sleep spindles into N2: 11–15 Hz waxing and waning
// trains of 0.5–2 s, maximal at the vertex, every few seconds (Kane et al.
// 2017, "sleep spindles"; AASM scoring manual, Berry et al. 2017; from
// memory). They are background, not truth rows.
func addSpindles(r *rand.Rand, h *head, bg [][]float64, spans []span, rate float64) {
	for _, s := range spans {
		if s.State != N2 {
			continue
		}
		for t := s.Start + uni(r, 1, 4); t < s.End-2; t += uni(r, 3, 10) {
			spindle(r, h, bg, t, rate, uni(r, 20, 40))
		}
	}
}

// spindle adds one spindle starting at t s with peak amplitude amp µV.
func spindle(r *rand.Rand, h *head, bg [][]float64, t, rate, amp float64) {
	pos := [3]float64{uni(r, -0.1, 0.1), uni(r, -0.15, 0.15), 0.72}
	v, _, _ := h.unitMap(pos, [3]float64{0, 0, 1})
	f, L := uni(r, 11.5, 14.5), uni(r, 0.5, 1.8)
	k0 := int(t * rate)
	for k := 0; k < int(L*rate); k++ {
		if k0+k >= len(bg[0]) {
			break
		}
		tt := float64(k) / rate
		y := amp * hann(tt, L) * math.Sin(2*math.Pi*f*tt)
		for c := range bg {
			bg[c][k0+k] += v[c] * y
		}
	}
}

// medianRMS is the median over channels of each channel's RMS.
func medianRMS(x [][]float64) float64 {
	rms := make([]float64, len(x))
	for c, ch := range x {
		ss := 0.0
		for _, v := range ch {
			ss += v * v
		}
		rms[c] = math.Sqrt(ss / float64(len(ch)))
	}
	sort.Float64s(rms)
	return rms[len(rms)/2]
}
