package textbook

import (
	"math/rand/v2"

	"github.com/quorate-eeg/quorate/sampling/synth"
)

// Kinds this generator adds to synth's (synth.Spike, synth.SharpWave,
// synth.Muscle, synth.Blink, synth.Pop, synth.Wicket and synth.Vertex keep
// their names).
const (
	SpikeWave   = "spike-and-slow-wave" // IED
	Polyspike   = "polyspike"           // IED
	SmallSharp  = "small-sharp-spike"   // benign sporadic sleep spike
	Positive146 = "14-and-6-positive"   // 14 and 6 Hz positive burst, one row per wave
	POSTS       = "posts"               // positive occipital sharp transient of sleep
	KComplex    = "k-complex"
	Mu          = "mu" // one row per wave
	Lambda      = "lambda"
	Chewing     = "chewing" // one row per burst
	EyeMove     = "eye-movement"
	ECG         = "ecg" // one row per QRS
)

// built is one event ready to add: its contribution to every channel from
// sample start on, the sample of its main peak, its truth row (peak
// electrode, amplitude and SNR filled in later) and any background
// attenuation it causes.
type built struct {
	start int
	w     [][]float64
	rows  []row
	atten *attenuation
}

// row is one truth row of an event: a train has one per wave. peak is the
// sample of its main peak, counted from the event's start.
type row struct {
	ev   synth.Event
	peak int
}

// add appends a truth row peaking at t s from the event's start.
func (b *built) add(ev synth.Event, t, rate float64) {
	b.rows = append(b.rows, row{ev: ev, peak: int(t*rate + 0.5)})
}

// attenuation scales the background by 1 − depth·gain[c]·window over
// [start, start+n) samples (Hann window): the disruption of the background
// around an IED (criterion 5).
type attenuation struct {
	start, n int
	depth    float64
	gain     []float64
}

// maker builds events for one recording.
type maker struct {
	r     *rand.Rand
	h     *head
	rate  float64
	nch   int
	alpha float64
	focus [3]float64
	bgRMS float64
}

// newBuilt allocates an event over [t0, t0+length) s.
func (m *maker) newBuilt(t0, length float64) *built {
	n := int(length*m.rate) + 1
	b := &built{start: int(t0 * m.rate), w: make([][]float64, m.nch)}
	for c := range b.w {
		b.w[c] = make([]float64, n)
	}
	return b
}

// cerebral adds src(t) (t in s from the event's start) times the scalp map v.
func (b *built) cerebral(v []float64, rate float64, src func(t float64) float64) {
	for k := range b.w[0] {
		y := src(float64(k) / rate)
		if y == 0 {
			continue
		}
		for c := range b.w {
			b.w[c][k] += v[c] * y
		}
	}
}

// at adds src(t) to channel c alone.
func (b *built) at(c int, rate float64, src func(t float64) float64) {
	for k := range b.w[c] {
		b.w[c][k] += src(float64(k) / rate)
	}
}

// halfPeriodMs is the half-period of the state's dominant background rhythm:
// alpha awake, theta (6 Hz) drowsy, 4 Hz in N2, ms — what criterion 2
// compares with (Kane et al. 2017, criterion 2).
func (m *maker) halfPeriodMs(s span) float64 {
	switch s.State {
	case Drowsy:
		return 1000 / (2 * 6.0)
	case N2:
		return 1000 / (2 * 4.0)
	}
	return 1000 / (2 * m.alpha)
}

// c2Label says whether a main phase of durMs differs from the background's
// half-period halfMs: met when the ratio is ≤ 2/3 or ≥ 3/2, failed within
// 0.8–1.25, unclear between (this generator's rule, common practice).
func c2Label(durMs, halfMs float64) (meets, unclear bool) {
	q := durMs / halfMs
	switch {
	case q <= 2.0/3 || q >= 1.5:
		return true, false
	case q >= 0.8 && q <= 1.25:
		return false, false
	}
	return q > 1, true
}

// setC2 fills the criterion-2 fields of ev.
func setC2(ev *synth.Event, durMs, halfMs float64) {
	ev.C2DurationMs, ev.BackgroundHalfMs = durMs, halfMs
	ev.Meets[synth.C2Duration], ev.Unclear[synth.C2Duration] = c2Label(durMs, halfMs)
}

// orient returns a moment at pos: radial, tangential or oblique (45°) to the
// surface, with its name.
func orient(r *rand.Rand, pos [3]float64, kind string) [3]float64 {
	n := unitv(pos)
	t := randUnit(r)
	d := t[0]*n[0] + t[1]*n[1] + t[2]*n[2]
	for i := range t {
		t[i] -= d * n[i]
	}
	t = unitv(t)
	var m [3]float64
	for i := range m {
		switch kind {
		case "radial":
			m[i] = n[i]
		case "tangential":
			m[i] = t[i]
		default:
			m[i] = (n[i] + t[i]) / 1.4142135623730951
		}
	}
	return m
}

func unitv(v [3]float64) [3]float64 {
	n := norm3(v)
	return [3]float64{v[0] / n, v[1] / n, v[2] / n}
}

func norm3(v [3]float64) float64 {
	return sqrt(v[0]*v[0] + v[1]*v[1] + v[2]*v[2])
}
