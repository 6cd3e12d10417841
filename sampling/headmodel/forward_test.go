package headmodel

import (
	"encoding/json"
	"math"
	"os"
	"testing"
)

// Radial dipole at the centre of a homogeneous sphere:
// V = 3 p cos θ / (4π σ R²) (e.g. Brody, Terry & Ideker 1973; the n = 1
// term of the Legendre series).
func TestCentreDipoleClosedForm(t *testing.T) {
	const (
		R     = 0.09
		sigma = 0.33
		p     = 1e-8
	)
	for _, head := range []Sphere{Homogeneous(R, sigma), {Radii: []float64{0.5 * R, 0.8 * R, R}, Sigma: []float64{sigma, sigma, sigma}}} {
		var els []Vec3
		var want []float64
		for _, th := range []float64{0, 0.3, 1, math.Pi / 2, 2.5, math.Pi} {
			els = append(els, Vec3{math.Sin(th), 0, math.Cos(th)}.Scale(R))
			want = append(want, 3*p*math.Cos(th)/(4*math.Pi*sigma*R*R))
		}
		got := make([]float64, len(els))
		head.Potentials(got, els, Vec3{}, Vec3{0, 0, p})
		for i := range got {
			if math.Abs(got[i]-want[i]) > 1e-12*math.Abs(want[0]) {
				t.Errorf("%d shells, electrode %d: got %g want %g", len(head.Radii), i, got[i], want[i])
			}
		}
	}
}

// Equal conductivities: the multi-shell series must reproduce the
// homogeneous closed form (Frank 1952; Brody et al. 1973) to 1e-6.
func TestEqualConductivitiesMatchHomogeneous(t *testing.T) {
	const R = 0.09
	multi := Sphere{Radii: []float64{0.87 * R, 0.92 * R, R}, Sigma: []float64{0.33, 0.33, 0.33}}
	hom := Homogeneous(R, 0.33)
	names := []string{"Fp1", "Fz", "Cz", "T7", "P8", "O2", "Iz", "F9"}
	els, _ := Positions(names)
	els = ScaleAll(els, R)
	cases := []struct{ pos, m Vec3 }{
		{Vec3{0, 0, 0.05}, Vec3{0, 0, 1e-8}},
		{Vec3{0.02, 0.03, 0.04}, Vec3{1e-8, -2e-8, 5e-9}},
		{Vec3{-0.06, 0.01, 0.03}, Vec3{0, 1e-8, 0}},
		{Vec3{0, -0.07, 0.02}, Vec3{3e-9, 4e-9, -1e-8}},
	}
	a := make([]float64, len(els))
	b := make([]float64, len(els))
	for _, c := range cases {
		multi.Potentials(a, els, c.pos, c.m)
		hom.Potentials(b, els, c.pos, c.m)
		scale := maxAbs(b)
		for i := range a {
			if math.Abs(a[i]-b[i]) > 1e-6*scale {
				t.Errorf("pos %v electrode %s: series %g closed form %g", c.pos, names[i], a[i], b[i])
			}
		}
	}
}

type sphereRef struct {
	Head       string
	Radii      []float64
	Sigma      []float64
	Pos        Vec3
	Moment     Vec3
	Electrodes []Vec3
	V          []float64
}

// Multi-shell potentials against testdata/gen_sphere.py (numpy.linalg.solve
// of the boundary conditions per degree, scipy.special.eval_legendre,
// dipole as a finite difference of two point sources).
func TestMultiShellAgainstReference(t *testing.T) {
	raw, err := os.ReadFile("testdata/sphere_ref.json")
	if err != nil {
		t.Fatal(err)
	}
	var refs []sphereRef
	if err := json.Unmarshal(raw, &refs); err != nil {
		t.Fatal(err)
	}
	if len(refs) == 0 {
		t.Fatal("no reference cases")
	}
	for _, r := range refs {
		s := Sphere{Radii: r.Radii, Sigma: r.Sigma}
		got := make([]float64, len(r.Electrodes))
		s.Potentials(got, r.Electrodes, r.Pos, r.Moment)
		scale := maxAbs(r.V)
		for i := range got {
			if math.Abs(got[i]-r.V[i]) > 1e-6*scale {
				t.Errorf("%s pos %v electrode %d: got %g want %g", r.Head, r.Pos, i, got[i], r.V[i])
			}
		}
	}
}

// Self-consistency: the lead field reproduces Potentials.
func TestLeadFieldMatchesPotentials(t *testing.T) {
	head := DefaultHead()
	els, _ := Positions([]string{"Fp1", "Fz", "Cz", "T7", "P8", "O2"})
	els = ScaleAll(els, head.Radius())
	pos := Vec3{0.01, 0.02, 0.05}
	l := head.LeadField(els, pos)
	p := Vec3{1e-8, 2e-8, -3e-8}
	v := make([]float64, len(els))
	head.Potentials(v, els, pos, p)
	for i := range v {
		lv := l.At(i, 0)*p[0] + l.At(i, 1)*p[1] + l.At(i, 2)*p[2]
		if math.Abs(lv-v[i]) > 1e-12*maxAbs(v) {
			t.Errorf("electrode %d: L p = %g, V = %g", i, lv, v[i])
		}
	}
}

func maxAbs(v []float64) float64 {
	m := 0.0
	for _, x := range v {
		m = math.Max(m, math.Abs(x))
	}
	return m
}
