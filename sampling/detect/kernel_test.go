package detect

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

// TestHatResponse checks the box hat against closed forms: it ignores a
// constant and a straight line (zero mean, symmetric), and on x[i] = i² it
// responds with (h(h+1) − o(o+1))/3 everywhere, the difference of the
// mean of k² over |k| ≤ h and over |k| ≤ o (Σ_{k=1}^{n} k² = n(n+1)(2n+1)/6,
// any handbook of series, e.g. Abramowitz & Stegun 1964, 23.1.4 with
// Bernoulli polynomials).
func TestHatResponse(t *testing.T) {
	for _, h := range []int{1, 3, 6} {
		k := newHat(h)
		o := k.outer()
		n := 4*o + 10
		for name, f := range map[string]func(i int) float64{
			"constant":  func(int) float64 { return 7 },
			"line":      func(i int) float64 { return 3 - 0.5*float64(i) },
			"quadratic": func(i int) float64 { return float64(i * i) },
		} {
			x := make([]float32, n)
			for i := range x {
				x[i] = float32(f(i))
			}
			cum := make([]float64, n+1)
			runningSum(cum, x)
			r := make([]float32, n)
			for i := range r {
				r[i] = k.at(cum, i)
			}
			want := 0.0
			if name == "quadratic" {
				want = float64(h*(h+1)-o*(o+1)) / 3
			}
			for i := o; i < n-o; i++ {
				if math.Abs(float64(r[i])-want) > 1e-3*max(1, math.Abs(want)) {
					t.Fatalf("h %d %s: r[%d] = %g, want %g", h, name, i, r[i], want)
				}
			}
			if r[o-1] != 0 || r[n-o] != 0 {
				t.Errorf("h %d %s: response where the surround leaves the trace", h, name)
			}
		}
	}
}

// TestBankScale checks the hat's robust background scale on white normal
// noise of standard deviation σ against its closed form: the centre mean
// (nc samples) lies inside the surround mean (no samples), so
// var(r) = σ²(1/nc + 1/no − 2/no) = σ²(1/nc − 1/no) (variance of a
// difference of correlated means), and madToSD × median|r| estimates its
// square root (Hampel 1974). The median over blocks must be within 5 % of
// it; single blocks, estimated from a decimated, autocorrelated response
// and an 11-block median, within 30 % (the widest hat has only about 3
// independent values per second, so ±20 % is about one standard error).
func TestBankScale(t *testing.T) {
	const sd, fs = 30.0, 256
	rng := rand.New(rand.NewPCG(11, 12))
	x := make([]float32, fs*300)
	for i := range x {
		x[i] = float32(sd * rng.NormFloat64())
	}
	b := bank{hats: hatsFor(fs)}
	b.prepare(x, 0, len(x), fs, 5)
	for k, hk := range b.hats {
		nc, no := float64(2*hk.h+1), float64(2*hk.outer()+1)
		want := sd * math.Sqrt(1/nc-1/no)
		// blocks whose surround stays inside the trace
		sc := append([]float64(nil), b.scale[k][1:len(b.scale[k])-1]...)
		for blk, got := range sc {
			if math.Abs(got-want) > 0.3*want {
				t.Errorf("hat h=%d block %d: scale %.3f, want %.3f", hk.h, blk+1, got, want)
			}
		}
		slices.Sort(sc)
		if got := sc[len(sc)/2]; math.Abs(got-want) > 0.05*want {
			t.Errorf("hat h=%d: median scale %.3f, want %.3f", hk.h, got, want)
		}
	}
}

// TestComplexes checks the one-discharge rule (FEATURES.md, finder; common
// practice: a spike, its overshoot and its after-going slow wave, within
// about 500 ms, are one discharge): an overshoot larger than its spike and
// a slow wave 300 ms later join the spike's event, which is reported at the
// spike; a transient 600 ms before on other derivations stays an event of
// its own, as does one 600 ms after the discharge's strongest phase; a
// small wave just before a transient (a quarter of its rank) does not
// displace it, and one of half its rank is reported beside it.
func TestComplexes(t *testing.T) {
	ev := func(p int, z float64, deriv ...int) cluster {
		return cluster{best: detection{deriv: deriv[0], ph: phase{peak: p}, z: z, point: 2}, members: deriv}
	}
	const fs = 1000
	cl := []cluster{
		ev(400, 3, 5),     // elsewhere, earlier
		ev(1000, 8, 1, 2), // spike
		ev(1080, 9, 2),    // its overshoot, larger
		ev(1300, 5, 1),    // its slow wave
		ev(1680, 4, 1),    // a new discharge
		ev(3000, 2, 7),    // a small wave before
		ev(3100, 8, 7, 8), // a transient
		ev(5000, 4, 9),    // a wave of half the rank before
		ev(5100, 8, 9),    // a transient
	}
	got := complexes(cl, int(complexBeforeS*fs), int(complexAfterS*fs), complexFrac, fs)
	var peaks []int
	for _, c := range got {
		peaks = append(peaks, c.best.ph.peak)
	}
	want := []int{400, 1000, 1680, 3100, 5000, 5100}
	if !slices.Equal(peaks, want) {
		t.Fatalf("kept %v, want %v", peaks, want)
	}
}

// TestFindChannelMatchesExactZ checks findChannel, which rejects most
// extrema by a multiplication against per-block limits, against the same
// search computing the exact matched response z at every extremum: the
// same detections with the same values, on a noisy trace with spikes, for
// thresholds that many and few extrema reach and blocks cut mid-trace.
func TestFindChannelMatchesExactZ(t *testing.T) {
	rng := rand.New(rand.NewPCG(11, 12))
	const fs, n = 256, 256 * 20
	x := make([]float32, n)
	for i := range x {
		x[i] = float32(rng.NormFloat64())
	}
	for i := 0; i+8 < n; i += 500 {
		for j := range 8 {
			x[i+j] += float32(12 * math.Sin(math.Pi*float64(j)/8))
		}
	}
	var b bank
	b.hats = hatsFor(fs)
	const start = 100
	b.prepare(x, start, n, fs, 5)
	scaleAt := func(int) float64 { return 1 }
	for _, thr := range []float64{0, 0.5, 2, 5} {
		got := findChannel(nil, 0, x, 10, n-10, fs, thr, scaleAt, &b, start, fs)
		var want []detection
		tested := 0
		for i := 10; i < n-10; i++ {
			ok, sign := isExtremum(x, i)
			if !ok {
				continue
			}
			z := b.z(i, sign, start, fs)
			if !(z >= thr) {
				continue
			}
			tested++
			if det, pass := examine(x, 0, i, sign, fs, thr, 1, z); pass {
				want = append(want, det)
			}
		}
		if tested == 0 {
			t.Fatalf("thr %g: no extremum reaches it; the test cannot fail", thr)
		}
		if !slices.Equal(got, want) {
			t.Fatalf("thr %g: %d detections, exact z everywhere %d", thr, len(got), len(want))
		}
		t.Logf("thr %g: %d extrema reach it, %d detections", thr, tested, len(got))
	}
}
