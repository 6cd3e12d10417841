package textbook

import (
	"math"

	"github.com/quorate-eeg/quorate/sampling/synth"
)

// Artefacts: not cerebral, so criterion 6 fails (the field is confined to
// one electrode, follows the eyes or is the heart's far field, not a
// dipole in the brain; Kane et al. 2017, criterion 6); criteria 4 and 5
// fail. Descriptions: Niedermeyer's Electroencephalography, chapter on
// artefacts; Schomer & Lopes da Silva (2018); from memory.

// idx is the channel of electrode name, or −1.
func (m *maker) idx(name string) int {
	for i, l := range m.h.labels {
		if l == name {
			return i
		}
	}
	return -1
}

// burst adds motor-unit potentials to channel c over [t, t+L) s: biphasic
// potentials of 3–8 ms firing irregularly at 30–90 Hz per channel, each
// channel on its own (muscle under each electrode is its own source), and
// returns the time and value of the largest potential.
func (m *maker) burst(b *built, c int, t, L, amp float64) (float64, float64) {
	r := m.r
	tp, best := 0.0, 0.0
	for tt := t; tt < t+L; tt += 1 / uni(r, 30, 90) {
		a := amp * uni(r, 0.3, 1) * sign(r) * hann(tt-t, L) * 1.6
		d := uni(r, 3, 8) / 1000
		t1 := tt
		b.at(c, m.rate, func(x float64) float64 {
			return a * (peaked(x-t1, d/3, d/3) - peaked(x-t1-d*0.6, d/3, d/3))
		})
		if math.Abs(a) > math.Abs(best) {
			tp, best = tt, a
		}
	}
	return tp, best
}

// muscleRow is a muscle row: c1 met (potentials of a few ms are as spiky as
// anything on the page), c2 met (far shorter than the background), c3
// unclear, c4–c6 failed.
func muscleRow(kind string, durMs, halfMs float64) synth.Event {
	ev := synth.Event{Kind: kind, Duration: durMs, C2DurationMs: 5, BackgroundHalfMs: halfMs}
	ev.Meets[synth.C1Spiky], ev.Meets[synth.C2Duration] = true, true
	ev.Unclear[synth.C3Asymmetry] = true
	return ev
}

// muscle is a 0.15–1 s burst of scalp-muscle activity over the frontal or
// temporal electrodes of one side (frontalis, temporalis), 15–70 µV.
func (m *maker) muscle(t0 float64, s span) *built {
	r := m.r
	groups := [][]string{{"Fp1", "F7", "F3"}, {"Fp2", "F8", "F4"}, {"F7", "T7", "P7"}, {"F8", "T8", "P8"}}
	g := groups[r.IntN(len(groups))]
	L := uni(r, 0.15, 1)
	b := m.newBuilt(t0, L+0.3)
	amp := uni(r, 15, 70)
	tp, best := 0.0, 0.0
	for _, name := range g {
		if c := m.idx(name); c >= 0 {
			if t, a := m.burst(b, c, 0.1, L, amp*uni(r, 0.4, 1)); math.Abs(a) > math.Abs(best) {
				tp, best = t, a
			}
		}
	}
	b.add(muscleRow(synth.Muscle, L*1000, m.halfPeriodMs(s)), tp, m.rate)
	return b
}

// chewing is 2–5 s of 150–300 ms muscle bursts at 1–1.5 Hz over both
// temporal regions; one row per burst.
func (m *maker) chewing(t0 float64, s span) *built {
	r := m.r
	f, n := uni(r, 1, 1.5), 2+r.IntN(4)
	b := m.newBuilt(t0, float64(n)/f+0.5)
	amp := uni(r, 20, 60)
	for i := range n {
		t := 0.1 + float64(i)/f
		L := uni(r, 0.15, 0.3)
		tp, best := 0.0, 0.0
		for _, name := range []string{"F7", "T7", "F8", "T8"} {
			if c := m.idx(name); c >= 0 {
				tt, a := m.burst(b, c, t, L, amp*uni(r, 0.5, 1))
				if math.Abs(a) > math.Abs(best) {
					tp, best = tt, a
				}
			}
		}
		b.add(muscleRow(Chewing, L*1000, m.halfPeriodMs(s)), tp, m.rate)
	}
	return b
}

// pop is an electrode pop: an abrupt change of one electrode's contact
// potential, rising in 5–15 ms and decaying exponentially over 0.15–0.6 s,
// 80–400 µV, in that electrode alone. c1, c2 and c3 met (an abrupt rise
// and slow fall), c4–c6 failed — the case criterion 6 exists for.
func (m *maker) pop(t0 float64, s span) *built {
	r := m.r
	c := r.IntN(m.nch)
	rise, tau, amp := uni(r, 5, 15)/1000, uni(r, 0.15, 0.6), uni(r, 80, 400)*sign(r)
	b := m.newBuilt(t0, 0.1+5*tau)
	b.at(c, m.rate, func(t float64) float64 {
		t -= 0.1
		switch {
		case t < -rise:
			return 0
		case t < 0:
			return amp * 0.5 * (1 - math.Cos(math.Pi*(t+rise)/rise))
		}
		return amp * math.Exp(-t/tau)
	})
	ev := synth.Event{Kind: synth.Pop, Duration: tau * 1000, Rise: rise * 1000}
	ev.Meets[synth.C1Spiky], ev.Meets[synth.C3Asymmetry] = true, true
	setC2(&ev, rise*1000, m.halfPeriodMs(s))
	b.add(ev, 0.1, m.rate)
	return b
}

// eyeGain is how much of the corneoretinal potential at the eyes reaches
// each electrode: largest frontopolar, falling off with distance.
func (m *maker) eyeGain(eye [3]float64) []float64 {
	g := make([]float64, m.nch)
	for c, p := range m.h.el {
		u := unitv([3]float64(p))
		d := norm3([3]float64{u[0] - eye[0], u[1] - eye[1], u[2] - eye[2]})
		g[c] = math.Exp(-d / 0.28)
	}
	return g
}

// blink: the eyes roll up under the closing lid (Bell's phenomenon), the
// cornea (positive) nears Fp1 and Fp2 — a rounded positive deflection of
// 80–250 µV and 200–400 ms, frontopolar, fading back to the central
// electrodes. c1 failed (rounded), c2 met (longer than the background), c3
// unclear, c4–c6 failed.
func (m *maker) blink(t0 float64, s span) *built {
	r := m.r
	L, rf, amp := uni(r, 0.2, 0.4), uni(r, 0.35, 0.45), uni(r, 80, 250)
	b := m.newBuilt(t0, L+0.3)
	gl, gr := m.eyeGain([3]float64{-0.3, 0.95, -0.1}), m.eyeGain([3]float64{0.3, 0.95, -0.1})
	for c := range b.w {
		g := (gl[c] + gr[c]) / (1 + math.Exp(-0.06/0.28))
		b.at(c, m.rate, func(t float64) float64 { return amp * g * rounded(t-0.1-L*rf, L*rf, L*(1-rf)) })
	}
	ev := synth.Event{Kind: synth.Blink, Duration: L * 1000, Rise: L * rf * 1000}
	ev.Unclear[synth.C3Asymmetry] = true
	setC2(&ev, L*1000, m.halfPeriodMs(s))
	b.add(ev, 0.1+L*rf, m.rate)
	return b
}

// eyeMovement is a horizontal saccade and return: the cornea turns to one
// side, F7 and F8 move in opposite directions in 30–60 ms, hold 0.3–1 s,
// return. The row is at the end of the first step. c1 failed (a step, not a
// spike), c2 unclear, c3 unclear, c4–c6 failed.
func (m *maker) eyeMovement(t0 float64) *built {
	r := m.r
	rise, hold, amp := uni(r, 0.03, 0.06), uni(r, 0.3, 1), uni(r, 50, 150)*sign(r)
	b := m.newBuilt(t0, hold+2*rise+0.3)
	gl, gr := m.eyeGain([3]float64{-0.7, 0.7, -0.1}), m.eyeGain([3]float64{0.7, 0.7, -0.1})
	step := func(t float64) float64 {
		switch {
		case t < 0:
			return 0
		case t < rise:
			return 0.5 * (1 - math.Cos(math.Pi*t/rise))
		case t < rise+hold:
			return 1
		case t < 2*rise+hold:
			return 0.5 * (1 + math.Cos(math.Pi*(t-rise-hold)/rise))
		}
		return 0
	}
	for c := range b.w {
		g := gl[c] - gr[c]
		b.at(c, m.rate, func(t float64) float64 { return amp * g * step(t-0.1) })
	}
	ev := synth.Event{Kind: EyeMove, Duration: (hold + 2*rise) * 1000, Rise: rise * 1000}
	ev.Unclear[synth.C2Duration], ev.Unclear[synth.C3Asymmetry] = true, true
	b.add(ev, 0.1+rise, m.rate)
	return b
}

// ecg is 5–12 s of cardiac artefact at 55–95 beats per minute: the QRS
// complex's far field, a left-to-right gradient across the head (left
// temporal and occipital electrodes most; from memory), 5–25 µV, R wave
// 30–45 ms. One row per R wave: c1 met, c2 by duration, c3 failed (the R
// wave is symmetric), c4–c6 failed.
func (m *maker) ecg(t0 float64, s span) *built {
	r := m.r
	L, hr, amp := uni(r, 5, 12), uni(r, 55, 95), uni(r, 5, 25)
	period := 60 / hr
	b := m.newBuilt(t0, L+0.5)
	g := make([]float64, m.nch)
	for c, p := range m.h.el {
		u := unitv([3]float64(p))
		g[c] = -u[0]*0.8 - u[2]*0.5
	}
	top := 0.0
	for _, x := range g {
		top = math.Max(top, math.Abs(x))
	}
	for c := range g {
		g[c] /= top
	}
	dR := uni(r, 30, 45) / 1000
	for t := 0.2; t < L; t += period * uni(r, 0.97, 1.03) {
		tr := t
		for c := range b.w {
			gc := g[c]
			b.at(c, m.rate, func(x float64) float64 {
				x -= tr
				return amp * gc * (peaked(x, dR/2, dR/2) - 0.15*rounded(x+dR*0.8, 0.01, 0.01) -
					0.25*rounded(x-dR*0.8, 0.012, 0.012) + 0.3*rounded(x-0.28, 0.08, 0.1))
			})
		}
		ev := synth.Event{Kind: ECG, Duration: dR * 1000, Rise: dR * 500}
		ev.Meets[synth.C1Spiky] = true
		setC2(&ev, dR*1000, m.halfPeriodMs(s))
		b.add(ev, tr, m.rate)
	}
	return b
}
