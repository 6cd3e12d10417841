package export

import (
	"context"
	"fmt"
	"io"
	"math"
	"path/filepath"

	"github.com/parquet-go/parquet-go"
	"github.com/parquet-go/parquet-go/compress/zstd"

	"github.com/quorate-eeg/quorate/internal/progress"
	"github.com/quorate-eeg/quorate/sampling/archive"
	"github.com/quorate-eeg/quorate/sampling/edf"
	"github.com/quorate-eeg/quorate/sampling/montage"
)

// epochGroupBytes is the sample payload after which a row group is closed: large
// enough for analytic engines, small enough that the writer's buffer stays bounded.
// // common practice
const epochGroupBytes = 64 << 20

// epochStats counts what writeEpochs wrote.
type epochStats struct{ rows, padded int }

// writeEpochs reads the window around each event from its recording and writes one
// row per event × derivation. events must be ordered by recording so that each file is
// opened once; only the data records a window covers are read.
func writeEpochs(ctx context.Context, w io.Writer, o *Options, kind montage.Kind, events []EventRow, bar progress.Bar) (epochStats, error) {
	var st epochStats
	recs := make(map[string]*archive.Recording, len(o.Recordings))
	for i := range o.Recordings {
		recs[o.Recordings[i].RecordingID] = &o.Recordings[i]
	}
	pw := parquet.NewGenericWriter[EpochRow](w, parquet.Compression(&zstd.Codec{}),
		parquet.MaxRowsPerRowGroup(rowGroupRows), parquet.PageBufferSize(1<<20), parquet.CreatedBy("quorate", "", ""))
	var ep *epocher
	defer func() {
		if ep != nil {
			ep.r.Close()
		}
	}()
	pending := 0
	for i := range events {
		if err := ctx.Err(); err != nil {
			return st, err
		}
		e := &events[i]
		if ep == nil || ep.recID != e.RecordingID {
			if ep != nil {
				ep.r.Close()
				ep = nil
			}
			var err error
			if ep, err = openEpocher(o, recs[e.RecordingID], kind); err != nil {
				return st, &epochError{EventID: e.EventID, RecordingID: e.RecordingID, Err: err}
			}
		}
		rows, padded, err := ep.epoch(e, o.EpochWindowS)
		if err != nil {
			return st, &epochError{EventID: e.EventID, RecordingID: e.RecordingID, Err: err}
		}
		if _, err := pw.Write(rows); err != nil {
			return st, err
		}
		st.rows += len(rows)
		if padded {
			st.padded++
		}
		for _, r := range rows {
			pending += 4 * len(r.Samples)
		}
		if pending >= epochGroupBytes {
			if err := pw.Flush(); err != nil {
				return st, err
			}
			pending = 0
		}
		bar.Add(1)
	}
	return st, pw.Close()
}

// epocher reads windows from one recording.
type epocher struct {
	recID     string
	r         *edf.Reader
	sigs      []int     // the EEG signals used, all of one sample rate; −1−k for recovered electrode k (edf.Header.Recovered)
	scale     []float32 // per used signal: factor to microvolts
	spr       int64     // samples per record of those signals
	rate      float64
	segs      []edf.Segment
	mont      *montage.Montage
	names     []string
	montage   string
	rec       [][]float32 // one data record, per header signal (nil for unused)
	recovered []float32   // one record of a recovered electrode (edf.Header.Recovered)
	in, out   [][]float32
}

func openEpocher(o *Options, rec *archive.Recording, kind montage.Kind) (*epocher, error) {
	if rec == nil {
		return nil, fmt.Errorf("recording not in the index")
	}
	if int(rec.Root) < 0 || int(rec.Root) >= len(o.ArchiveRoots) {
		return nil, fmt.Errorf("archive root %d not given (%d roots)", rec.Root, len(o.ArchiveRoots))
	}
	r, err := edf.Open(filepath.Join(o.ArchiveRoots[rec.Root], filepath.FromSlash(rec.Path)))
	if err != nil {
		return nil, err
	}
	ep := &epocher{recID: rec.RecordingID, r: r, montage: kind.String()}
	h := r.Header()
	// Use the EEG channels of the most common sample rate (the higher on a tie): a
	// window is one matrix, so every channel must share the time base.
	count := map[int]int{}
	best := 0
	for i := range h.Signals {
		s := &h.Signals[i]
		if s.Kind != edf.EEG {
			continue
		}
		count[s.SamplesPerRecord]++
		if c := count[s.SamplesPerRecord]; c > count[best] || c == count[best] && s.SamplesPerRecord > best {
			best = s.SamplesPerRecord
		}
	}
	var labels []string
	ep.rec = make([][]float32, len(h.Signals))
	switch _, spr := h.RecoveredRate(); {
	case best == 0 && spr > 0:
		// stored as bipolar derivations: the electrodes recovered from them, in µV
		best = spr
		for _, i := range h.TermSignals() {
			ep.rec[i] = make([]float32, best)
		}
		for k, e := range h.Recovered {
			ep.sigs = append(ep.sigs, -1-k)
			ep.scale = append(ep.scale, 1)
			labels = append(labels, e.Name)
		}
		ep.recovered = make([]float32, best)
	case best == 0:
		r.Close()
		return nil, fmt.Errorf("no EEG channels")
	}
	for i := range h.Signals {
		if s := &h.Signals[i]; s.Kind == edf.EEG && s.SamplesPerRecord == best {
			ep.sigs = append(ep.sigs, i)
			k, _ := s.Microvolts()
			ep.scale = append(ep.scale, float32(k))
			labels = append(labels, s.Name)
			ep.rec[i] = make([]float32, best)
		}
	}
	ep.spr, ep.rate = int64(best), float64(best)/h.RecordDuration
	if ep.mont, _, err = montage.Build(kind, labels, nil); err != nil {
		r.Close()
		return nil, err
	}
	ep.names = ep.mont.Names()
	if h.Format.IsDiscontinuous() {
		if ep.segs, err = r.Segments(); err != nil {
			r.Close()
			return nil, err
		}
	}
	if len(ep.segs) == 0 {
		ep.segs = []edf.Segment{{Start: 0, Duration: h.Duration(), FirstRecord: 0, Records: h.NumRecords}}
	}
	return ep, nil
}

// epoch cuts the window of length windowS centred on e. In an EDF+D file the window
// stays within the segment holding the event; samples outside it are NaN.
func (ep *epocher) epoch(e *EventRow, windowS float64) ([]EpochRow, bool, error) {
	seg := ep.segs[0]
	for _, s := range ep.segs {
		if s.Start <= e.OnsetS {
			seg = s
		}
	}
	n := int(math.Round(windowS * ep.rate))
	first := seg.FirstRecord * ep.spr
	end := (seg.FirstRecord + seg.Records) * ep.spr
	g0 := first + int64(math.Round((e.OnsetS-windowS/2-seg.Start)*ep.rate))
	lo, hi := max(g0, first), min(g0+int64(n), end)
	if ep.in == nil || len(ep.in[0]) != n {
		ep.in = make([][]float32, len(ep.sigs))
		for k := range ep.in {
			ep.in[k] = make([]float32, n)
		}
	}
	nan := float32(math.NaN())
	for _, x := range ep.in {
		for t := range x {
			x[t] = nan
		}
	}
	for g := lo; g < hi; {
		rec, k := g/ep.spr, g%ep.spr
		if err := ep.r.ReadRecord(rec, ep.rec); err != nil {
			return nil, false, err
		}
		m := min(ep.spr-k, hi-g)
		for c, s := range ep.sigs {
			dst := ep.in[c][g-g0 : g-g0+m]
			if s < 0 {
				ep.r.Header().RecoverRecord(-1-s, ep.rec, ep.recovered)
				copy(dst, ep.recovered[k:k+m])
			} else {
				copy(dst, ep.rec[s][k:k+m])
			}
			if f := ep.scale[c]; f != 1 {
				for t := range dst {
					dst[t] *= f
				}
			}
		}
		g += m
	}
	out := make([][]float32, ep.mont.Len())
	backing := make([]float32, n*len(out))
	for i := range out {
		out[i] = backing[i*n : (i+1)*n : (i+1)*n]
	}
	ep.mont.Apply(ep.in, out)
	padBefore, padAfter := int32(max(0, min(first-g0, int64(n)))), int32(max(0, min(g0+int64(n)-end, int64(n))))
	onset := seg.Start + float64(g0-first)/ep.rate
	rows := make([]EpochRow, len(out))
	for i := range rows {
		rows[i] = EpochRow{EventID: e.EventID, RecordingID: e.RecordingID, Channel: ep.names[i], ChannelIndex: int32(i),
			Montage: ep.montage, SampleRateHz: ep.rate, WindowOnsetS: onset, EventOffsetS: e.OnsetS - onset,
			PadBefore: padBefore, PadAfter: padAfter, Padded: padBefore > 0 || padAfter > 0, Samples: out[i]}
	}
	return rows, padBefore > 0 || padAfter > 0, nil
}
