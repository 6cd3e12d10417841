package synth

import (
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"sort"

	"gonum.org/v1/gonum/stat/distuv"
)

// Scheduling constants (common practice).
const (
	eventGap   = 0.25 // minimum quiet time between two events, s
	edgeMargin = 0.5  // minimum distance of any event from the recording ends, s
	stateRamp  = 2.0  // half-length of the linear crossfade between states, s
	placeTries = 60   // placement attempts before an event is dropped
)

// lookalikeMix gives the share of each look-alike kind; vertex transients
// are placed only in drowsy spans and are redrawn when there are none.
var lookalikeMix = []struct {
	kind  string
	share float64
}{{Muscle, 0.25}, {Blink, 0.2}, {Pop, 0.15}, {Wicket, 0.2}, {Vertex, 0.2}}

// drawStates alternates awake (40–150 s) and drowsy (20–80 s) spans,
// starting awake.
func drawStates(r *rand.Rand, dur float64) []StateSpan {
	var out []StateSpan
	t, st := 0.0, Awake
	for t < dur {
		l := uni(r, 40, 150)
		if st == Drowsy {
			l = uni(r, 20, 80)
		}
		end := math.Min(dur, t+l)
		out = append(out, StateSpan{State: st, Start: t, End: end})
		t = end
		if st == Awake {
			st = Drowsy
		} else {
			st = Awake
		}
	}
	return out
}

// drowsiness returns 0 when awake and 1 when drowsy at t, ramping linearly
// over ±stateRamp around a change of state; times outside spans are awake.
func drowsiness(spans []StateSpan, t float64) float64 {
	level := func(t float64) float64 {
		i := sort.Search(len(spans), func(i int) bool { return spans[i].End > t })
		if i < len(spans) && spans[i].Start <= t && spans[i].State == Drowsy {
			return 1
		}
		return 0
	}
	// Average of the level over [t−ramp, t+ramp] at its change points is a
	// linear ramp; sample the two ends and the middle of the window.
	a, m, b := level(t-stateRamp), level(t), level(t+stateRamp)
	if a == b {
		return m
	}
	// One change inside the window: locate it and interpolate.
	lo, hi := t-stateRamp, t+stateRamp
	for range 30 {
		mid := (lo + hi) / 2
		if level(mid) == a {
			lo = mid
		} else {
			hi = mid
		}
	}
	frac := (t + stateRamp - hi) / (2 * stateRamp) // share of window past the change
	return a + (b-a)*frac
}

// schedule draws the events of a recording and places them without overlap.
func schedule(r *rand.Rand, m *eventMaker, nSamples int, states []StateSpan) ([]*plan, error) {
	cfg := m.cfg
	minutes := cfg.Duration / 60
	count := func(rate float64) int {
		if rate == 0 {
			return 0
		}
		return int(distuv.Poisson{Lambda: rate * minutes, Src: r}.Rand())
	}
	nIED, nLook := count(cfg.IEDRate), count(cfg.LookalikeRate)
	var kinds []string
	for range nIED {
		kinds = append(kinds, Spike) // spike or sharp wave is decided by ied
	}
	hasDrowsy := false
	for _, s := range states {
		hasDrowsy = hasDrowsy || s.State == Drowsy
	}
	for range nLook {
		for {
			u, k := r.Float64(), ""
			for _, l := range lookalikeMix {
				if u < l.share {
					k = l.kind
					break
				}
				u -= l.share
			}
			if k == "" {
				k = Muscle
			}
			if k != Vertex || hasDrowsy {
				kinds = append(kinds, k)
				break
			}
		}
	}
	r.Shuffle(len(kinds), func(i, j int) { kinds[i], kinds[j] = kinds[j], kinds[i] })

	var placed []*plan // kept ordered by peak
	gap := int(math.Ceil(eventGap * cfg.Rate))
	edge := int(math.Ceil(edgeMargin * cfg.Rate))
	for _, k := range kinds {
		p, ok, err := m.make(r, k)
		if err != nil {
			return nil, err
		}
		if !ok {
			continue
		}
		lo, hi := p.pre+edge, nSamples-1-p.post-edge
		if hi < lo {
			continue
		}
		for range placeTries {
			peak := lo + r.IntN(hi-lo+1)
			d := drowsiness(states, float64(peak)/cfg.Rate)
			if k == Vertex && d < 1 {
				continue
			}
			// Criterion 2 depends on the background where the event
			// lands; an IED is placed only where it meets at least four
			// criteria (cut-offs of four and five of the six IFCN criteria
			// gave accuracies of 91 % and 88 %: Kural et al. 2020, Neurology
			// 94:e2139–e2147, abstract), as a look-alike meets at most three.
			if c := slices.Index(cfg.Electrodes, p.ev.PeakElectrode); c >= 0 {
				var unclear bool
				p.ev.Meets[C2Duration], unclear = m.differentDuration(&p.ev, c, d)
				p.ev.Unclear[C2Duration] = unclear || p.ev.Kind == Muscle
			}
			if p.ev.IsIED && p.ev.MetCount() < 4 {
				continue
			}
			i := sort.Search(len(placed), func(i int) bool { return placed[i].peak > peak })
			if i > 0 && placed[i-1].peak+placed[i-1].post+gap >= peak-p.pre {
				continue
			}
			if i < len(placed) && peak+p.post+gap >= placed[i].peak-placed[i].pre {
				continue
			}
			if p.ev.IsIED {
				localSNR(p, m.bg.rmsAt(slices.Index(cfg.Electrodes, p.ev.PeakElectrode), d))
			}
			p.peak = peak
			placed = append(placed, nil)
			copy(placed[i+1:], placed[i:])
			placed[i] = p
			break
		}
	}
	for i, p := range placed {
		e := &p.ev
		e.ID = fmt.Sprintf("ev-%04d", i+1)
		e.Onset = float64(p.peak) / cfg.Rate
		e.Start = float64(p.peak-p.pre) / cfg.Rate
		e.End = float64(p.peak+p.post) / cfg.Rate
	}
	return placed, nil
}

// make dispatches on the event kind; ok is false when the montage cannot
// show the kind (a blink without frontopolar electrodes).
func (m *eventMaker) make(r *rand.Rand, kind string) (*plan, bool, error) {
	var p *plan
	var err error
	switch kind {
	case Spike, SharpWave:
		p, err = m.ied(r)
	case Vertex:
		p, err = m.vertex(r)
	case Wicket:
		p, err = m.wicket(r)
	case Muscle:
		p, err = m.muscle(r)
	case Pop:
		p = m.pop(r)
	case Blink:
		var ok bool
		if p, ok = m.blink(r); !ok {
			return nil, false, nil
		}
	}
	return p, err == nil, err
}

// localSNR rescales a placed IED so that its SNR is relative to the
// background where it lands, rms the background's RMS at its peak electrode
// and state, instead of to the median channel's BackgroundRMS: the
// glossary's "distinguishable from background activity" (Kane et al. 2017)
// is a comparison with the activity around the discharge, and a posterior
// IED drawn at 3 × the median channel's RMS stood only 2.3 × above the
// alpha-rich background it rode on (GENERATOR.md).
func localSNR(p *plan, rms float64) {
	if !(rms > 0) {
		return
	}
	f := p.ev.SNR * rms / p.ev.Amplitude
	p.ev.Amplitude *= f
	for c := range p.gains {
		p.gains[c] *= f
	}
}
