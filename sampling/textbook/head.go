package textbook

import (
	"fmt"

	"github.com/quorate-eeg/quorate/sampling/headmodel"
)

// FourShell is the head this generator projects its sources through: brain,
// cerebrospinal fluid, skull and scalp with radii 0.84, 0.865, 0.92 and 1.0 of
// a 92 mm scalp radius, conductivities 0.33, 1.79 (Baumann et al. 1997),
// 0.0132 (brain-to-skull ratio 1:25, Oostendorp et al. 2000) and 0.43 S/m
// (all from memory). Deliberately unlike synth's three-shell Rush & Driscoll
// head (skull ratio 1:80, no CSF).
func FourShell() headmodel.Sphere {
	const r = 0.092
	return headmodel.Sphere{
		Radii: []float64{0.84 * r, 0.865 * r, 0.92 * r, r},
		Sigma: []float64{0.33, 1.79, 0.0132, 0.43},
	}
}

// head projects unit-sphere dipoles onto named electrodes, common average
// reference, µV per unit moment, through the Berg & Scherg (1994)
// three-dipole approximation of FourShell.
type head struct {
	bs     headmodel.BergScherg
	el     []headmodel.Vec3
	R      float64
	labels []string
}

func newHead(labels []string) (*head, error) {
	s := FourShell()
	bs, err := s.BergScherg()
	if err != nil {
		return nil, err
	}
	pos, missing := headmodel.Positions(labels)
	if len(missing) > 0 {
		return nil, fmt.Errorf("textbook: no 10-10 position for electrodes %v", missing)
	}
	R := s.Radius()
	for i := range pos {
		pos[i] = pos[i].Scale(R)
	}
	return &head{bs: bs, el: pos, R: R, labels: labels}, nil
}

// project returns the average-referenced scalp map of a dipole at pos
// (unit-sphere coordinates; |pos| below the brain's 0.84) with moment m.
func (h *head) project(pos, m [3]float64) []float64 {
	v := make([]float64, len(h.el))
	h.bs.Potentials(v, h.el, headmodel.Vec3(pos).Scale(h.R), headmodel.Vec3(m))
	mean := 0.0
	for _, x := range v {
		mean += x
	}
	mean /= float64(len(v))
	for i := range v {
		v[i] -= mean
	}
	return v
}

// unitMap is project scaled so that its largest absolute value is 1, with the
// index of that electrode and the sign there.
func (h *head) unitMap(pos, m [3]float64) (v []float64, peak int, sign int) {
	v = h.project(pos, m)
	best := 0.0
	for i, x := range v {
		if a := abs(x); a > best {
			best, peak = a, i
		}
	}
	for i := range v {
		v[i] /= best
	}
	sign = 1
	if v[peak] < 0 {
		sign = -1
	}
	return v, peak, sign
}
