package detect

import (
	"context"
	"fmt"
	"path/filepath"
	"runtime"
	"testing"

	"github.com/quorate-eeg/quorate/sampling/candidate"
)

// cyclicSource serves a short recording repeated to any length, so that a
// long recording can be streamed without holding or writing it. It samples
// the heap once per read of channel 0, i.e. once per processing window.
type cyclicSource struct {
	data     memSource
	peakHeap uint64
}

func (c *cyclicSource) ReadAt(ch int, start int64, dst []float32) error {
	x := c.data[ch]
	n := int64(len(x))
	for i := range dst {
		dst[i] = x[(start+int64(i))%n]
	}
	if ch == 0 {
		var ms runtime.MemStats
		runtime.ReadMemStats(&ms)
		c.peakHeap = max(c.peakHeap, ms.HeapInuse)
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
			src.peakHeap = 0
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
			b.ReportMetric(float64(rows), "rows")
		})
	}
}
