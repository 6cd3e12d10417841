package detect

import (
	"context"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"runtime"
	"sort"
	"strconv"
	"strings"
	"testing"

	"github.com/quorate-eeg/quorate/sampling/candidate"
)

// cyclicSource serves a short recording repeated to any length, so that a
// long recording can be streamed without holding or writing it. It samples
// the heap once per read of channel 0, i.e. once per processing window.
type cyclicSource struct {
	data     memSource
	peakHeap uint64 // heap in use, garbage included (bounded by the GC's pacing)
	peakLive uint64 // live heap after a forced collection, every 8th window
	reads    int
}

func (c *cyclicSource) ReadAt(ch int, start int64, dst []float32) error {
	// the same samples as dst[i] = x[(start+i) mod n], copied a run at a
	// time: a division per sample cost the benchmark a twentieth of its
	// time, none of it detection's
	x := c.data[ch]
	n := int64(len(x))
	for k := 0; k < len(dst); {
		k += copy(dst[k:], x[(start+int64(k))%n:])
	}
	if ch == 0 {
		var ms runtime.MemStats
		runtime.ReadMemStats(&ms)
		c.peakHeap = max(c.peakHeap, ms.HeapInuse)
		if c.reads++; c.reads%8 == 0 {
			runtime.GC()
			runtime.ReadMemStats(&ms)
			c.peakLive = max(c.peakLive, ms.HeapAlloc)
		}
	}
	return nil
}

func longInput(b *testing.B, seconds float64) (Input, *cyclicSource) {
	rec := generated(b, 7, 5)
	in := inputOf(rec)
	src := &cyclicSource{data: in.Src.(memSource)}
	in.Src = src
	in.Len = int64(seconds * rec.Rate)
	return in, src
}

// BenchmarkDetectHour detects and measures all features in one hour of
// 19-channel 256 Hz EEG (the issue asks for 21; 19 is the 10-20 set the generator makes) on one goroutine; x-realtime is recording seconds
// per second of computation.
func BenchmarkDetectHour(b *testing.B) {
	in, _ := longInput(b, 3600)
	b.ResetTimer()
	var events int
	for b.Loop() {
		rows, _, err := Detect(context.Background(), in, Options{})
		if err != nil {
			b.Fatal(err)
		}
		events = len(rows)
	}
	b.ReportMetric(3600/(b.Elapsed().Seconds()/float64(b.N)), "x-realtime")
	b.ReportMetric(float64(events), "events/hour")
}

// BenchmarkMemory streams recordings of growing length through the finder
// into a candidate.Writer, as Run does, and reports the peak heap in use,
// which must not grow with the length (rows are written as produced).
func BenchmarkMemory(b *testing.B) {
	for _, h := range []float64{1, 4, 24} {
		b.Run(fmt.Sprintf("hours=%g", h), func(b *testing.B) {
			in, src := longInput(b, h*3600)
			s, err := (&Options{}).settings()
			if err != nil {
				b.Fatal(err)
			}
			runtime.GC()
			src.peakHeap, src.peakLive, src.reads = 0, 0, 0
			var rows int64
			for b.Loop() {
				w, err := candidate.NewWriter(filepath.Join(b.TempDir(), "c.parquet"))
				if err != nil {
					b.Fatal(err)
				}
				e := newEngine(s, &in)
				if err := e.run(context.Background(), w.Write); err != nil {
					b.Fatal(err)
				}
				if err := w.Close(); err != nil {
					b.Fatal(err)
				}
				rows = w.Rows()
			}
			b.ReportMetric(float64(src.peakHeap)/(1<<20), "peak-heap-MB")
			b.ReportMetric(float64(src.peakLive)/(1<<20), "peak-live-MB")
			b.ReportMetric(float64(rows), "rows")
		})
	}
}

// TestFinderTradeoff is a diagnostic, run only with QUORATE_DIAG set: the
// finder alone (no features) on generated recordings at several thresholds,
// logging recall of the inserted IEDs (anchor peak within 20 ms of the true
// onset) against candidates per minute — the trade-off table of FEATURES.md.
func TestFinderTradeoff(t *testing.T) {
	if os.Getenv("QUORATE_DIAG") == "" {
		t.Skip("diagnostic; set QUORATE_DIAG=1")
	}
	seeds := []uint64{1, 2, 3, 4}
	if v := os.Getenv("QUORATE_DIAG_SEEDS"); v != "" {
		seeds = nil
		for _, f := range strings.Fields(v) {
			x, _ := strconv.ParseUint(f, 10, 64)
			seeds = append(seeds, x)
		}
	}
	thrs := []float64{3, 3.5, 4, 4.5, 5, 5.5, 6}
	if v := os.Getenv("QUORATE_DIAG_THR"); v != "" {
		thrs = nil
		for _, f := range strings.Fields(v) {
			x, _ := strconv.ParseFloat(f, 64)
			thrs = append(thrs, x)
		}
	}
	if v, err := strconv.ParseFloat(os.Getenv("QUORATE_DIAG_AMP"), 64); err == nil {
		minAmpZ = v
	}
	if v, err := strconv.ParseFloat(os.Getenv("QUORATE_DIAG_POINT"), 64); err == nil {
		minPoint = v
	}
	if v := strings.Fields(os.Getenv("QUORATE_DIAG_NMS")); len(v) == 3 {
		complexBeforeS, _ = strconv.ParseFloat(v[0], 64)
		complexAfterS, _ = strconv.ParseFloat(v[1], 64)
		complexFrac, _ = strconv.ParseFloat(v[2], 64)
	}
	for _, thr := range thrs {
		found, n, cands, minutes := 0, 0, 0, 0.0
		var missed []string
		for _, seed := range seeds {
			g := generated(t, seed, 10)
			in := inputOf(g)
			s, err := (&Options{ThresholdMAD: thr}).settings()
			if err != nil {
				t.Fatal(err)
			}
			cls, onsets := findAll(t, s, &in)
			cands += len(onsets)
			if os.Getenv("QUORATE_DIAG_BG") != "" {
				for k, o := range onsets {
					kind, off := "background", 0.0
					for _, ev := range g.Truth {
						if o >= ev.Start-0.05 && o <= ev.End+0.05 {
							kind, off = ev.Kind, o-ev.Onset
						}
					}
					c := cls[k]
					t.Logf("cand %s off %.0f members %d z %.1f amp %.1f point %.1f dur %d %s", kind, 1000*off, len(c.members), c.best.z, c.best.amp, c.best.point, c.best.ph.right-c.best.ph.left, in.Labels[c.best.deriv])
				}
			}
			minutes += float64(in.Len) / in.Rate / 60
			for _, ev := range g.Truth {
				if !ev.IsIED {
					continue
				}
				n++
				k := sort.SearchFloat64s(onsets, ev.Onset-0.020)
				if k < len(onsets) && onsets[k] <= ev.Onset+0.020 {
					found++
				} else {
					missed = append(missed, fmt.Sprintf("%s@%.2f %s snr %.1f %.0fms", ev.Kind, ev.Onset, ev.PeakElectrode, ev.SNR, ev.Duration))
				}
			}
		}
		t.Logf("threshold %.2f: recall %d/%d = %.3f, %.1f candidates/min", thr, found, n, float64(found)/float64(n), float64(cands)/minutes)
		if os.Getenv("QUORATE_DIAG_MISSED") != "" {
			t.Logf("missed: %s", strings.Join(missed, "; "))
		}
	}
}

// eachEvent runs the finder over the whole of in, window by window as the
// engine does, and calls f with each event and the window it was found in.
func eachEvent(t testing.TB, s *settings, in *Input, f func(e *engine, w window, c cluster)) {
	t.Helper()
	e := newEngine(s, in)
	if err := e.setRate(in.Rate); err != nil {
		t.Fatal(err)
	}
	W := int64(math.Round(s.windowS * in.Rate))
	C := int64(math.Ceil(max(contextNeed, s.backS/2+0.5) * in.Rate))
	for ws := int64(0); ws < in.Len; ws += W {
		we := min(ws+W, in.Len)
		w, ok, err := e.condition(max(ws-C, 0), min(we+C, in.Len), ws, we)
		if err != nil || !ok {
			t.Fatal(err, ok)
		}
		for _, c := range e.find(w, ws, we) {
			f(e, w, c)
		}
	}
}

// findAll runs the finder alone over the whole of in and returns its
// events with their onsets (s).
func findAll(t testing.TB, s *settings, in *Input) (cls []cluster, onsets []float64) {
	t.Helper()
	eachEvent(t, s, in, func(e *engine, w window, c cluster) {
		onsets = append(onsets, float64(w.base+int64(c.best.ph.peak))/in.Rate)
		cls = append(cls, c)
	})
	return cls, onsets
}

// TestFinderAt is a diagnostic, run only with QUORATE_DIAG_AT="seed onset":
// every extremum within ±30 ms of the onset on every derivation, with the
// finder's statistics.
func TestFinderAt(t *testing.T) {
	v := strings.Fields(os.Getenv("QUORATE_DIAG_AT"))
	if len(v) != 2 {
		t.Skip("diagnostic; set QUORATE_DIAG_AT=\"seed onset\"")
	}
	seed, _ := strconv.ParseUint(v[0], 10, 64)
	onset, _ := strconv.ParseFloat(v[1], 64)
	g := generated(t, seed, 10)
	in := inputOf(g)
	s, _ := (&Options{}).settings()
	e := newEngine(s, &in)
	e.setRate(in.Rate)
	c := int64(onset * in.Rate)
	C := int64(30 * in.Rate)
	w, _, _ := e.condition(max(c-C, 0), min(c+C, in.Len), max(c-C, 0), min(c+C, in.Len))
	block, bstart, bend := e.scales(w, w.lo, w.hi)
	e.bank.hats = hatsFor(in.Rate)
	for d, x := range e.det {
		e.bank.prepare(x, bstart, bend, block, 5)
		ci := int(c - w.base)
		for i := ci - 8; i <= ci+8; i++ {
			ok, sign := isExtremum(x, i)
			if !ok {
				continue
			}
			sc := e.scaleAt(d, i, block, bstart)
			det, pass := examine(x, d, i, sign, in.Rate, s.thr, sc, e.bank.z(i, sign, bstart, block))
			var zs []string
			for k := range e.bank.hats {
				zs = append(zs, fmt.Sprintf("%.1f", sign*float64(e.bank.hats[k].at(e.bank.cum, i))/e.bank.scale[k][min(max(i-bstart, 0)/block, len(e.bank.scale[k])-1)]))
			}
			t.Logf("%-4s %+d sign %+.0f z %.1f %v amp %.1f point %.2f dur %d pass %v", in.Labels[d], i-ci, sign, det.z, zs, det.amp, det.point, det.ph.right-det.ph.left, pass)
		}
	}
}

// TestCyclicSource checks the benchmark's source against its definition,
// dst[i] = x[(start+i) mod n], across the wrap and for reads longer than
// the recording.
func TestCyclicSource(t *testing.T) {
	x := make([]float32, 7)
	for i := range x {
		x[i] = float32(i)
	}
	c := &cyclicSource{data: memSource{x}}
	for _, r := range [][2]int64{{0, 7}, {3, 9}, {6, 1}, {12, 30}, {70, 0}} {
		dst := make([]float32, r[1])
		if err := c.ReadAt(0, r[0], dst); err != nil {
			t.Fatal(err)
		}
		for i, v := range dst {
			if want := x[(r[0]+int64(i))%7]; v != want {
				t.Fatalf("start %d, length %d: sample %d is %v, want %v", r[0], r[1], i, v, want)
			}
		}
	}
}
