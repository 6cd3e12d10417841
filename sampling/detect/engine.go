package detect

import (
	"context"
	"fmt"
	"math"
	"slices"
	"strings"

	"github.com/quorate-eeg/quorate/sampling/candidate"
	"github.com/quorate-eeg/quorate/sampling/headmodel"
	"github.com/quorate-eeg/quorate/sampling/montage"
	"github.com/quorate-eeg/quorate/sampling/signal"
)

// filterTol is the start-up transient tolerance used to size window margins
// (signal.Margin): 1e-3 of the filter's gain, well below the amplitude
// resolution that matters for detection.
const filterTol = 1e-3

// montages are the derivations for one set of good channels: det for
// finding and measuring, car (the same when det is common average) for
// polarity and the voltage map of c6.
type montages struct {
	det, car *montage.Montage
	detPlus  []int // recording channel of each det derivation's Plus
	carPlus  []int
	fitIdx   []int // car derivations with a 10-10 position, in fit order
	fitter   *headmodel.Fitter
	ok       bool
}

// engine detects and measures in one recording. It is not safe for
// concurrent use.
type engine struct {
	s               *settings
	in              *Input  // the input, or its view at designRate (newEngine)
	step            float64 // input samples per sample of in (atDesignRate)
	zp              *signal.ZeroPhase
	margin          int
	rate            float64
	notchHz         []float64 // the notches (notches), once notchKnown
	notchKnown      bool
	source          string // Row.Source of the rows made
	mons            map[string]*montages
	warnings        []string
	warned          map[string]int
	sc              scratch
	raw, det, car   [][]float32
	med, mad, scale [][]float64
	blk             []float32
	dets            []detection
	vmap, emap      []float64
	bank            bank
	vc              blockCov // the window's background moments for criterion 3
	vcReady         bool     // vc is of the current window
}

// warn records a warning once per distinct text, counting repeats.
func (e *engine) warn(format string, args ...any) {
	w := fmt.Sprintf(format, args...)
	if e.warned == nil {
		e.warned = map[string]int{}
	}
	if e.warned[w] == 0 {
		e.warnings = append(e.warnings, w)
	}
	e.warned[w]++
}

// setRate designs the conditioning filter for a sampling rate: Butterworth
// band-pass of order 2 per edge, the upper edge capped at 0.45 of the rate,
// followed by a notch (q = 30) at each mains frequency notches chooses for
// the recording, below Nyquist.
func (e *engine) setRate(fs float64) error {
	if e.zp != nil && e.rate == fs {
		return nil
	}
	hiHz := min(e.s.band[1], 0.45*fs)
	if hiHz <= e.s.band[0] {
		return &OptionError{"Bandpass", e.s.band, fmt.Sprintf("no pass band below 0.45 × %g Hz", fs)}
	}
	bp, err := signal.Butterworth(signal.BandPass, 2, fs, e.s.band[0], hiHz)
	if err != nil {
		return err
	}
	sos := bp
	if !e.notchKnown {
		e.notchHz, e.notchKnown = e.notches(), true
	}
	for _, f := range e.notchHz {
		if f < 0.5*fs {
			n, err := signal.Notch(f, 30, fs)
			if err != nil {
				return err
			}
			sos = signal.Cascade(sos, n)
		}
	}
	e.zp = signal.NewZeroPhase(sos)
	e.margin = signal.Margin(sos, filterTol)
	e.rate = fs
	return nil
}

// montagesFor returns the montages for a bad-channel mask, building and
// caching them on first use.
func (e *engine) montagesFor(bad []bool) *montages {
	key := fmt.Sprint(bad)
	if m, ok := e.mons[key]; ok {
		return m
	}
	m := &montages{}
	e.mons[key] = m
	det, ws, err := montage.Build(e.s.kind, e.in.Labels, bad)
	for _, w := range ws {
		e.warn("montage %s: %s", e.s.kind, w)
	}
	if err != nil {
		e.warn("montage %s: %v; windows with these channels skipped", e.s.kind, err)
		return m
	}
	m.det = det
	m.car = det
	if e.s.kind != montage.CommonAverage {
		car, _, err := montage.Build(montage.CommonAverage, e.in.Labels, bad)
		if err != nil {
			e.warn("common average: %v; windows with these channels skipped", err)
			return m
		}
		m.car = car
	}
	for _, d := range m.det.Derivations() {
		m.detPlus = append(m.detPlus, d.Plus)
	}
	var pos []headmodel.Vec3
	for i, d := range m.car.Derivations() {
		m.carPlus = append(m.carPlus, d.Plus)
		if p, ok := headmodel.Position(e.in.Labels[d.Plus]); ok {
			m.fitIdx = append(m.fitIdx, i)
			pos = append(pos, p)
		}
	}
	if e.in.SplitMap {
		e.warn("potentials relative to more than one mean: dipole fit unavailable (c6 not measured)")
	} else if f, err := headmodel.NewFitter(pos, headmodel.DefaultHead(), headmodel.FitOptions{MaxEccentricity: fitEccentricity}); err == nil {
		m.fitter = f
	} else {
		e.warn("dipole fit unavailable (c6 not measured): %v", err)
	}
	m.ok = true
	return m
}

func grow32(b [][]float32, n, l int) [][]float32 {
	for len(b) < n {
		b = append(b, nil)
	}
	for i := range b[:n] {
		if cap(b[i]) < l {
			b[i] = make([]float32, l)
		}
		b[i] = b[i][:l]
	}
	return b[:n]
}

// window is one conditioned stretch: buffer index i is input sample base+i;
// [lo, hi) is conditioned with full filter margins or the true ends.
type window struct {
	base   int64
	lo, hi int
	m      *montages
}

// condition reads input samples [cs−M, ce+M) (clipped), flags bad channels
// on [qs, qe), applies the montages and filters. It returns ok = false, with
// a warning, when the window cannot be used.
func (e *engine) condition(cs, ce, qs, qe int64) (window, bool, error) {
	e.vcReady = false
	in := e.in
	rs, re := max(cs-int64(e.margin), 0), min(ce+int64(e.margin), in.Len)
	L := int(re - rs)
	w := window{base: rs, lo: int(cs - rs), hi: int(ce - rs)}
	if L <= e.zp.Pad() {
		e.warn("stretch of %.1f s at %.1f s too short to filter; skipped", float64(in.Len)/in.Rate, in.StartS)
		return w, false, nil
	}
	nc := len(in.Labels)
	e.raw = grow32(e.raw, nc, L)
	bad := make([]bool, nc)
	for c := range nc {
		if !montage.IsElectrode(in.Labels[c]) {
			bad[c] = true
			continue
		}
		if err := in.Src.ReadAt(c, rs, e.raw[c]); err != nil {
			return w, false, err
		}
		x := e.raw[c]
		nonFinite := 0
		for i, v := range x {
			// v − v is 0 for every finite v and NaN for NaN and ±Inf
			if d := v - v; d != d {
				x[i] = 0
				nonFinite++
			}
		}
		// quality on every 16th sample of the stretch to be detected in
		// (16 per second at 256 Hz, about 1900 in a 120 s window): the 1st
		// and 99th percentiles of a decimated sample are as good a
		// flatness test and cost a fraction of the sort
		a, b := int(qs-rs), int(qe-rs)
		e.blk = e.blk[:0]
		for i := a; i < b; i += 16 {
			e.blk = append(e.blk, x[i])
		}
		var pr [2]float64
		if in.PhysRange != nil {
			pr = in.PhysRange[c]
		}
		q := montage.ChannelQuality(e.blk, pr)
		switch {
		case nonFinite > 0:
			bad[c] = true
			e.warn("channel %s: non-finite samples (bad scaling?); excluded where present", in.Labels[c])
		case q.Saturated:
			bad[c] = true
			e.warn("channel %s: saturated; excluded where saturated", in.Labels[c])
		case q.Flat:
			bad[c] = true
			e.warn("channel %s: flat; excluded where flat", in.Labels[c])
		}
	}
	m := e.montagesFor(bad)
	if !m.ok {
		return w, false, nil
	}
	w.m = m
	e.det = grow32(e.det, m.det.Len(), L)
	m.det.Apply(e.raw, e.det)
	for _, x := range e.det {
		if err := e.zp.Apply32(x); err != nil {
			return w, false, err
		}
	}
	if m.car != m.det {
		e.car = grow32(e.car, m.car.Len(), L)
		m.car.Apply(e.raw, e.car)
		for _, x := range e.car {
			if err := e.zp.Apply32(x); err != nil {
				return w, false, err
			}
		}
	}
	return w, true, nil
}

// carTraces returns the common-average traces of the current window.
func (e *engine) carTraces(w window) [][]float32 {
	if w.m.car == w.m.det {
		return e.det
	}
	return e.car
}

// scaleStride is the decimation of the broadband background scale: every
// 4th sample (64 per second at 256 Hz) estimates a block's MAD well enough
// once the median over ±BackgroundS/2 of blocks is taken, at a quarter of
// the cost.
const scaleStride = 4

// scales computes the robust background scale per 1 s block of every
// derivation, for the blocks that samples [from, to) of window w read.
// Blocks are aligned to whole seconds of the input (sample multiples of the
// block length), not to the window, so that a window cut differently
// (MeasureAt's) gives the same scales. A block's scale is the median over
// the BackgroundS/2 = h blocks either side (slidingScale), so the blocks
// computed are those of [from, to) and h more either side, clipped to the
// window's [w.lo, w.hi): the scales read are then exactly those of every
// block of the window, without the cost of the blocks in the window's
// context that no detection reads. It returns the block length and the
// buffer indexes [start, end) of the blocks computed; samples before start
// take the first block's scale (start is the window's first block then).
func (e *engine) scales(w window, from, to int) (block, start, end int) {
	block = max(1, int(math.Round(e.rate)))
	start = w.lo + int((int64(block)-(w.base+int64(w.lo))%int64(block))%int64(block))
	if w.hi-start < block/2 {
		start = w.lo
	}
	h := max(0, int(math.Round(e.s.backS/2)))
	nb := (w.hi - start + block - 1) / block // blocks of the whole window
	b0 := max(0, (from-start)/block-h)
	b1 := min(nb, max(0, to-1-start)/block+h+1)
	start, end = start+b0*block, min(start+b1*block, w.hi)
	n := len(e.det)
	for len(e.med) < n {
		e.med, e.mad, e.scale = append(e.med, nil), append(e.mad, nil), append(e.scale, nil)
	}
	for d := range n {
		e.med[d], e.mad[d] = blockStatsStride(e.det[d][start:end], block, scaleStride, e.med[d], e.mad[d], e.blk)
		e.scale[d] = slidingScale(e.mad[d], h, e.scale[d])
	}
	return block, start, end
}

// scaleAt is the background scale of derivation d at buffer index i.
func (e *engine) scaleAt(d, i, block, start int) float64 {
	sc := e.scale[d]
	return sc[min(max(i-start, 0)/block, len(sc)-1)]
}

// run detects in input samples [0, Len) window by window, handing each
// window's rows, in onset order, to emit as soon as they are measured, so
// that nothing accumulates over the recording. emit must not keep the slice.
func (e *engine) run(ctx context.Context, emit func([]candidate.Row) error) error {
	in := e.in
	fs := in.Rate
	if err := e.setRate(fs); err != nil {
		return err
	}
	W := int64(math.Round(e.s.windowS * fs))
	C := int64(math.Ceil(max(contextNeed, e.s.backS/2+0.5) * fs))
	var rows []candidate.Row
	for ws := int64(0); ws < in.Len; ws += W {
		if err := ctx.Err(); err != nil {
			return err
		}
		we := min(ws+W, in.Len)
		w, ok, err := e.condition(max(ws-C, 0), min(we+C, in.Len), ws, we)
		if err != nil {
			return err
		}
		if !ok {
			continue
		}
		rows = rows[:0]
		for _, c := range e.find(w, ws, we) {
			rows = append(rows, e.row(w, c))
		}
		if len(rows) > 0 {
			if err := emit(rows); err != nil {
				return err
			}
		}
	}
	return nil
}

// find returns the events of conditioned window w whose anchoring peak lies
// in input samples [ws, we), in onset order. Detections up to the merge
// tolerance and the reach of a complex beyond [ws, we) are found too, so
// that events at the window's edges are merged and suppressed as they would
// be inside it.
func (e *engine) find(w window, ws, we int64) []cluster {
	tol := int(math.Round(e.s.mergeS * e.rate))
	before, after := int(math.Round(complexBeforeS*e.rate)), int(math.Round(complexAfterS*e.rate))
	reach := tol + before + after
	from := max(int(ws-w.base)-reach, w.lo)
	to := min(int(we-w.base)+reach, w.hi)
	block, bstart, bend := e.scales(w, from, to)
	e.dets = e.dets[:0]
	if e.bank.hats == nil {
		e.bank.hats = hatsFor(e.rate)
	}
	h := max(0, int(math.Round(e.s.backS/2)))
	for d, x := range e.det {
		e.bank.prepare(x, bstart, bend, block, h)
		at := func(i int) float64 { return e.scaleAt(d, i, block, bstart) }
		e.dets = findChannel(e.dets, d, x, from, to, e.rate, e.s.thr, at, &e.bank, bstart, block)
	}
	out := complexes(merge(e.dets, tol), before, after, complexFrac, e.rate)
	k := 0
	for _, c := range out {
		if p := int64(c.best.ph.peak) + w.base; p >= ws && p < we {
			out[k] = c
			k++
		}
	}
	return out[:k]
}

// traceOf returns the trace event c is measured on, with the bounds of its
// vigilance state when the input gives states, its onset (seconds from the
// recording start) and its state.
func (e *engine) traceOf(w window, c cluster) (t *trace, onset float64, state string) {
	in := e.in
	t = &trace{x: e.det[c.best.deriv], lo: w.lo, hi: w.hi, fs: e.rate}
	onset = in.StartS + float64(w.base+int64(c.best.ph.peak))/e.rate
	state = StateUnknown
	if sp, ok := spanAt(in.States, onset); ok {
		state = sp.State
		at := func(s float64) int { // buffer index of time s, clamped to the window
			i := math.Round((s-in.StartS)*e.rate) - float64(w.base)
			return int(max(float64(w.lo), min(float64(w.hi), i)))
		}
		t.stLo, t.stHi = at(sp.Start), at(sp.End)
	}
	return t, onset, state
}

// row measures one event and fills its candidate row.
func (e *engine) row(w window, c cluster) candidate.Row {
	in := e.in
	ph := c.best.ph
	t, onset, state := e.traceOf(w, c)
	if !e.vcReady {
		e.vc.build(e.det, w.lo, w.hi, w.base, e.rate)
		e.vcReady = true
	}
	ms := measure(t, ph, e.det, &e.vc, &e.sc)
	labels := in.Labels
	elec := labels[w.m.detPlus[c.best.deriv]]
	car := e.carTraces(w)
	// polarity in the common average, at the peak electrode
	pol := ph.sign
	ref := -1 // the peak electrode's common-average derivation
	if w.m.car != w.m.det {
		for i, p := range w.m.carPlus {
			if labels[p] == elec {
				pol = math.Copysign(1, float64(car[i][ph.peak]))
				ref = i
			}
		}
	} else {
		ref = c.best.deriv
	}
	e.vmap = e.vmap[:0]
	for _, i := range w.m.fitIdx {
		e.vmap = append(e.vmap, float64(car[i][ph.peak]))
	}
	if ref >= 0 {
		e.emap = eventMap(car, w.m.fitIdx, car[ref], ph.left, ph.right, e.emap)
	} else {
		e.emap = append(e.emap[:0], e.vmap...)
	}
	f := cerebralField(w.m.fitter, e.vmap, e.emap)
	var chans []string
	for _, d := range c.members {
		chans = append(chans, labels[w.m.detPlus[d]])
	}
	slices.Sort(chans)
	chans = slices.Compact(chans)
	sample := in.FirstSample + int64(math.Round(float64(w.base+int64(ph.peak))*e.step))
	lobe, side := montage.Region(elec)
	row := candidate.Row{
		EventID:            candidate.EventID(in.RecordingID, e.source, sample),
		RecordingID:        in.RecordingID,
		SubjectKey:         in.SubjectKey,
		Source:             e.source,
		OnsetS:             onset,
		PeakChannel:        elec,
		Polarity:           map[bool]string{true: "negative", false: "positive"}[pol < 0],
		Lobe:               lobe,
		Side:               side,
		Region:             strings.Trim(lobe+"-"+side, "-"),
		Channels:           chans,
		AmplitudeUV:        ph.amp,
		State:              state,
		C1DurationMS:       ms.durMS,
		C1Sharpness:        ms.sharp,
		C1Phases:           int32(ms.phases),
		C2DurationLogRatio: ms.logRatio,
		C2BackgroundMS:     ms.bgMS,
		C3Asymmetry:        ms.asym,
		C3RiseMS:           ms.riseMS,
		C3FallMS:           ms.fMS,
		C4SlowWaveRatio:    ms.slow,
		C5Disruption:       ms.disrupt,
		C6DipoleGOF:        f.gof,
		C6DipoleX:          f.pos[0],
		C6DipoleY:          f.pos[1],
		C6DipoleZ:          f.pos[2],
		C6Orientation:      f.orient,
		C6FieldExtent:      int32(f.extent),
		Imported:           math.NaN(),
	}
	decide(&row, c.best.z, e.s.thr, e.s.cut)
	return row
}

// Detect finds and measures candidate events in one input stretch. Warnings
// describe what was degraded or skipped; an error means the stretch could
// not be read at all.
func Detect(ctx context.Context, in Input, o Options) ([]candidate.Row, []string, error) {
	s, err := o.settings()
	if err != nil {
		return nil, nil, err
	}
	e := newEngine(s, &in)
	var rows []candidate.Row
	err = e.run(ctx, func(r []candidate.Row) error { rows = append(rows, r...); return nil })
	return rows, e.warnings, err
}

// newEngine returns an engine over in, or over its view at designRate when
// in is sampled at another rate (atDesignRate; no warning: it is the normal
// reading of such a recording).
func newEngine(s *settings, in *Input) *engine {
	e := &engine{s: s, in: in, step: 1, source: "builtin", mons: map[string]*montages{}}
	if in.Rate != designRate {
		if d, q, err := atDesignRate(*in); err == nil {
			e.in, e.step = &d, q
		} else {
			e.warn("sampled at %g Hz and not resampled to %g Hz, the rate the features were designed at: %v", in.Rate, designRate, err)
		}
	}
	return e
}
