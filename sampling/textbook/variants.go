package textbook

import (
	"math"

	"github.com/quorate-eeg/quorate/sampling/synth"
)

// Benign variants and physiological transients: cerebral (criterion 6 met),
// none with an after-going slow wave or a disrupted background (criteria 4
// and 5 failed), so each meets at most 4 criteria and most 2 or 3.
// Descriptions: Kane et al. (2017) glossary; Niedermeyer's
// Electroencephalography 7th ed., chapters on normal variants and sleep;
// Schomer & Lopes da Silva (2018); all from memory.

// cerebralRow is a row with criterion 6 met and the source filled in.
func cerebralRow(kind string, pos, mom [3]float64, orientation string) synth.Event {
	ev := synth.Event{Kind: kind, DipolePos: pos, DipoleMoment: mom, Orientation: orientation}
	ev.Meets[synth.C6Field] = true
	return ev
}

// smallSharp is a small sharp spike (benign epileptiform transient of
// sleep): under 50 µV, under 50 ms, mono- or diphasic with steep rise and
// fall, widespread from an oblique deep source, in drowsiness and light
// sleep, no slow wave and no disruption. c1 met, c3 failed (both limbs
// steep), c2 by duration.
func (m *maker) smallSharp(t0 float64, s span) *built {
	r := m.r
	side := sign(r)
	pos := [3]float64{side * 0.45, uni(r, -0.2, 0.2), uni(r, 0.0, 0.2)}
	mom := orient(r, pos, "oblique")
	v, _, _ := m.h.unitMap(pos, mom)
	d, rf, amp := uni(r, 30, 50), uni(r, 0.46, 0.54), uni(r, 25, 50)
	rise, fall := d*rf/1000, d*(1-rf)/1000
	b := m.newBuilt(t0, 0.4)
	b.cerebral(v, m.rate, func(t float64) float64 {
		return amp * (peaked(t-0.1, rise, fall) - 0.3*rounded(t-0.1-fall-0.02, 0.02, 0.02))
	})
	ev := cerebralRow(SmallSharp, pos, mom, "oblique")
	ev.Meets[synth.C1Spiky] = true
	ev.Duration, ev.Rise = d, d*rf
	setC2(&ev, d, m.halfPeriodMs(s))
	b.add(ev, 0.1, m.rate)
	return b
}

// comb is a train of arciform waves at f Hz, n waves, pointed phase of sign
// pol, waxing and waning: wicket spikes (temporal, 6–11 Hz, drowsiness),
// mu rhythm (central, 7–11 Hz, awake) and 14 and 6 Hz positive bursts
// (posterior temporal, positive). Each wave is a row: c1 met (pointed
// phase), c2 failed (the wave is as long as its neighbours, the ongoing
// activity it belongs to), c3 failed (the pointed phase is symmetric), c6 met.
func (m *maker) comb(t0 float64, kind string, pos [3]float64, f float64, n int, amp, pol float64) *built {
	r := m.r
	mom := orient(r, pos, "radial")
	v, _, _ := m.h.unitMap(pos, mom)
	L := float64(n) / f
	b := m.newBuilt(t0, L+0.3)
	lead := 0.1
	env := func(t float64) float64 { return math.Sqrt(hann(t+0.5/f, L+1/f)) }
	b.cerebral(v, m.rate, func(t float64) float64 {
		tt := t - lead
		if tt < -0.5/f || tt > L-0.5/f {
			return 0
		}
		return pol * amp * env(tt) * arch(tt, f)
	})
	half := 1000 / (2 * f)
	for i := range n {
		ev := cerebralRow(kind, pos, mom, "radial")
		ev.Meets[synth.C1Spiky] = true
		ev.Duration, ev.Rise = half, half/2
		ev.C2DurationMs, ev.BackgroundHalfMs = half, half
		b.add(ev, lead+float64(i)/f, m.rate)
	}
	return b
}

func (m *maker) wicket(t0 float64) *built {
	side := sign(m.r)
	pos := [3]float64{side * 0.7, uni(m.r, -0.1, 0.2), uni(m.r, 0.05, 0.25)}
	return m.comb(t0, synth.Wicket, pos, uni(m.r, 6, 11), 3+m.r.IntN(4), uni(m.r, 50, 120), -1)
}

func (m *maker) mu(t0 float64) *built {
	side := sign(m.r)
	pos := [3]float64{side * 0.45, uni(m.r, -0.1, 0.05), 0.6}
	return m.comb(t0, Mu, pos, uni(m.r, 7.5, 11), 4+m.r.IntN(4), uni(m.r, 25, 55), -1)
}

func (m *maker) positive146(t0 float64) *built {
	side := sign(m.r)
	pos := [3]float64{side * 0.6, uni(m.r, -0.55, -0.35), uni(m.r, 0.05, 0.25)}
	f, n := 14.0, 7+m.r.IntN(7)
	if m.r.IntN(3) == 0 {
		f, n = 6, 3+m.r.IntN(3)
	}
	return m.comb(t0, Positive146, pos, f+uni(m.r, -0.5, 0.5), n, uni(m.r, 30, 70), 1)
}

// posts are positive occipital sharp transients of sleep: surface positive,
// bilateral occipital, "reverse check mark" — a quick rise and slower return
// (c3 met), 20–75 µV, 80–170 ms, single or in runs at 4–5 Hz in N1 and N2.
// c1 met, c2 by duration; two synchronous sources make the field bilateral.
func (m *maker) posts(t0 float64, s span) *built {
	r := m.r
	n := 1 + r.IntN(3)
	gap := 1 / uni(r, 4, 5)
	posL := [3]float64{-0.3, -0.7, 0.1}
	posR := [3]float64{0.3, -0.7, 0.1}
	vl, _, _ := m.h.unitMap(posL, unitv(posL))
	vr, _, _ := m.h.unitMap(posR, unitv(posR))
	w := uni(r, 0.6, 1)
	v := make([]float64, len(vl))
	for c := range v {
		v[c] = vl[c] + w*vr[c]
	}
	b := m.newBuilt(t0, float64(n)*gap+0.4)
	half := m.halfPeriodMs(s)
	for i := range n {
		d, rf, amp := uni(r, 80, 170), uni(r, 0.25, 0.35), uni(r, 20, 75)
		ti := 0.15 + float64(i)*gap
		b.cerebral(v, m.rate, func(t float64) float64 { return amp * peaked(t-ti, d*rf/1000, d*(1-rf)/1000) })
		ev := cerebralRow(POSTS, posL, unitv(posL), "radial")
		ev.Meets[synth.C1Spiky], ev.Meets[synth.C3Asymmetry] = true, true
		ev.Duration, ev.Rise = d, d*rf
		setC2(&ev, d, half)
		b.add(ev, ti, m.rate)
	}
	return b
}

// vertex is a vertex sharp transient of drowsiness and light sleep:
// surface negative at Cz, 100–200 ms, 50–150 µV in adults, nearly symmetric
// (c3 failed), no slow wave. c1 met, c2 by duration, c6 met.
func (m *maker) vertex(t0 float64, s span) *built {
	r := m.r
	pos := [3]float64{uni(r, -0.05, 0.05), uni(r, -0.1, 0.05), 0.72}
	mom := [3]float64{0, 0, -1}
	v, _, _ := m.h.unitMap(pos, unitv(pos))
	d, rf, amp := uni(r, 100, 200), uni(r, 0.46, 0.54), uni(r, 50, 150)
	b := m.newBuilt(t0, 0.6)
	b.cerebral(v, m.rate, func(t float64) float64 {
		return -amp * (peaked(t-0.15, d*rf/1000, d*(1-rf)/1000) - 0.25*rounded(t-0.15-d/1000-0.05, 0.06, 0.08))
	})
	ev := cerebralRow(synth.Vertex, pos, mom, "radial")
	ev.Meets[synth.C1Spiky] = true
	ev.Duration, ev.Rise = d, d*rf
	setC2(&ev, d, m.halfPeriodMs(s))
	b.add(ev, 0.15, m.rate)
	return b
}

// kComplex is the K-complex of N2: a well-delineated negative sharp wave
// followed by a positive component, together ≥ 0.5 s, frontocentral maximum,
// 75–200 µV, often followed by a spindle (AASM manual, Berry et al. 2017;
// from memory). c2 met (far longer than the background); c1 and c3 unclear
// (the negative wave is sharp-contoured but broad); c4 failed (the wave
// that follows is of opposite polarity); c5 failed; c6 met.
func (m *maker) kComplex(t0 float64) *built {
	r := m.r
	pos := [3]float64{0, uni(r, 0.05, 0.25), 0.72}
	v, _, _ := m.h.unitMap(pos, unitv(pos))
	neg, rf, pos2 := uni(r, 250, 400)/1000, uni(r, 0.3, 0.45), uni(r, 350, 600)/1000
	amp := uni(r, 75, 200)
	b := m.newBuilt(t0, 2.6)
	apex := 0.3
	b.cerebral(v, m.rate, func(t float64) float64 {
		y := -amp * rounded(t-apex, neg*rf, neg*(1-rf))
		y += 0.55 * amp * rounded(t-(apex+neg*(1-rf)+pos2/2), pos2/2, pos2/2)
		return y
	})
	if r.IntN(2) == 0 {
		spindle(r, m.h, b.w, apex+neg+pos2, m.rate, uni(r, 20, 35))
	}
	ev := cerebralRow(KComplex, pos, [3]float64{0, 0, -1}, "radial")
	ev.Meets[synth.C2Duration] = true
	ev.Unclear[synth.C1Spiky], ev.Unclear[synth.C3Asymmetry] = true, true
	ev.Duration, ev.Rise, ev.C2DurationMs, ev.BackgroundHalfMs = neg*1000, neg*rf*1000, neg*1000, 125
	b.add(ev, apex, m.rate)
	return b
}

// lambda waves: surface-positive, triangular, bilateral occipital
// transients of visual scanning with eyes open, 20–50 µV, 150–250 ms,
// nearly symmetric (c3 failed). c1 met, c2 by duration, c6 met.
func (m *maker) lambda(t0 float64, s span) *built {
	r := m.r
	pos := [3]float64{uni(r, -0.1, 0.1), -0.72, 0.1}
	v, _, _ := m.h.unitMap(pos, unitv(pos))
	d, rf, amp := uni(r, 150, 250), uni(r, 0.45, 0.55), uni(r, 20, 50)
	b := m.newBuilt(t0, 0.6)
	b.cerebral(v, m.rate, func(t float64) float64 {
		return amp * (peaked(t-0.15, d*rf/1000, d*(1-rf)/1000) - 0.2*rounded(t-0.15-d/1000, 0.05, 0.05))
	})
	ev := cerebralRow(Lambda, pos, unitv(pos), "radial")
	ev.Meets[synth.C1Spiky] = true
	ev.Duration, ev.Rise = d, d*rf
	setC2(&ev, d, m.halfPeriodMs(s))
	b.add(ev, 0.15, m.rate)
	return b
}
