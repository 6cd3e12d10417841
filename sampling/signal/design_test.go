package signal

import (
	"encoding/json"
	"errors"
	"math"
	"math/cmplx"
	"os"
	"testing"
)

// scipyRef holds testdata/scipy_ref.json, made by testdata/gen_scipy.py
// with scipy.signal 1.10.1 (butter, iirnotch, buttap, sosfiltfilt).
type scipyRef struct {
	Designs []struct {
		Name  string
		Kind  string
		Order int
		Fs    float64
		Edges []float64
		SOS   [][6]float64 `json:"sos"`
	}
	Notches []struct {
		Name      string
		F0, Q, Fs float64
		SOS       [][6]float64 `json:"sos"`
		Gain      []float64    `json:"gain_dc_f0_nyquist"`
	}
	Buttap []struct {
		N   int
		Den []float64
	}
	X        []float64
	Filtfilt []struct {
		Name string
		SOS  [][6]float64 `json:"sos"`
		Y    []float64
	}
}

func loadRef(t testing.TB) *scipyRef {
	t.Helper()
	b, err := os.ReadFile("testdata/scipy_ref.json")
	if err != nil {
		t.Fatal(err)
	}
	var r scipyRef
	if err := json.Unmarshal(b, &r); err != nil {
		t.Fatal(err)
	}
	if len(r.Designs) == 0 || len(r.Notches) == 0 || len(r.Buttap) == 0 {
		t.Fatal("testdata/scipy_ref.json has no reference cases")
	}
	return &r
}

var kinds = map[string]Kind{"lowpass": LowPass, "highpass": HighPass, "bandpass": BandPass, "bandstop": BandStop}

func close(a, b, abs, rel float64) bool {
	return math.Abs(a-b) <= abs+rel*math.Max(math.Abs(a), math.Abs(b))
}

func TestButterworthPolynomialHandbook(t *testing.T) {
	// Normalised Butterworth polynomials to 4 decimals, highest power first.
	// Williams & Taylor, Electronic Filter Design Handbook (4th ed., 2006),
	// Table 11-1 "Butterworth polynomials"; the four-decimal table is
	// from memory. The same coefficients at full precision come from
	// scipy.signal.buttap + numpy.poly (testdata/gen_scipy.py) in
	// TestButterworthPolynomialScipy.
	table := [][]float64{
		{1, 1},
		{1, 1.4142, 1},
		{1, 2, 2, 1},
		{1, 2.6131, 3.4142, 2.6131, 1},
		{1, 3.2361, 5.2361, 5.2361, 3.2361, 1},
		{1, 3.8637, 7.4641, 9.1416, 7.4641, 3.8637, 1},
	}
	for i, want := range table {
		n := i + 1
		got := ButterworthPolynomial(n)
		if len(got) != len(want) {
			t.Fatalf("n=%d: %d coefficients, want %d", n, len(got), len(want))
		}
		for j := range want {
			if math.Abs(got[j]-want[j]) > 5e-5 { // table rounds to 4 decimals
				t.Errorf("n=%d coefficient %d: got %.6f want %.4f", n, j, got[j], want[j])
			}
		}
	}
}

func TestButterworthPolynomialScipy(t *testing.T) {
	for _, c := range loadRef(t).Buttap { // scipy.signal.buttap + numpy.poly
		got := ButterworthPolynomial(c.N)
		for j, w := range c.Den {
			if !close(got[j], w, 1e-12, 1e-12) {
				t.Errorf("n=%d coefficient %d: got %.15g want %.15g", c.N, j, got[j], w)
			}
		}
	}
}

func TestButterworthPolesOnUnitCircle(t *testing.T) {
	// Butterworth (1930): |H(jΩ)|² = 1/(1+Ω²ⁿ), so the poles are the
	// left-half-plane roots of 1+(−s²)ⁿ, all of modulus 1.
	for n := 1; n <= MaxOrder; n++ {
		for _, p := range ButterworthPoles(n) {
			if math.Abs(cmplx.Abs(p)-1) > 1e-14 || real(p) >= 0 {
				t.Errorf("n=%d pole %v not on the left unit semicircle", n, p)
			}
			v := 1 + cmplx.Pow(-p*p, complex(float64(n), 0))
			if cmplx.Abs(v) > 1e-12 {
				t.Errorf("n=%d pole %v: 1+(−s²)ⁿ = %v", n, p, v)
			}
		}
	}
}

func TestButterworthScipy(t *testing.T) {
	for _, c := range loadRef(t).Designs { // scipy.signal.butter(output='sos')
		got, err := Butterworth(kinds[c.Kind], c.Order, c.Fs, c.Edges...)
		if err != nil {
			t.Fatalf("%s: %v", c.Name, err)
		}
		if len(got) != len(c.SOS) {
			t.Fatalf("%s: %d sections, want %d", c.Name, len(got), len(c.SOS))
		}
		for i := range got {
			for j := range 6 {
				if !close(got[i][j], c.SOS[i][j], 1e-13, 1e-9) {
					t.Errorf("%s section %d: got %v\nwant %v", c.Name, i, got[i], c.SOS[i])
					break
				}
			}
		}
	}
}

func TestNotchScipy(t *testing.T) {
	for _, c := range loadRef(t).Notches { // scipy.signal.iirnotch
		got, err := Notch(c.F0, c.Q, c.Fs)
		if err != nil {
			t.Fatal(err)
		}
		for j := range 6 {
			if !close(got[0][j], c.SOS[0][j], 1e-14, 1e-12) {
				t.Errorf("%s: got %v want %v", c.Name, got[0], c.SOS[0])
				break
			}
		}
		// Zeros on the unit circle at f0: complete rejection; unity gain
		// at DC and Nyquist (Orfanidis 1996, §11.3; section from memory).
		// scipy.signal.freqz of scipy's notch gives 1, 0 and 1 there
		// (testdata/gen_scipy.py, gain_dc_f0_nyquist).
		if len(c.Gain) != 3 {
			t.Fatalf("%s: %d scipy gains, want 3", c.Name, len(c.Gain))
		}
		for k, f := range []float64{0, c.F0, c.Fs / 2} {
			want := []float64{1, 0, 1}[k]
			h := cmplx.Abs(FrequencyResponse(got, f, c.Fs))
			if math.Abs(h-want) > 1e-12 || math.Abs(h-c.Gain[k]) > 1e-12 {
				t.Errorf("%s: |H(%g)| = %g, want %g (scipy freqz %g)", c.Name, f, h, want, c.Gain[k])
			}
		}
	}
}

func TestCutoffMinus3dB(t *testing.T) {
	// With pre-warping the bilinear transform maps each analogue edge to the
	// requested digital edge, where a Butterworth response is exactly 1/√2
	// (Oppenheim & Schafer 2010, §7.2.2, eq. 7.26 and §7.2.1).
	cases := []struct {
		kind  Kind
		order int
		fs    float64
		edges []float64
		pass  float64 // a frequency where |H| = 1 exactly
	}{
		{LowPass, 4, 256, []float64{70}, 0},
		{LowPass, 7, 1000, []float64{400}, 0},
		{HighPass, 2, 256, []float64{0.5}, 128},
		{HighPass, 5, 512, []float64{0.16}, 256},
		{BandPass, 4, 256, []float64{0.5, 70}, math.NaN()},
		{BandPass, 1, 200, []float64{8, 13}, math.NaN()},
		{BandStop, 3, 256, []float64{45, 55}, 0},
	}
	for _, c := range cases {
		sos, err := Butterworth(c.kind, c.order, c.fs, c.edges...)
		if err != nil {
			t.Fatal(err)
		}
		for _, e := range c.edges {
			h := cmplx.Abs(FrequencyResponse(sos, e, c.fs))
			if db := 20 * math.Log10(h); math.Abs(db-(-3.0103)) > 1e-4 {
				t.Errorf("%v order %d: %.4g dB at %g Hz, want −3.0103", c.kind, c.order, db, e)
			}
		}
		f := c.pass
		if math.IsNaN(f) { // band-pass peak: centre 2fs·atan(Ω₀/2fs)/2π
			w0 := math.Sqrt(math.Tan(math.Pi*c.edges[0]/c.fs) * math.Tan(math.Pi*c.edges[1]/c.fs))
			f = math.Atan(w0) * c.fs / math.Pi
		}
		if h := cmplx.Abs(FrequencyResponse(sos, f, c.fs)); math.Abs(h-1) > 1e-9 {
			t.Errorf("%v order %d: |H(%g)| = %.12f, want 1", c.kind, c.order, f, h)
		}
	}
}

func TestDesignErrors(t *testing.T) {
	cases := []struct {
		field string
		run   func() error
	}{
		{"order", func() error { _, err := Butterworth(LowPass, 0, 256, 30); return err }},
		{"order", func() error { _, err := Butterworth(LowPass, MaxOrder+1, 256, 30); return err }},
		{"fs", func() error { _, err := Butterworth(LowPass, 2, -1, 30); return err }},
		{"edges", func() error { _, err := Butterworth(BandPass, 2, 256, 30); return err }},
		{"edges[0]", func() error { _, err := Butterworth(HighPass, 2, 256, 128); return err }},
		{"edges[1]", func() error { _, err := Butterworth(BandStop, 2, 256, 50, 40); return err }},
		{"kind", func() error { _, err := Butterworth(Kind(9), 2, 256, 30); return err }},
		{"q", func() error { _, err := Notch(50, 0, 256); return err }},
		{"f0", func() error { _, err := Notch(150, 30, 256); return err }},
	}
	for _, c := range cases {
		var de *designError
		if err := c.run(); !errors.As(err, &de) || de.Field != c.field {
			t.Errorf("want designError on %q, got %v", c.field, err)
		}
	}
}
