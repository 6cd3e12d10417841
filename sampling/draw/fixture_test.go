package draw

import (
	"fmt"
	"math"
	"testing"
)

// fixture is a 25-unit population in three regions with uneven subjects,
// small enough for exact hand allocation and 10,000-draw Monte Carlo.
//
//	temporal-left (12): P1×7, P2×3, P3×2
//	frontal        (8): P1×1, P4×5, P5×2
//	occipital      (5): P2×2, P6×3
func fixture() *Frame {
	groups := []struct {
		region, subject string
		n               int
	}{
		{"temporal-left", "P1", 7}, {"temporal-left", "P2", 3}, {"temporal-left", "P3", 2},
		{"frontal", "P1", 1}, {"frontal", "P4", 5}, {"frontal", "P5", 2},
		{"occipital", "P2", 2}, {"occipital", "P6", 3},
	}
	f := &Frame{Num: map[string][]float64{"score": nil}, Cat: map[string][]string{"region": nil}}
	i := 0
	for _, g := range groups {
		for k := 0; k < g.n; k++ {
			i++
			f.ID = append(f.ID, fmt.Sprintf("e%02d", i))
			f.Subject = append(f.Subject, g.subject)
			f.Recording = append(f.Recording, g.subject+"-r1")
			f.Cat["region"] = append(f.Cat["region"], g.region)
			f.Num["score"] = append(f.Num["score"], float64(i%7)+0.5*float64(i))
		}
	}
	return f
}

// expectedPi is the design's first-order inclusion probability written out
// from its definition, min(1, c/N_sh)·n_h/N'_h, for hand-computed n_h.
func expectedPi(f *Frame, cap int, nh map[string]int) map[string]float64 {
	region := f.Cat["region"]
	nsh := map[[2]string]int{}
	for i := range f.ID {
		nsh[[2]string{region[i], f.Subject[i]}]++
	}
	capped := map[string]int{}
	for k, v := range nsh {
		if cap > 0 && v > cap {
			v = cap
		}
		capped[k[0]] += v
	}
	pi := map[string]float64{}
	for i, id := range f.ID {
		thin := 1.0
		if c := nsh[[2]string{region[i], f.Subject[i]}]; cap > 0 && c > cap {
			thin = float64(cap) / float64(c)
		}
		pi[id] = thin * float64(nh[region[i]]) / float64(capped[region[i]])
	}
	return pi
}

// checkFrequencies compares the observed inclusion frequency of every unit
// over R draws with π: within 4 binomial standard errors √(π(1−π)/R), and
// exactly 0 or R when π is 0 or 1.
func checkFrequencies(t *testing.T, name string, count map[string]int, R int, pi map[string]float64) {
	t.Helper()
	for id, p := range pi {
		got := float64(count[id]) / float64(R)
		tol := 4*math.Sqrt(p*(1-p)/float64(R)) + 1e-12
		if math.Abs(got-p) > tol {
			t.Errorf("%s: unit %s drawn with frequency %.4f, π = %.4f (tol %.4f)", name, id, got, p, tol)
		}
	}
}
