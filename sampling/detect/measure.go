package detect

import (
	"context"
	"math"
	"slices"

	"github.com/quorate-eeg/quorate/sampling/candidate"
	"github.com/quorate-eeg/quorate/sampling/edf"
)

// searchS is how far from a given onset MeasureAt looks for the peak.
const searchS = 0.100

// MeasureAt measures the candidate features of events at given onsets
// (seconds from the recording start), for events found by another detector.
// For each onset it takes, over all derivations, the finder's own detection
// (threshold and 20–200 ms main phase) nearest the onset within ±100 ms, or
// failing that the extremum there whose main phase is largest in background
// scales, and measures it exactly
// as the finder's events are; the involved channels are those where the
// finder's own threshold is met within the merge tolerance. Rows have Source
// Options.Source ("import" if empty), and their onset is the peak found. An
// onset outside every recorded segment gives a warning and no row, so rows
// need not align with onsets; use OnsetS to match them.
func MeasureAt(rec *edf.Reader, onsets []float64, opts Options) ([]candidate.Row, []string, error) {
	s, err := opts.settings()
	if err != nil {
		return nil, nil, err
	}
	var recID, subject string
	if len(opts.Recordings) == 1 {
		recID, subject = opts.Recordings[0].RecordingID, opts.Recordings[0].SubjectKey
	}
	ins, warns, err := edfInputs(rec, recID, subject)
	if err != nil {
		return nil, warns, err
	}
	source := opts.Source
	if source == "" {
		source = "import"
	}
	engines := make([]*engine, len(ins))
	var rows []candidate.Row
	var all []string
	for _, t := range onsets {
		k := -1
		for i, in := range ins {
			if t >= in.StartS && t < in.StartS+float64(in.Len)/in.Rate {
				k = i
			}
		}
		if k < 0 {
			warns = append(warns, "onset outside the recorded segments: "+formatS(t))
			continue
		}
		if engines[k] == nil {
			engines[k] = newEngine(s, &ins[k])
			engines[k].source = source
			if err := engines[k].setRate(engines[k].in.Rate); err != nil {
				return nil, warns, err
			}
		}
		e := engines[k]
		row, ok, err := e.at(t)
		if err != nil {
			return nil, warns, err
		}
		if ok {
			rows = append(rows, row)
		}
	}
	for _, e := range engines {
		if e != nil {
			all = append(all, e.warnings...)
		}
	}
	return rows, append(warns, all...), nil
}

// at measures the event nearest onset t (seconds from the recording start).
func (e *engine) at(t float64) (candidate.Row, bool, error) {
	in := e.in
	fs := in.Rate
	c := int64(math.Round((t - in.StartS) * fs))
	r := int64(math.Round(searchS * fs))
	C := int64(math.Ceil(max(contextNeed, e.s.backS/2+0.5) * fs))
	ws, we := max(c-r, 0), min(c+r+1, in.Len)
	w, ok, err := e.condition(max(ws-C, 0), min(we+C, in.Len), max(ws-C, 0), min(we+C, in.Len))
	if err != nil || !ok {
		e.warn("onset %s: window could not be conditioned", formatS(t))
		return candidate.Row{}, false, err
	}
	block, bstart, bend := e.scales(w, w.lo, w.hi)
	tol := int(math.Round(e.s.mergeS * fs))
	if e.bank.hats == nil {
		e.bank.hats = hatsFor(fs)
	}
	h := max(0, int(math.Round(e.s.backS/2)))
	// the finder's own detection nearest the onset; failing that, the
	// extremum with the largest matched response
	var best detection
	found, passes := false, false
	ci := int(c - w.base)
	near := make([]bool, len(e.det)) // derivations with a detection near the onset
	var dets []detection
	for d, x := range e.det {
		e.bank.prepare(x, bstart, bend, block, h)
		at := func(i int) float64 { return e.scaleAt(d, i, block, bstart) }
		zAt := func(i int, sign float64) float64 { return e.bank.z(i, sign, bstart, block) }
		for i := max(int(ws-w.base), 1); i < min(int(we-w.base), len(x)-1); i++ {
			ok, sign := isExtremum(x, i)
			if !ok {
				continue
			}
			s := at(i)
			if !(s > 0) {
				continue
			}
			cand, pass := examine(x, d, i, sign, fs, e.s.thr, s, zAt(i, sign))
			better := false
			switch {
			case !found, pass && !passes:
				better = true
			case pass && passes:
				// as the finder merges: the strongest within the merge
				// tolerance of the onset, else the nearest
				dn, db := abs(i-ci), abs(best.ph.peak-ci)
				switch in, ib := dn <= tol, db <= tol; {
				case in && ib:
					better = cand.rank() > best.rank()
				case in != ib:
					better = in
				default:
					better = dn < db
				}
			case !pass && !passes:
				better = cand.z > best.z
			}
			if better {
				best, found, passes = cand, true, pass
			}
		}
		dets = findChannel(dets, d, x, max(int(ws-w.base)-tol, w.lo), min(int(we-w.base)+tol, w.hi), fs, e.s.thr, at, &e.bank, bstart, block)
	}
	if !found {
		e.warn("onset %s: no peak within ±100 ms", formatS(t))
		return candidate.Row{}, false, nil
	}
	// involved: the derivations with a detection within the merge
	// tolerance of the peak found
	cl := cluster{best: best, members: []int{best.deriv}}
	for _, dt := range dets {
		if abs(dt.ph.peak-best.ph.peak) <= tol && dt.deriv != best.deriv && !near[dt.deriv] {
			near[dt.deriv] = true
			cl.members = append(cl.members, dt.deriv)
		}
	}
	slices.Sort(cl.members)
	return e.row(w, cl), true, nil
}

// detectFile runs every segment of one EDF-family file, in order, handing
// rows to emit as each window is done (see engine.run).
func detectFile(ctx context.Context, s *settings, r *edf.Reader, recID, subject string, emit func([]candidate.Row) error) ([]string, error) {
	ins, warns, err := edfInputs(r, recID, subject)
	if err != nil {
		return warns, err
	}
	for i := range ins {
		e := newEngine(s, &ins[i])
		err := e.run(ctx, emit)
		warns = append(warns, e.warnings...)
		if err != nil {
			return warns, err
		}
	}
	return warns, nil
}
