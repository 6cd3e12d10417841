package headmodel

import (
	"math"
	"testing"
)

// The Berg & Scherg (1994) three-dipole approximation against the exact
// series (itself checked against testdata/gen_sphere.py): relative RMS
// error over all 10-10 electrodes below 1e-3 up to eccentricity 0.95 of
// the brain radius, for the Rush & Driscoll head and a four-shell head
// with CSF (1.79 S/m at 37 °C: Baumann, Wozny, Kelly & Meno 1997, IEEE
// Trans Biomed Eng 44:220–223, abstract). Observed ≤ 4.2e-4.
func TestBergSchergAccuracy(t *testing.T) {
	const R = 0.09
	heads := []Sphere{
		DefaultHead(),
		{Radii: []float64{0.80 * R, 0.84 * R, 0.92 * R, R}, Sigma: []float64{0.33, 1.79, 0.33 / 80, 0.33}},
	}
	for hi, h := range heads {
		bs, err := h.BergScherg()
		if err != nil {
			t.Fatal(err)
		}
		els, _ := Positions(Names1010())
		els = ScaleAll(els, R)
		a := make([]float64, len(els))
		b := make([]float64, len(els))
		for _, ecc := range []float64{0, 0.3, 0.6, 0.8, 0.9, 0.95} {
			for _, dir := range []Vec3{{0, 0, 1}, {1, 0, 0}, {0.5, -0.5, 0.7}} {
				for _, m := range []Vec3{{0, 0, 1e-8}, {1e-8, 0, 0}, {0, 1e-8, 0}} {
					pos := dir.Unit().Scale(ecc * h.Radii[0])
					h.Potentials(a, els, pos, m)
					bs.Potentials(b, els, pos, m)
					var num, den float64
					for i := range a {
						num += (a[i] - b[i]) * (a[i] - b[i])
						den += a[i] * a[i]
					}
					if rel := math.Sqrt(num / den); rel > 1e-3 {
						t.Errorf("head %d ecc %.2f dir %v moment %v: relative RMS error %.2e", hi, ecc, dir, m, rel)
					}
				}
			}
		}
	}
}

// TestDefaultBergSchergTabulated fits the Berg–Scherg approximation of
// the default head again and requires the tabulated parameters
// (defaultBergScherg) bit for bit, and that BergScherg returns them.
func TestDefaultBergSchergTabulated(t *testing.T) {
	got, err := DefaultHead().fitBergScherg()
	if err != nil {
		t.Fatal(err)
	}
	if got != defaultBergScherg {
		t.Errorf("fit %#v, tabulated %#v", got, defaultBergScherg)
	}
	if bs, err := DefaultHead().BergScherg(); err != nil || bs != defaultBergScherg {
		t.Errorf("BergScherg() = %#v, %v; want the tabulated %#v", bs, err, defaultBergScherg)
	}
}
