package edf

import (
	"bytes"
	"fmt"
	"testing"
)

const benchSamples = 1 << 16

// BenchmarkDecodeInt16 reports physical samples decoded per second; the
// target is at least 1e9 on one core.
func BenchmarkDecodeInt16(b *testing.B) {
	src := make([]byte, 2*benchSamples)
	for i := range src {
		src[i] = byte(i * 7)
	}
	dst := make([]float32, benchSamples)
	b.SetBytes(int64(len(src)))
	for b.Loop() {
		DecodeInt16(dst, src, 0.1, -3)
	}
	b.ReportMetric(float64(b.N)*benchSamples/b.Elapsed().Seconds(), "samples/s")
}

// BenchmarkDecodeInt24 is DecodeInt16's BDF counterpart.
func BenchmarkDecodeInt24(b *testing.B) {
	src := make([]byte, 3*benchSamples)
	for i := range src {
		src[i] = byte(i * 7)
	}
	dst := make([]float32, benchSamples)
	b.SetBytes(int64(len(src)))
	for b.Loop() {
		DecodeInt24(dst, src, 0.1, -3)
	}
	b.ReportMetric(float64(b.N)*benchSamples/b.Elapsed().Seconds(), "samples/s")
}

// BenchmarkCopyBytes copies the bytes DecodeInt16 reads, for comparison.
func BenchmarkCopyBytes(b *testing.B) {
	src := make([]byte, 2*benchSamples)
	dst := make([]byte, 2*benchSamples)
	b.SetBytes(int64(len(src)))
	for b.Loop() {
		copy(dst, src)
	}
	b.ReportMetric(float64(b.N)*benchSamples/b.Elapsed().Seconds(), "samples/s")
}

// BenchmarkInspect inspects 1,000 small EDF+C recordings (21 EEG
// channels, 256 Hz, 30 one-second records) per iteration; the target is
// under 2 s per iteration.
func BenchmarkInspect(b *testing.B) {
	var sigs []Signal
	for _, n := range []string{"Fp1", "Fp2", "F7", "F3", "Fz", "F4", "F8", "T3", "C3", "Cz", "C4", "T4", "T5", "P3", "Pz", "P4", "T6", "O1", "O2", "ECG", "Photic"} {
		sigs = append(sigs, Signal{Label: "EEG " + n + "-REF", PhysMin: -3276.8, PhysMax: 3276.7, SamplesPerRecord: 256})
	}
	files := make([][]byte, 1000)
	for i := range files {
		files[i] = writeFile(b, EDFPlusC, sigs, 30, nil, map[int64][]Annotation{int64(i % 30): {{Onset: float64(i % 30), Text: fmt.Sprint("event ", i)}}})
	}
	b.ResetTimer()
	for b.Loop() {
		for i, f := range files {
			if _, err := Inspect(bytes.NewReader(f), int64(len(f)), "b.edf"); err != nil {
				b.Fatal(i, err)
			}
		}
	}
}
