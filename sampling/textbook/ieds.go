package textbook

import (
	"math"

	"github.com/quorate-eeg/quorate/sampling/synth"
)

// ied builds one interictal epileptiform discharge starting at t0 s: a
// spike (main phase 20 to <70 ms) or sharp wave (70–200 ms), alone, with an
// after-going slow wave, or as a polyspike — the forms of the IFCN glossary
// (Kane et al. 2017, "spike", "sharp wave", "spike-and-slow-wave complex",
// "polyspike complex"). Its source lies at the subject's focus with a radial,
// tangential or oblique moment. An IED meets criteria 1 and 6 always; of 2–5
// it is built to fail none, one or two (an IED meets at least 4 of 6, Kural
// et al. 2020), each failure made unambiguous:
//
//	c2 fail: main phase 0.85–1.2 × the background half-period;
//	c3 fail: rise 47–53 % of the main phase (symmetric), else 22–38 %;
//	c4 fail: no after-going slow wave; else one of the spike's polarity,
//	         150–350 ms, 0.45–0.9 of the spike (Niedermeyer, ch. on
//	         epileptiform patterns; from memory);
//	c5 fail: no attenuation; else the background at the field drops by
//	         55–85 % for 300–800 ms after the complex.
func (m *maker) ied(t0 float64, s span) *built {
	r := m.r
	form := []string{synth.Spike, synth.Spike, SpikeWave, SpikeWave, Polyspike, synth.SharpWave}[r.IntN(6)]
	pool := []int{synth.C2Duration, synth.C3Asymmetry, synth.C4SlowWave, synth.C5Disruption}
	if form == SpikeWave || form == Polyspike {
		pool = []int{synth.C2Duration, synth.C3Asymmetry, synth.C5Disruption}
	}
	var fail [6]bool
	nFail := []int{0, 0, 0, 1, 1, 1, 2}[r.IntN(7)]
	r.Shuffle(len(pool), func(i, j int) { pool[i], pool[j] = pool[j], pool[i] })
	for _, c := range pool[:nFail] {
		fail[c] = true
	}

	half := m.halfPeriodMs(s)
	var d float64
	switch {
	case fail[synth.C2Duration]:
		d = half * uni(r, 0.85, 1.2)
	case form == synth.SharpWave:
		d = half * uni(r, 1.6, 3.2)
	default:
		d = half * uni(r, 0.35, 0.6)
	}
	d = math.Max(20, math.Min(195, d))
	if form == synth.Spike && d >= 70 {
		form = synth.SharpWave
	} else if form == synth.SharpWave && d < 70 {
		form = synth.Spike
	}
	rf := uni(r, 0.22, 0.38)
	if fail[synth.C3Asymmetry] {
		rf = uni(r, 0.47, 0.53)
	}
	rise, fall := d*rf/1000, d*(1-rf)/1000

	pos, mom, orientation := m.focalSource()
	v, _, _ := m.h.unitMap(pos, mom)
	amp := logUni(r, 60, 220)

	b := m.newBuilt(t0, 1.6)
	apex := 0.15
	var srcs []func(t float64) float64
	pre := 0.4 * d / 1000
	srcs = append(srcs, func(t float64) float64 { return -0.12 * rounded(t-(apex-rise-pre/2), pre/2, pre/2) })
	end := apex + fall
	if form == Polyspike {
		n := 2 + r.IntN(3)
		gap := 1 / uni(r, 12, 20)
		for i := 1; i < n; i++ {
			ti, ai := apex+float64(i)*gap, uni(r, 0.6, 0.95)
			di := uni(r, 20, 40) / 1000
			srcs = append(srcs, func(t float64) float64 { return ai * peaked(t-ti, di*rf, di*(1-rf)) })
			srcs = append(srcs, func(t float64) float64 { return -0.3 * ai * rounded(t-ti-di*0.9, di/2, di/2) })
		}
		end = apex + float64(n-1)*gap + 0.03
	}
	srcs = append(srcs, func(t float64) float64 { return peaked(t-apex, rise, fall) })
	over, overW := uni(r, 0.15, 0.3), 0.4*d/1000
	srcs = append(srcs, func(t float64) float64 { return -over * rounded(t-(end+overW), overW, overW) })
	end += 2 * overW
	slowMs := 0.0
	if !fail[synth.C4SlowWave] {
		slowMs = uni(r, 150, 350)
		sa, L, st := uni(r, 0.45, 0.9), slowMs/1000, end-overW/2
		srcs = append(srcs, func(t float64) float64 { return sa * slowLobe(t-st, L) })
		end = st + L
	}
	// The moment points into the cortex, so that over a radial source the
	// discharge is surface negative, as most IEDs are (Kane et al. 2017,
	// "spike"; from memory).
	b.cerebral(v, m.rate, func(t float64) float64 {
		y := 0.0
		for _, f := range srcs {
			y += f(t)
		}
		return -amp * y
	})

	ev := synth.Event{Kind: form, IsIED: true, Duration: d, Rise: d * rf, SlowWave: slowMs,
		DipolePos: pos, DipoleMoment: [3]float64{-mom[0], -mom[1], -mom[2]}, Orientation: orientation}
	ev.Meets[synth.C1Spiky] = true
	ev.Meets[synth.C3Asymmetry] = !fail[synth.C3Asymmetry]
	ev.Meets[synth.C4SlowWave] = !fail[synth.C4SlowWave]
	ev.Meets[synth.C5Disruption] = !fail[synth.C5Disruption]
	ev.Meets[synth.C6Field] = true
	setC2(&ev, d, half)
	if !fail[synth.C5Disruption] {
		L := uni(r, 0.3, 0.8)
		ev.Attenuation, ev.AttenuationMs = uni(r, 0.55, 0.85), L*1000
		gain := make([]float64, len(v))
		for c := range v {
			gain[c] = math.Abs(v[c])
		}
		b.atten = &attenuation{start: b.start + int((end-0.05)*m.rate), n: int(L * m.rate), depth: ev.Attenuation, gain: gain}
	}
	b.add(ev, apex, m.rate)
	return b
}

// focalSource draws a source near the subject's focus, 0.70–0.80 of the scalp
// radius, and its orientation: basal and mesial temporal sources are more
// often tangential or oblique to the scalp (Ebersole 1994; from memory).
func (m *maker) focalSource() (pos, mom [3]float64, orientation string) {
	r := m.r
	f := unitv(m.focus)
	for i := range f {
		f[i] += 0.08 * r.NormFloat64()
	}
	f = unitv(f)
	rad := uni(r, 0.7, 0.8)
	for i := range pos {
		pos[i] = f[i] * rad
	}
	weights := []float64{0.45, 0.25, 0.3}
	if temporal(f) {
		weights = []float64{0.25, 0.45, 0.3}
	}
	names := []string{"radial", "tangential", "oblique"}
	u, i := r.Float64(), 0
	for ; i < 2 && u > weights[i]; i++ {
		u -= weights[i]
	}
	orientation = names[i]
	return pos, orient(r, pos, orientation), orientation
}

// temporal reports whether a unit direction points at a temporal lobe:
// lateral and low.
func temporal(f [3]float64) bool { return math.Abs(f[0]) > 0.7 && f[2] < 0.45 }
