package synth

import "testing"

// BenchmarkGenerate10Min streams 10 min × 21 channels (19 EEG, ECG, EOG) at
// 256 Hz in 1 s chunks.
func BenchmarkGenerate10Min(b *testing.B) {
	cfg := Config{Seed: 1, Duration: 600, IEDRate: 4, LookalikeRate: 4, Forward: standInForward}
	for b.Loop() {
		if _, err := GenerateTo(cfg, 256, func([][]float32) error { return nil }); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(600*256*21*float64(b.N)/b.Elapsed().Seconds(), "samples/s")
}
