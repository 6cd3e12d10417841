package detect

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat"
)

// virtualFixture is eight derivations at 256 Hz for 40 s: a 10 Hz rhythm
// with map rhythm on every derivation, independent white noise of standard
// deviation noise, and at sample p an asymmetric triangle (rise 8, fall 16
// samples, F/R = 2) of height 1 with map event, peaking on derivation 0.
func virtualFixture(rhythm, event []float64, rhythmAmp, noise float64, p int) [][]float32 {
	const fs, n = 256.0, 40 * 256
	rng := rand.New(rand.NewPCG(7, 11))
	ev := triangle(n, p, 8, 16, 1)
	xs := make([][]float32, len(rhythm))
	for c := range xs {
		xs[c] = make([]float32, n)
	}
	for i := range n {
		r := rhythmAmp * math.Sin(2*math.Pi*10*float64(i)/fs+0.3)
		for c := range xs {
			xs[c][i] = float32(rhythm[c]*r + event[c]*float64(ev[i]) + noise*rng.NormFloat64())
		}
	}
	return xs
}

// TestVirtualChannel checks the LCMV virtual channel (Van Veen et al. 1997)
// on a rhythm whose map differs from the event's: the filter passes the
// event's map with unit gain (wᵀa = 1 by construction of w = R⁻¹a /
// aᵀR⁻¹a, a the map at the peak less its centred mean), cancels the rhythm, a rank-one interferer, down to
// the white noise (Van Veen et al. 1997: the minimum-variance response
// nulls a source whose map is known from the covariance), and so gives the
// triangle's flank ratio F/R = 2 (closed form), which the peak derivation,
// with the rhythm as large as the event on it, does not.
func TestVirtualChannel(t *testing.T) {
	const fs = 256.0
	rhythm := []float64{1, 0.9, 0.7, -0.2, -0.6, -0.8, -0.6, -0.4}
	event := []float64{1, 0.3, -0.5, 0.6, -0.2, 0.1, -0.7, -0.6}
	p := 20 * 256
	xs := virtualFixture(rhythm, event, 0.5, 0.01, p)
	tr := &trace{x: xs[0], lo: 0, hi: len(xs[0]), fs: fs}
	ph := mainPhase(xs[0], p, 1, int(math.Ceil(maxPhaseS*fs)), 0)
	var bc blockCov
	bc.build(xs, tr.lo, tr.hi, 0, fs)
	yt, yph, ok := virtualChannel(xs, tr, ph, &bc, &virtualScratch{})
	if !ok {
		t.Fatal("no virtual channel")
	}
	// unit gain on the map at the peak less its centred mean over 2h+1
	// samples: for the triangle, whose mean there is m, y(peak) = 1/(1 − m)
	tri, h := triangle(len(xs[0]), p, 8, 16, 1), vcHalf(fs)
	var m float64
	for _, v := range tri[p-h : p+h+1] {
		m += float64(v)
	}
	m /= float64(2*h + 1)
	if want := 1 / (1 - m); math.Abs(float64(yt.x[yph.peak])-want) > 0.02*want {
		t.Errorf("virtual channel at its peak %g, want %g (unit gain on the event's map)", yt.x[yph.peak], want)
	}
	// the rhythm's residual: y over a stretch without the event
	var ss float64
	for _, v := range yt.x[:100] {
		ss += float64(v) * float64(v)
	}
	if rms := math.Sqrt(ss / 100); rms > 0.05 {
		t.Errorf("virtual channel's background RMS %g: the rhythm (RMS 0.35 on derivation 0) is not cancelled", rms)
	}
	got, _, _ := asymmetry(yt, yph, &scratch{})
	if math.Abs(got-2) > 0.1 {
		t.Errorf("asymmetry on the virtual channel %g, want F/R = 2", got)
	}
	raw, _, _ := asymmetry(tr, ph, &scratch{})
	t.Logf("asymmetry: virtual channel %.3f, peak derivation %.3f", got, raw)
	if math.Abs(raw-2) < 0.2 {
		t.Errorf("asymmetry on the peak derivation %g: the fixture's rhythm does not disturb it, so the check above proves nothing", raw)
	}
}

// TestVirtualChannelDegrades checks the fallbacks: fewer than four
// derivations, or too little background, give no virtual channel.
func TestVirtualChannelDegrades(t *testing.T) {
	const fs = 256.0
	p := 20 * 256
	xs := virtualFixture([]float64{1, 0.5, -1}, []float64{1, -0.5, -0.5}, 0.5, 0.01, p)
	tr := &trace{x: xs[0], lo: 0, hi: len(xs[0]), fs: fs}
	ph := mainPhase(xs[0], p, 1, int(math.Ceil(maxPhaseS*fs)), 0)
	var bc blockCov
	bc.build(xs, tr.lo, tr.hi, 0, fs)
	if _, _, ok := virtualChannel(xs, tr, ph, &bc, &virtualScratch{}); ok {
		t.Error("virtual channel from three derivations")
	}
	xs = virtualFixture([]float64{1, 0.5, -1, 0.2, 0.1}, []float64{1, -0.5, -0.5, 0.3, -0.3}, 0.5, 0.01, p)
	short := &trace{x: xs[0], lo: p - 600, hi: p + 600, fs: fs}
	bc.build(xs, short.lo, short.hi, 0, fs)
	if _, _, ok := virtualChannel(xs, short, ph, &bc, &virtualScratch{}); ok {
		t.Error("virtual channel from under 4 s of background")
	}
}

// TestBlockCovariance checks the block sums against gonum's
// stat.CovarianceMatrix of the same high-passed samples (every
// vcStride-th sample of whole blocks, the centred moving mean of 2h+1
// samples removed), with the maximum-likelihood divisor N (gonum's is
// N − 1), and that blocks are aligned to the input's seconds whatever the
// window.
func TestBlockCovariance(t *testing.T) {
	const fs = 256.0
	xs := virtualFixture([]float64{1, 0.5, -1, 0.2}, []float64{1, -0.5, -0.5, 0.3}, 0.5, 0.3, 20*256)
	var bc blockCov
	lo, hi := 100, 30*256
	bc.build(xs, lo, hi, 0, fs)
	if bc.origin != 256 {
		t.Fatalf("first block at %d, want 256 (the first whole second from %d + h)", bc.origin, lo)
	}
	ranges := [][2]int{{3 * 256, 9 * 256}, {12 * 256, 15 * 256}}
	n := len(xs)
	got := make([]float64, n*n)
	N := bc.sum(ranges, got)
	h := vcHalf(fs)
	var rows [][]float64
	for _, r := range ranges {
		for s := r[0]; s < r[1]; s += vcStride {
			row := make([]float64, n)
			for c, x := range xs {
				var m float64
				for j := s - h; j <= s+h; j++ {
					m += float64(x[j])
				}
				row[c] = float64(x[s]) - m/float64(2*h+1)
			}
			rows = append(rows, row)
		}
	}
	if N != len(rows) {
		t.Fatalf("%d samples, want %d", N, len(rows))
	}
	data := mat.NewDense(len(rows), n, nil)
	for i, r := range rows {
		data.SetRow(i, r)
	}
	var want mat.SymDense
	stat.CovarianceMatrix(&want, data, nil)
	scale := float64(N-1) / float64(N)
	for i := range n {
		for j := i; j < n; j++ {
			if w := want.At(i, j) * scale; math.Abs(got[i*n+j]-w) > 1e-9*math.Max(1, math.Abs(w)) {
				t.Errorf("C[%d][%d] = %g, want %g", i, j, got[i*n+j], w)
			}
		}
	}
	// a window cut elsewhere in the same input, its buffer starting at
	// input sample base, gives the same blocks
	const base = 2*256 + 37
	cut := make([][]float32, n)
	for c, x := range xs {
		cut[c] = x[base:]
	}
	var other blockCov
	other.build(cut, 10, hi-base, base, fs)
	shifted := [][2]int{{ranges[0][0] - base, ranges[0][1] - base}, {ranges[1][0] - base, ranges[1][1] - base}}
	again := make([]float64, n*n)
	if other.sum(shifted, again) != N {
		t.Fatal("other window: different sample count")
	}
	for i := range got {
		if math.Abs(again[i]-got[i]) > 1e-12*math.Max(1, math.Abs(got[i])) {
			t.Fatalf("other window: C differs at %d: %g against %g", i, again[i], got[i])
		}
	}
}

// TestRankKMatchesGonum checks rankK against gonum's SymDense.SymRankK
// (BLAS dsyrk) bit for bit, on random rows with zeros among them.
func TestRankKMatchesGonum(t *testing.T) {
	rng := rand.New(rand.NewPCG(13, 14))
	for _, n := range []int{1, 4, 19} {
		for _, k := range []int{63, 64} {
			z := make([]float64, k*n)
			for i := range z {
				if rng.IntN(10) > 0 {
					z[i] = rng.NormFloat64() * 30
				}
			}
			s := make([]float64, n*n)
			for i := range s {
				s[i] = rng.NormFloat64()
			}
			S := mat.NewSymDense(n, slices.Clone(s))
			S.SymRankK(S, 1, mat.NewDense(k, n, z).T())
			rankK(s, z, n)
			for i := range n {
				for j := i; j < n; j++ {
					if s[i*n+j] != S.At(i, j) {
						t.Fatalf("n=%d k=%d (%d,%d): %v, gonum %v", n, k, i, j, s[i*n+j], S.At(i, j))
					}
				}
			}
		}
	}
}
