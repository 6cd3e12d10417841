package excerpt

import (
	"context"
	"errors"
	"fmt"
	"math"
	"path/filepath"
	"slices"
	"sort"

	"github.com/quorate-eeg/quorate/internal/progress"
	"github.com/quorate-eeg/quorate/panel/packet"
	"github.com/quorate-eeg/quorate/sampling/archive"
	"github.com/quorate-eeg/quorate/sampling/draw"
	"github.com/quorate-eeg/quorate/sampling/edf"
	"github.com/quorate-eeg/quorate/sampling/headmodel"
	"github.com/quorate-eeg/quorate/sampling/headmodel/spline"
	"github.com/quorate-eeg/quorate/sampling/signal"
)

// Options configure Cut.
type Options struct {
	Rows       []draw.Row
	Recordings []archive.Recording
	Roots      []string   // archive roots; Recording.Root indexes them
	WindowS    float64    // seconds rated, centred on the event (default 10)
	ContextS   float64    // seconds of context either side of the rated window (default 3)
	MaxRate    float64    // above this rate traces are decimated by a whole factor (default 512 Hz)
	Bandpass   [2]float64 // filters of the voltage map, which the page does not refilter
	NotchHz    float64
	MapSize    int // voltage-map grid (default 40)
	Progress   func(total int, desc string) progress.Bar
}

// MissingError names drawn recordings that are no longer where the index says.
type MissingError struct{ Paths []string }

func (e *MissingError) Error() string {
	return fmt.Sprintf("%d recording(s) of the draw are missing from the archive since the scan: %v", len(e.Paths), e.Paths)
}

// ErrMissingRecordings is matched by errors.Is on a MissingError.
var ErrMissingRecordings = errors.New("excerpt: drawn recordings missing from the archive")

// Unwrap gives ErrMissingRecordings.
func (e *MissingError) Unwrap() error { return ErrMissingRecordings }

// DefaultContextS is the context shown on either side of the rated window; the
// page's filters run over it, so their edge transients stay in the context.
const DefaultContextS = 3

// DefaultMaxRate keeps the recorded rate of every common EEG system (200–512
// Hz) and decimates only higher rates, which add nothing to reading at the
// page's highest high-frequency filter setting. // common practice
const DefaultMaxRate = 512

// Cut returns one item per drawn row, in draw order, and warnings. The electrode set is
// the standard electrodes present in every recording of the draw, so that every item of
// a packet can share one montage. Cut checks ctx before each recording and
// each event and returns ctx's error as soon as it is done.
func Cut(ctx context.Context, o Options) ([]packet.Item, []string, error) {
	if err := ctx.Err(); err != nil {
		return nil, nil, err
	}
	if o.WindowS <= 0 {
		o.WindowS = 10
	}
	if o.ContextS <= 0 {
		o.ContextS = DefaultContextS
	}
	if o.MaxRate <= 0 {
		o.MaxRate = DefaultMaxRate
	}
	if o.MapSize <= 0 {
		o.MapSize = 40
	}
	recs := map[string]archive.Recording{}
	for _, r := range o.Recordings {
		recs[r.RecordingID] = r
	}
	var missing []string
	needed := map[string]bool{}
	for _, r := range o.Rows {
		rec, ok := recs[r.RecordingID]
		if !ok {
			return nil, nil, fmt.Errorf("draw row %s: recording %s is not in the index", r.EventID, r.RecordingID)
		}
		if !needed[r.RecordingID] {
			needed[r.RecordingID] = true
			if _, err := statFile(pathOf(o.Roots, rec)); err != nil {
				missing = append(missing, pathOf(o.Roots, rec))
			}
		}
	}
	if len(missing) > 0 {
		sort.Strings(missing)
		return nil, nil, &MissingError{missing}
	}
	electrodes, warnings := commonElectrodes(o.Rows, recs)
	if len(electrodes) < 3 {
		return nil, warnings, fmt.Errorf("the drawn recordings share only %d standard electrodes %v; at least 3 are needed", len(electrodes), electrodes)
	}
	pos, _ := headmodel.Positions(electrodes)
	ip, err := spline.New(pos, spline.DefaultOrder, 1e-5, spline.DefaultTerms)
	if err != nil {
		return nil, warnings, err
	}
	marks := make([]packet.MapElectrode, len(pos))
	for i, p := range pos {
		th := math.Acos(max(-1, min(1, p[2])))
		az := math.Atan2(p[0], p[1])
		marks[i] = packet.MapElectrode{Name: electrodes[i], X: th / spline.DefaultEdge * math.Sin(az), Y: th / spline.DefaultEdge * math.Cos(az)}
	}
	byRec := map[string][]int{}
	for i, r := range o.Rows {
		byRec[r.RecordingID] = append(byRec[r.RecordingID], i)
	}
	ids := make([]string, 0, len(byRec))
	for id := range byRec {
		ids = append(ids, id)
	}
	sort.Strings(ids)
	bar := progress.Bar(progress.Silent{})
	if o.Progress != nil {
		bar = o.Progress(len(o.Rows), "cutting excerpts")
	}
	defer bar.Finish()
	items := make([]packet.Item, len(o.Rows))
	for _, id := range ids {
		if err := ctx.Err(); err != nil {
			return nil, warnings, err
		}
		rec := recs[id]
		rd, err := edf.Open(pathOf(o.Roots, rec))
		if err != nil {
			return nil, warnings, err
		}
		c, err := newCutter(rd, electrodes, o)
		if err != nil {
			rd.Close()
			return nil, warnings, fmt.Errorf("%s: %w", pathOf(o.Roots, rec), err)
		}
		for _, i := range byRec[id] {
			if err := ctx.Err(); err != nil {
				rd.Close()
				return nil, warnings, err
			}
			r := o.Rows[i]
			it, atPeak, err := c.item(r.OnsetS)
			if err != nil {
				rd.Close()
				return nil, warnings, fmt.Errorf("%s, event at %.3f s: %w", pathOf(o.Roots, rec), r.OnsetS, err)
			}
			it.EventID, it.Electrodes = r.EventID, electrodes
			it.Source = map[string]string{"subject": r.SubjectKey, "recording": r.RecordingID,
				"onset_s": fmt.Sprintf("%.4f", r.OnsetS), "stratum": r.Stratum, "kind": r.Kind}
			it.Map = mapOf(ip, atPeak, marks, o.MapSize)
			items[i] = it
			bar.Add(1)
		}
		rd.Close()
	}
	return items, warnings, nil
}

func pathOf(roots []string, r archive.Recording) string {
	if int(r.Root) < len(roots) {
		return filepath.Join(roots[r.Root], filepath.FromSlash(r.Path))
	}
	return filepath.FromSlash(r.Path)
}

// standard is the 10-20 set in display order (Jasper 1958; 10-10 names).
var standard = []string{"Fp1", "Fp2", "F7", "F3", "Fz", "F4", "F8", "T7", "C3", "Cz", "C4", "T8", "P7", "P3", "Pz", "P4", "P8", "O1", "O2"}

func commonElectrodes(rows []draw.Row, recs map[string]archive.Recording) ([]string, []string) {
	count := map[string]int{}
	n := 0
	seen := map[string]bool{}
	for _, r := range rows {
		if seen[r.RecordingID] {
			continue
		}
		seen[r.RecordingID] = true
		n++
		for _, e := range recs[r.RecordingID].EEGChannels {
			count[e]++
		}
	}
	var out, warn []string
	for _, e := range standard {
		switch {
		case count[e] == n:
			out = append(out, e)
		case count[e] > 0:
			warn = append(warn, fmt.Sprintf("electrode %s is missing from %d of %d drawn recordings and is left out of every packet", e, n-count[e], n))
		}
	}
	return out, warn
}

// edfElectrode finds electrode e in the header: a signal of its own (its
// index, rate and µV factor) or, in a recording stored as bipolar
// derivations, a recovered electrode (−1−k, its rate, 1: ReadRecovered
// reads µV).
func edfElectrode(h *edf.Header, e string) (sig int, hz, microvolts float64, ok bool) {
	for i, s := range h.Signals {
		if s.Kind == edf.EEG && s.Name == e {
			k, _ := s.Microvolts()
			return i, s.SampleRate(h.RecordDuration), k, true
		}
	}
	for j, r := range h.Recovered {
		if r.Name == e {
			hz, _ := h.RecoveredRate()
			return -1 - j, hz, 1, true
		}
	}
	return 0, 0, 0, false
}

// cutter reads windows of one recording.
type cutter struct {
	rd        *edf.Reader
	sig       []int     // signal index, or −1−k for recovered electrode k (edf.Header.Recovered)
	scale     []float32 // µV per physical unit of each signal (edf.Signal.Microvolts)
	perRecord int64     // samples per data record of those signals
	fs        float64
	factor    int
	rate      float64
	mapSOS    signal.SOS // the study's filters, for the voltage map only
	antiAl    signal.SOS // anti-aliasing low-pass before decimation; nil when factor is 1
	window    int        // rated samples at the recording's rate
	context   int        // context samples on each side
	cond      string
}

func newCutter(rd *edf.Reader, electrodes []string, o Options) (*cutter, error) {
	h := rd.Header()
	c := &cutter{rd: rd}
	for _, e := range electrodes {
		idx, fs, k, ok := edfElectrode(h, e)
		if !ok {
			return nil, fmt.Errorf("electrode %s not found", e)
		}
		if c.fs != 0 && fs != c.fs {
			return nil, fmt.Errorf("electrodes sampled at different rates (%g and %g Hz)", c.fs, fs)
		}
		c.fs = fs
		c.perRecord = int64(math.Round(fs * h.RecordDuration))
		c.sig = append(c.sig, idx)
		c.scale = append(c.scale, float32(k))
	}
	c.factor = max(1, int(math.Ceil(c.fs/o.MaxRate-1e-9)))
	c.rate = c.fs / float64(c.factor)
	c.cond = fmt.Sprintf("as recorded at %g Hz, mean removed, no filter", c.fs)
	if c.factor > 1 {
		// Butterworth low-pass at 0.4 of the new rate, forward and backward,
		// keeps aliases below -40 dB at the new Nyquist frequency.
		aa, err := signal.Butterworth(signal.LowPass, 4, c.fs, 0.4*c.rate)
		if err != nil {
			return nil, err
		}
		c.antiAl = aa
		c.cond = fmt.Sprintf("recorded at %g Hz, low-pass %g Hz and decimated to %g Hz, mean removed", c.fs, 0.4*c.rate, c.rate)
	}
	lo, hi := o.Bandpass[0], o.Bandpass[1]
	if lo <= 0 {
		lo = 0.5
	}
	if hi <= 0 || hi > 0.45*c.fs {
		hi = 0.45 * c.fs
	}
	sos, err := signal.Butterworth(signal.BandPass, 2, c.fs, lo, hi)
	if err != nil {
		return nil, err
	}
	if o.NotchHz > 0 && o.NotchHz < c.fs/2 {
		n, err := signal.Notch(o.NotchHz, 30, c.fs)
		if err != nil {
			return nil, err
		}
		sos = signal.Cascade(sos, n)
	}
	c.mapSOS = sos
	c.window = int(math.Round(o.WindowS * c.fs))
	c.context = int(math.Round(o.ContextS * c.fs))
	return c, nil
}

// item reads the rated window and its context around onset. Samples before
// the recording's start or after its end are padded flat, not shifted, so
// the event stays at the same place on every item.
func (c *cutter) item(onset float64) (packet.Item, []float64, error) {
	n := c.rd.NumRecords() * c.perRecord
	from := int64(math.Round(onset*c.fs)) - int64(c.window/2) - int64(c.context)
	total := c.window + 2*c.context
	out := packet.Item{Rate: c.rate, Conditioning: c.cond,
		EventAt:   float64(c.context+c.window/2) / c.fs,
		RatedFrom: float64(c.context) / c.fs, RatedTo: float64(c.context+c.window) / c.fs}
	atPeak := make([]float64, 0, len(c.sig)) // filtered values at the event, for the map
	buf := make([]float32, total)
	filt := make([]float32, total)
	for si, s := range c.sig {
		clear(buf)
		lo := max(from, 0)
		hi := min(from+int64(total), n)
		if hi > lo {
			read := c.rd.ReadSignal
			if s < 0 {
				read = func(_ int, start int64, dst []float32) (int, error) { return c.rd.ReadRecovered(-1-s, start, dst) }
			}
			if _, err := read(s, lo, buf[lo-from:hi-from]); err != nil {
				return out, nil, err
			}
			if k := c.scale[si]; k != 1 {
				for j := range buf[lo-from : hi-from] {
					buf[lo-from+int64(j)] *= k
				}
			}
		}
		var mean float64
		if hi > lo {
			for _, v := range buf[lo-from : hi-from] {
				mean += float64(v)
			}
			mean /= float64(hi - lo)
			for j := range buf[lo-from : hi-from] {
				buf[lo-from+int64(j)] -= float32(mean)
			}
		}
		copy(filt, buf)
		if err := signal.FiltFilt32(c.mapSOS, filt); err != nil {
			return out, nil, err
		}
		atPeak = append(atPeak, float64(filt[c.context+c.window/2]))
		x := buf
		if c.antiAl != nil {
			x = slices.Clone(buf)
			if err := signal.FiltFilt32(c.antiAl, x); err != nil {
				return out, nil, err
			}
		}
		dec := make([]float32, 0, total/c.factor+1)
		for j := 0; j < total; j += c.factor {
			dec = append(dec, x[j])
		}
		out.Samples = append(out.Samples, dec)
	}
	return out, atPeak, nil
}

// mapOf interpolates the common-average map of the filtered values at the
// event sample.
func mapOf(ip *spline.Interpolator, atPeak []float64, marks []packet.MapElectrode, size int) packet.VoltageMap {
	v := slices.Clone(atPeak)
	mean := 0.0
	for i := range v {
		mean += v[i]
	}
	mean /= float64(len(v))
	for i := range v {
		v[i] -= mean
	}
	g, err := ip.Grid(v, size)
	if err != nil {
		return packet.VoltageMap{}
	}
	vals := make([]float32, 0, size*size)
	for _, row := range g {
		for _, x := range row {
			vals = append(vals, float32(x))
		}
	}
	return packet.VoltageMap{Size: size, Values: vals, Electrodes: slices.Clone(marks)}
}
