package detect

import (
	"math"
	"testing"
)

func TestZZNeg3(t *testing.T) {
	in := inputOf(generated(t, 3, 10))
	s, _ := (&Options{}).settings()
	src := in.Src.(memSource)
	neg := make(memSource, len(src))
	for c, x := range src {
		neg[c] = make([]float32, len(x))
		for i, v := range x {
			neg[c][i] = -v
		}
	}
	in2 := in
	in2.Src = neg
	c1, o1 := findAll(t, s, &in)
	c2, o2 := findAll(t, s, &in2)
	for i, o := range o1 {
		if o > 7 {
			break
		}
		for j, p := range o2 {
			if math.Abs(o-p) < 0.02 {
				a, b := c1[i].best, c2[j].best
				t.Logf("%.4f/%.4f d %d/%d ph %+v / %+v z %.3f/%.3f point %.3f/%.3f amp %.2f/%.2f", o, p, a.deriv, b.deriv, a.ph, b.ph, a.z, b.z, a.point, b.point, a.amp, b.amp)
			}
		}
	}
}
