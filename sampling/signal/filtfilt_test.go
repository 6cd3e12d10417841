package signal

import (
	"errors"
	"math"
	"math/rand/v2"
	"testing"
)

func maxAbs(x []float64) float64 {
	m := 0.0
	for _, v := range x {
		m = math.Max(m, math.Abs(v))
	}
	return m
}

func TestFiltFiltScipy(t *testing.T) {
	ref := loadRef(t)
	if len(ref.Filtfilt) == 0 || len(ref.X) == 0 {
		t.Fatal("no sosfiltfilt cases in testdata")
	}
	for _, c := range ref.Filtfilt { // scipy.signal.sosfiltfilt, padtype='odd'
		x := append([]float64(nil), ref.X...)
		if err := FiltFilt(SOS(c.SOS), x); err != nil {
			t.Fatal(err)
		}
		scale := maxAbs(c.Y)
		for i := range x {
			if math.Abs(x[i]-c.Y[i]) > 1e-10*scale {
				t.Fatalf("%s: y[%d] = %.15g, scipy %.15g", c.Name, i, x[i], c.Y[i])
			}
		}
		x32 := make([]float32, len(ref.X))
		for i, v := range ref.X {
			x32[i] = float32(v)
		}
		if err := FiltFilt32(SOS(c.SOS), x32); err != nil {
			t.Fatal(err)
		}
		for i := range x32 {
			// float32 input rounding (≈6e−8 relative) passes through a
			// filter whose ℓ1 gain is a few units
			if math.Abs(float64(x32[i])-c.Y[i]) > 1e-5*maxAbs(ref.X) {
				t.Fatalf("%s float32: y[%d] = %g, scipy %g", c.Name, i, x32[i], c.Y[i])
			}
		}
	}
}

func TestFilterZeroStateImpulse(t *testing.T) {
	// Impulse response of one section from rest equals the inverse
	// z-transform computed by the recurrence h[n] = b[n] − a1 h[n−1] −
	// a2 h[n−2] (Oppenheim & Schafer 2010, §6.1, eq. 6.9).
	s := SOS{{0.2, 0.3, 0.1, 1, -0.5, 0.25}}
	x := make([]float64, 8)
	x[0] = 1
	s.Filter(x)
	b := []float64{0.2, 0.3, 0.1}
	h := make([]float64, 8)
	for n := range h {
		if n < 3 {
			h[n] = b[n]
		}
		if n >= 1 {
			h[n] += 0.5 * h[n-1]
		}
		if n >= 2 {
			h[n] -= 0.25 * h[n-2]
		}
	}
	for n := range h {
		if math.Abs(x[n]-h[n]) > 1e-15 {
			t.Errorf("h[%d] = %g, want %g", n, x[n], h[n])
		}
	}
}

func eegChain(t testing.TB, fs float64) SOS {
	bp, err := Butterworth(BandPass, 4, fs, 0.5, 70)
	if err != nil {
		t.Fatal(err)
	}
	n, err := Notch(50, 30, fs)
	if err != nil {
		t.Fatal(err)
	}
	return Cascade(bp, n)
}

func TestZeroPhaseSymmetricPulse(t *testing.T) {
	// Forward–backward filtering has the real, even response |H|², whose
	// impulse response is even, so an input symmetric about c gives an
	// output symmetric about c (convolution of two even sequences).
	const n, c = 16385, 8192 // 32 s each side, so edge transients have died away
	x := make([]float64, n)
	for i := range x {
		d := float64(i-c) / 256 / 0.025 // 25 ms Gaussian spike
		x[i] = 100 * math.Exp(-0.5*d*d)
	}
	if err := FiltFilt(eegChain(t, 256), x); err != nil {
		t.Fatal(err)
	}
	peak := 0
	for i := range x {
		if x[i] > x[peak] {
			peak = i
		}
	}
	if peak != c {
		t.Errorf("peak moved from %d to %d", c, peak)
	}
	for k := 1; k < c; k++ {
		if math.Abs(x[c+k]-x[c-k]) > 1e-9*x[c] {
			t.Fatalf("asymmetric at ±%d: %g vs %g", k, x[c+k], x[c-k])
		}
	}
	// A causal pass alone is asymmetric about c: the check is not vacuous.
	y := make([]float64, n)
	for i := range y {
		d := float64(i-c) / 256 / 0.025
		y[i] = 100 * math.Exp(-0.5*d*d)
	}
	eegChain(t, 256).Filter(y)
	worst := 0.0
	for k := 1; k < c; k++ {
		worst = math.Max(worst, math.Abs(y[c+k]-y[c-k]))
	}
	if worst < 1e-3*y[c] {
		t.Errorf("causal output nearly symmetric (%g); test cannot discriminate", worst)
	}
}

func TestFiltFiltConstant(t *testing.T) {
	// A constant through a low-pass of unit DC gain H(1) = 1 is unchanged,
	// with no edge transient, because each pass starts in the fixed point
	// of the state update for that constant (closed form: see stepState).
	lp, _ := Butterworth(LowPass, 4, 256, 30)
	x := make([]float64, 100)
	for i := range x {
		x[i] = 37.5
	}
	if err := FiltFilt(lp, x); err != nil {
		t.Fatal(err)
	}
	for i, v := range x {
		if math.Abs(v-37.5) > 1e-10 {
			t.Fatalf("x[%d] = %.15g", i, v)
		}
	}
}

func TestFiltFiltShort(t *testing.T) {
	sos := eegChain(t, 256)
	zp := NewZeroPhase(sos)
	if zp.Pad() != 3*(2*5+1) { // 5 sections, none first-order
		t.Errorf("pad %d", zp.Pad())
	}
	var se *shortSignalError
	if err := FiltFilt(sos, make([]float64, zp.Pad())); !errors.As(err, &se) || se.Pad != zp.Pad() {
		t.Errorf("got %v", err)
	}
}

// memSource is an in-memory recording.
type memSource [][]float32

func (m memSource) ReadAt(ch int, start int64, dst []float32) error {
	copy(dst, m[ch][start:])
	return nil
}

func TestConditionerMatchesWhole(t *testing.T) {
	const fs = 256.0
	sos := eegChain(t, fs)
	const tol = 1e-6
	margin := Margin(sos, tol)
	if margin < int(2*fs) || margin > int(20*fs) {
		t.Fatalf("margin %d samples (%.1f s) implausible", margin, float64(margin)/fs)
	}
	// 2 minutes of drift, alpha, mains, spikes, steps and noise.
	rng := rand.New(rand.NewPCG(7, 11))
	n := int(120 * fs)
	x := make([]float32, n)
	for i := range x {
		tt := float64(i) / fs
		v := 50*math.Sin(2*math.Pi*0.1*tt) + 20*math.Sin(2*math.Pi*10*tt) +
			10*math.Sin(2*math.Pi*50*tt) + 5*rng.NormFloat64() + 30
		if i%3000 == 0 {
			v += 150
		}
		if (i/5000)%2 == 1 {
			v += 80
		}
		x[i] = float32(v)
	}
	whole := make([]float64, n)
	for i, v := range x {
		whole[i] = float64(v)
	}
	if err := FiltFilt(sos, whole); err != nil {
		t.Fatal(err)
	}
	c, err := NewConditioner(sos, memSource{x}, int64(n), margin)
	if err != nil {
		t.Fatal(err)
	}
	// Each pass's start-up transient after the margin is at most tol × the
	// ℓ1 gain G = Σ|h| times the input's peak (ℓ∞) size, and the backward
	// pass carries the forward error through G again: 2·tol·G²·peak, plus
	// float32 rounding of the output.
	h := make([]float64, 8*margin)
	h[0] = 1
	sos.Filter(h)
	gain := 0.0
	for _, v := range h {
		gain += math.Abs(v)
	}
	peak := 0.0
	for _, v := range x {
		peak = math.Max(peak, math.Abs(float64(v)))
	}
	limit := 2*tol*gain*gain*peak + 1e-7*peak
	t.Logf("ℓ1 gain %.3g, peak %.4g, limit %.3g", gain, peak, limit)
	for _, w := range []int{int(10 * fs), 1000, 257, 1} {
		got := make([]float32, n)
		starts := []int{0, 1, n / 2, n - 2, n - 1}
		if w > 1 {
			starts = nil
			for s := 0; s < n; s += w {
				starts = append(starts, s)
			}
		}
		worst := 0.0
		for _, s := range starts {
			e := min(s+w, n)
			if err := c.Read(0, int64(s), got[s:e]); err != nil {
				t.Fatal(err)
			}
			for i := s; i < e; i++ {
				worst = math.Max(worst, math.Abs(float64(got[i])-whole[i]))
			}
		}
		if worst > limit {
			t.Errorf("window %d: max deviation %g µV > %g", w, worst, limit)
		}
		t.Logf("window %d samples: max deviation from whole-signal %.3g", w, worst)
	}
	// With no margin the windows visibly disagree: the check can fail.
	c0, _ := NewConditioner(sos, memSource{x}, int64(n), 0)
	got := make([]float32, 1000)
	if err := c0.Read(0, 5000, got); err != nil {
		t.Fatal(err)
	}
	worst := 0.0
	for i := range got {
		worst = math.Max(worst, math.Abs(float64(got[i])-whole[5000+i]))
	}
	if worst < 100*limit {
		t.Errorf("zero margin deviates only %g", worst)
	}
	var we *windowError
	if err := c.Read(0, int64(n-10), make([]float32, 20)); !errors.As(err, &we) || we.End != int64(n+10) {
		t.Errorf("got %v", err)
	}
}

func TestMarginGeometric(t *testing.T) {
	// One real pole r: h[n] = rⁿ, so Σ_{n≥L} rⁿ / Σ rⁿ = r^L (geometric
	// series) and the margin is the least L with r^L ≤ tol:
	// L = ⌈ln tol / ln r⌉.
	for _, r := range []float64{0.5, 0.9, 0.99, 0.999} {
		for _, tol := range []float64{1e-3, 1e-6} {
			want := int(math.Ceil(math.Log(tol) / math.Log(r)))
			got := Margin(SOS{{1, 0, 0, 1, -r, 0}}, tol)
			if got < want-1 || got > want { // rounding in the running sums
				t.Errorf("r=%g tol=%g: margin %d, want %d", r, tol, got, want)
			}
		}
	}
	if Margin(SOS{{1, 0, 0, 1, -1, 0}}, 1e-6) != -1 {
		t.Error("pole on the unit circle accepted")
	}
}

func TestStreamMatchesWhole(t *testing.T) {
	const fs = 256.0
	sos := eegChain(t, fs)
	const tol = 1e-6
	margin := Margin(sos, tol)
	rng := rand.New(rand.NewPCG(3, 5))
	n := int(90 * fs)
	x := [][]float32{make([]float32, n), make([]float32, n)}
	for i := range n {
		tt := float64(i) / fs
		x[0][i] = float32(40*math.Sin(2*math.Pi*0.3*tt) + 10*math.Sin(2*math.Pi*50*tt) + 5*rng.NormFloat64() + 20)
		x[1][i] = float32(20*math.Sin(2*math.Pi*9*tt) + 8*rng.NormFloat64() - 50)
	}
	whole := make([][]float64, 2)
	peak := 0.0
	for c := range x {
		whole[c] = make([]float64, n)
		for i, v := range x[c] {
			whole[c][i] = float64(v)
			peak = math.Max(peak, math.Abs(float64(v)))
		}
		if err := FiltFilt(sos, whole[c]); err != nil {
			t.Fatal(err)
		}
	}
	s, err := NewStream(sos, 2, margin, int(4*fs))
	if err != nil {
		t.Fatal(err)
	}
	got := make([][]float32, 2)
	collect := func(out [][]float32) {
		for c := range out {
			got[c] = append(got[c], out[c]...)
		}
	}
	// Records of 1 s, with one odd-sized record to break alignment.
	for lo := 0; lo < n; {
		hi := min(lo+int(fs), n)
		if lo == int(20*fs) {
			hi = lo + 77
		}
		out, err := s.Push([][]float32{x[0][lo:hi], x[1][lo:hi]})
		if err != nil {
			t.Fatal(err)
		}
		collect(out)
		// bounded delay: at most margin + block samples held back
		if lag := int64(hi) - s.Emitted(); lag > int64(margin+int(4*fs)) {
			t.Fatalf("after %d samples only %d released", hi, s.Emitted())
		}
		lo = hi
	}
	out, err := s.Flush()
	if err != nil {
		t.Fatal(err)
	}
	collect(out)
	var se *shapeError
	if _, err := s.Push([][]float32{{1}, {1, 2}}); !errors.As(err, &se) || se.Channel != 1 {
		t.Errorf("ragged chunk: got %v", err)
	}
	// Same bound as TestConditionerMatchesWhole, with the band-pass ℓ1
	// gain taken generously as 4.
	limit := 2*tol*4*4*peak + 1e-7*peak
	for c := range got {
		if len(got[c]) != n {
			t.Fatalf("channel %d: %d samples out, want %d", c, len(got[c]), n)
		}
		worst := 0.0
		for i := range got[c] {
			worst = math.Max(worst, math.Abs(float64(got[c][i])-whole[c][i]))
		}
		if worst > limit {
			t.Errorf("channel %d: max deviation %g > %g", c, worst, limit)
		}
	}
}
