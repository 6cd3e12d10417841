package montage

import "testing"

// BenchmarkApplyCommonAverage derives 19 common-average traces from 21
// channels, one second at 256 Hz per operation; reports samples/s of input.
func BenchmarkApplyCommonAverage(b *testing.B) {
	m, _, err := Build(CommonAverage, tenTwenty, nil)
	if err != nil {
		b.Fatal(err)
	}
	const n = 256
	in := make([][]float32, len(tenTwenty))
	for c := range in {
		in[c] = make([]float32, n)
		for i := range in[c] {
			in[c][i] = float32(c*i%97) - 48
		}
	}
	out := make([][]float32, m.Len())
	for i := range out {
		out[i] = make([]float32, n)
	}
	for b.Loop() {
		m.Apply(in, out)
	}
	b.ReportMetric(float64(len(in)*n*b.N)/b.Elapsed().Seconds(), "samples/s")
}
