package detect

import (
	"context"
	"fmt"
	"runtime"
	"testing"
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
// 19-channel 256 Hz EEG on one goroutine; x-realtime is recording seconds
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

// BenchmarkMemory streams recordings of growing length and reports the peak
// heap in use, which should not grow with the length apart from the
// candidate rows themselves.
func BenchmarkMemory(b *testing.B) {
	for _, h := range []float64{1, 4, 24} {
		b.Run(fmt.Sprintf("hours=%g", h), func(b *testing.B) {
			in, src := longInput(b, h*3600)
			runtime.GC()
			var ms0, ms1 runtime.MemStats
			runtime.ReadMemStats(&ms0)
			var rows int
			for b.Loop() {
				r, _, err := Detect(context.Background(), in, Options{})
				if err != nil {
					b.Fatal(err)
				}
				rows = len(r)
			}
			runtime.ReadMemStats(&ms1)
			b.ReportMetric(float64(src.peakHeap)/(1<<20), "peak-heap-MB")
			b.ReportMetric(float64(ms1.TotalAlloc-ms0.TotalAlloc)/float64(b.N)/(1<<20), "alloc-MB/op")
			b.ReportMetric(float64(rows), "rows")
		})
	}
}
