package spline

import (
	"encoding/json"
	"math"
	"os"
	"testing"

	"github.com/quorate-eeg/quorate/sampling/headmodel"
)

// Explicit Legendre polynomials P_1 … P_5 (Abramowitz & Stegun 1964,
// Table 22.9), whose coefficients are checked here against
// scipy.special.legendre(n).coeffs, and legendre(n, x) against
// scipy.special.eval_legendre (testdata/gen_spline.py).
func TestLegendreClosedForm(t *testing.T) {
	coeffs := map[int][]float64{ // highest power first
		1: {1, 0},
		2: {3. / 2, 0, -1. / 2},
		3: {5. / 2, 0, -3. / 2, 0},
		4: {35. / 8, 0, -30. / 8, 0, 3. / 8},
		5: {63. / 8, 0, -70. / 8, 0, 15. / 8, 0},
	}
	ref := loadRef(t)
	if len(ref.Legendre) != 5 {
		t.Fatalf("%d scipy Legendre cases, want 5", len(ref.Legendre))
	}
	for _, c := range ref.Legendre {
		want := coeffs[c.N]
		if len(c.Coeffs) != len(want) {
			t.Fatalf("P_%d: scipy has %d coefficients, want %d", c.N, len(c.Coeffs), len(want))
		}
		for j := range want {
			if math.Abs(c.Coeffs[j]-want[j]) > 1e-12 {
				t.Errorf("P_%d coefficient %d: closed form %v, scipy %v", c.N, j, want[j], c.Coeffs[j])
			}
		}
		for j, x := range c.X {
			if got := legendre(c.N, x); math.Abs(got-c.P[j]) > 1e-14 {
				t.Errorf("P_%d(%g) = %.16g, scipy eval_legendre %.16g", c.N, x, got, c.P[j])
			}
		}
	}

	closed := map[int]func(x float64) float64{
		1: func(x float64) float64 { return x },
		2: func(x float64) float64 { return (3*x*x - 1) / 2 },
		3: func(x float64) float64 { return (5*x*x*x - 3*x) / 2 },
		4: func(x float64) float64 { return (35*math.Pow(x, 4) - 30*x*x + 3) / 8 },
		5: func(x float64) float64 { return (63*math.Pow(x, 5) - 70*x*x*x + 15*x) / 8 },
	}
	for n, f := range closed {
		for _, x := range []float64{-1, -0.7, -0.2, 0, 0.35, 0.9, 1} {
			if got, want := legendre(n, x), f(x); math.Abs(got-want) > 1e-14 {
				t.Errorf("P_%d(%g) = %.16g, want %.16g", n, x, got, want)
			}
		}
	}
}

type splineRef struct {
	G []struct {
		M, Nterms int
		X, G      []float64
	}
	Electrodes []headmodel.Vec3
	Values     []float64
	Queries    []headmodel.Vec3
	Interp     []struct {
		M           int
		Lambda      float64
		Nterms      int
		C0          float64
		C           []float64
		QueryValues []float64 `json:"query_values"`
	}
	Legendre []struct {
		N      int
		X, P   []float64
		Coeffs []float64
	}
}

func loadRef(t *testing.T) splineRef {
	raw, err := os.ReadFile("testdata/spline_ref.json")
	if err != nil {
		t.Fatal(err)
	}
	var r splineRef
	if err := json.Unmarshal(raw, &r); err != nil {
		t.Fatal(err)
	}
	if len(r.G) == 0 || len(r.Interp) == 0 {
		t.Fatal("empty reference")
	}
	return r
}

// g_m against testdata/gen_spline.py (scipy.special.eval_legendre).
func TestKernelAgainstScipy(t *testing.T) {
	r := loadRef(t)
	for _, c := range r.G {
		for i, x := range c.X {
			got := G(c.M, c.Nterms, x)
			if math.Abs(got-c.G[i]) > 1e-13 {
				t.Errorf("g_%d(%g) with %d terms = %.16g, scipy %.16g", c.M, x, c.Nterms, got, c.G[i])
			}
		}
	}
}

// Whole interpolation (coefficients and values between electrodes)
// against testdata/gen_spline.py (numpy.linalg.solve).
func TestInterpolationAgainstNumpy(t *testing.T) {
	r := loadRef(t)
	for _, c := range r.Interp {
		ip, err := New(r.Electrodes, c.M, c.Lambda, c.Nterms)
		if err != nil {
			t.Fatal(err)
		}
		co, err := ip.Fit(r.Values)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(co.C0-c.C0) > 1e-8*(1+math.Abs(c.C0)) {
			t.Errorf("m=%d λ=%g: c0 %.12g, numpy %.12g", c.M, c.Lambda, co.C0, c.C0)
		}
		for i, q := range r.Queries {
			if got := ip.Value(co, q); math.Abs(got-c.QueryValues[i]) > 1e-8 {
				t.Errorf("m=%d λ=%g query %v: %.12g, numpy %.12g", c.M, c.Lambda, q, got, c.QueryValues[i])
			}
		}
	}
}

func tenTwenty(t testing.TB) []headmodel.Vec3 {
	els, missing := headmodel.Positions([]string{"Fp1", "Fp2", "F7", "F3", "Fz", "F4", "F8", "T7", "C3", "Cz", "C4", "T8", "P7", "P3", "Pz", "P4", "P8", "O1", "O2"})
	if len(missing) > 0 {
		t.Fatal(missing)
	}
	return els
}

// With λ = 0 the spline interpolates: it reproduces the data at the
// electrodes (Perrin et al. 1989), and a constant map stays constant
// (c = 0, c₀ = constant solves the system exactly).
func TestInterpolatesAndKeepsConstants(t *testing.T) {
	els := tenTwenty(t)
	ip, err := New(els, 4, 0, 0)
	if err != nil {
		t.Fatal(err)
	}
	v := make([]float64, len(els))
	for i, e := range els {
		v[i] = 3*e[0] - e[1]*e[2] + math.Sin(4*e[1])
	}
	c, err := ip.Fit(v)
	if err != nil {
		t.Fatal(err)
	}
	for i, e := range els {
		if got := ip.Value(c, e); math.Abs(got-v[i]) > 1e-9 {
			t.Errorf("electrode %d: %.12g, data %.12g", i, got, v[i])
		}
	}
	for i := range v {
		v[i] = 5
	}
	c, _ = ip.Fit(v)
	for _, p := range []headmodel.Vec3{{0, 0, 1}, {0.3, -0.2, 0.5}, {-1, 0, 0}} {
		if got := ip.Value(c, p); math.Abs(got-5) > 1e-9 {
			t.Errorf("constant map at %v: %g", p, got)
		}
	}
	// Smoothing: λ > 0 no longer reproduces the data exactly.
	sm, _ := New(els, 4, 1e-3, 0)
	for i, e := range els {
		v[i] = e[0]
	}
	c, _ = sm.Fit(v)
	off := 0.0
	for i, e := range els {
		off = math.Max(off, math.Abs(sm.Value(c, e)-v[i]))
	}
	if off < 1e-6 {
		t.Errorf("λ = 1e-3 reproduced the data to %g", off)
	}
}

// The top view: NaN outside the disk, the centre pixel is the vertex,
// anterior on top and left on the left.
func TestGridOrientation(t *testing.T) {
	els := tenTwenty(t)
	ip, err := New(els, 4, 0, 0)
	if err != nil {
		t.Fatal(err)
	}
	v := make([]float64, len(els))
	for i, e := range els {
		v[i] = e[1] + 0.5*e[0] // anterior and right positive
	}
	const size = 33
	g, err := ip.Grid(v, size)
	if err != nil {
		t.Fatal(err)
	}
	if !math.IsNaN(g[0][0]) || !math.IsNaN(g[size-1][size-1]) {
		t.Error("corners must be NaN")
	}
	c, _ := ip.Fit(v)
	if got, want := g[size/2][size/2], ip.Value(c, headmodel.Vec3{0, 0, 1}); math.Abs(got-want) > 1e-12 {
		t.Errorf("centre pixel %g, vertex %g", got, want)
	}
	if !(g[2][size/2] > 0 && g[size-3][size/2] < 0) {
		t.Errorf("anterior should be up: top %g bottom %g", g[2][size/2], g[size-3][size/2])
	}
	if !(g[size/2][2] < 0 && g[size/2][size-3] > 0) {
		t.Errorf("left should be left: left %g right %g", g[size/2][2], g[size/2][size-3])
	}
	// Fpz (10 % ring, polar angle 72°) sits at 0.8 of the radius: in a
	// 35-pixel image the centre of row 3, column 17 is at (0, 0.8).
	d, ok := PixelDirection(3, 17, 35, DefaultEdge)
	fpz, _ := headmodel.Position("Fpz")
	if !ok || d.Sub(fpz).Norm() > 1e-12 {
		t.Errorf("pixel at 0.8 radius points %v, Fpz %v", d, fpz)
	}
}

func TestErrors(t *testing.T) {
	els := tenTwenty(t)
	if _, err := New(els, 1, 0, 0); err == nil {
		t.Error("m = 1 accepted")
	}
	if _, err := New(append(els, els[0]), 4, 0, 0); err == nil {
		t.Error("duplicate electrode accepted")
	}
	ip, _ := New(els, 4, 0, 0)
	if _, err := ip.Fit(make([]float64, 3)); err == nil {
		t.Error("wrong length accepted")
	}
	if _, err := ip.Grid(make([]float64, len(els)), 0); err == nil {
		t.Error("size 0 accepted")
	}
}

func BenchmarkSplineGrid(b *testing.B) {
	els := tenTwenty(b)
	ip, err := New(els, 4, 0, 0)
	if err != nil {
		b.Fatal(err)
	}
	v := make([]float64, len(els))
	for i, e := range els {
		v[i] = e[0] - e[1]
	}
	for i := 0; i < b.N; i++ {
		if _, err := ip.Grid(v, 64); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkSplineGridCold(b *testing.B) {
	els := tenTwenty(b)
	v := make([]float64, len(els))
	for i := 0; i < b.N; i++ {
		ip, _ := New(els, 4, 0, 0)
		if _, err := ip.Grid(v, 64); err != nil {
			b.Fatal(err)
		}
	}
}
