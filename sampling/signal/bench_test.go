package signal

import (
	"math"
	"math/rand/v2"
	"testing"
)

// BenchmarkFiltFiltEEGHour filters 21 channels × 1 h at 256 Hz through a
// 4th-order 0.5–70 Hz band-pass and a 50 Hz notch (5 sections), forward
// and backward, as float32 samples. Reports samples/s (per core).
func BenchmarkFiltFiltEEGHour(b *testing.B) {
	const fs, chans = 256.0, 21
	n := int(3600 * fs)
	sos := eegChain(b, fs)
	rng := rand.New(rand.NewPCG(1, 2))
	x := make([][]float32, chans)
	for c := range x {
		x[c] = make([]float32, n)
		for i := range x[c] {
			x[c][i] = float32(20*math.Sin(2*math.Pi*10*float64(i)/fs) + 5*rng.NormFloat64())
		}
	}
	zp := NewZeroPhase(sos)
	b.ResetTimer()
	for b.Loop() {
		for c := range x {
			if err := zp.Apply32(x[c]); err != nil {
				b.Fatal(err)
			}
		}
	}
	b.ReportMetric(float64(chans*n)*float64(b.N)/b.Elapsed().Seconds(), "samples/s")
}

// BenchmarkFiltFilt10s is the same chain on one 10 s window of float64.
func BenchmarkFiltFilt10s(b *testing.B) {
	const fs = 256.0
	n := int(10 * fs)
	zp := NewZeroPhase(eegChain(b, fs))
	x := make([]float64, n)
	for i := range x {
		x[i] = math.Sin(float64(i))
	}
	for b.Loop() {
		if err := zp.Apply(x); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(n)*float64(b.N)/b.Elapsed().Seconds(), "samples/s")
}
