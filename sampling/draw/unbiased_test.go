package draw

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"
)

// simFrame is a 480-candidate population in 4 score quartiles × 2 lobes
// with 12 subjects, whose IEDs (truth) concentrate in the high-score
// quartiles, and an auto_count that tracks them, as in a real archive.
func simFrame() (*Frame, []bool) {
	rng := rand.New(rand.NewPCG(15, 1))
	f := &Frame{Num: map[string][]float64{"score": nil, "auto_count": nil}, Cat: map[string][]string{"lobe": nil}}
	var truth []bool
	for i := range 480 {
		s := rng.Float64()
		t := rng.Float64() < 0.02+0.5*s*s*s
		ac := float64(rng.IntN(4))
		if t && rng.Float64() < 0.7 {
			ac = float64(4 + rng.IntN(3))
		}
		f.ID = append(f.ID, fmt.Sprintf("e%03d", i))
		f.Subject = append(f.Subject, fmt.Sprintf("S%02d", rng.IntN(12)))
		f.Num["score"] = append(f.Num["score"], s)
		f.Num["auto_count"] = append(f.Num["auto_count"], ac)
		f.Cat["lobe"] = append(f.Cat["lobe"], []string{"temporal", "frontal"}[rng.IntN(2)])
		truth = append(truth, t)
	}
	return f, truth
}

// htTotal is Σ w_i y_i over the candidates drawn (Horvitz & Thompson 1952).
func htTotal(d []Drawn, y map[string]float64) float64 {
	t := 0.0
	for _, u := range d {
		t += u.Weight * y[u.EventID]
	}
	return t
}

// checkUnbiased asserts that the mean of R totals lies within 2 standard
// errors (SD/√R) of the census total.
func checkUnbiased(t *testing.T, name string, totals []float64, census float64) {
	t.Helper()
	R := float64(len(totals))
	var m, ss float64
	for _, v := range totals {
		m += v
	}
	m /= R
	for _, v := range totals {
		ss += (v - m) * (v - m)
	}
	se := math.Sqrt(ss/(R-1)) / math.Sqrt(R)
	if math.Abs(m-census) > 2*se {
		t.Errorf("%s: mean HT total %.2f over %v draws, census %.2f, 2 SE = %.2f", name, m, R, census, 2*se)
	}
}

func TestHTUnbiasedEveryAllocationAndAdaptive(t *testing.T) {
	// Horvitz & Thompson (1952): Σ y/π is unbiased for the census total
	// whenever every π_i > 0; the Monte Carlo mean over R = 1,000 draws must
	// lie within 2 SE of it (about 1 in 20 chance of a false alarm per
	// check under a correct design; the seeds are fixed, so the outcome is
	// reproducible).
	f, truth := simFrame()
	y := map[string]float64{}
	census := 0.0
	for i, id := range f.ID {
		if truth[i] {
			y[id], census = 1, census+1
		}
	}
	specs, _ := ParseStrata("score:q4,lobe")
	const R = 1000
	for _, a := range []Allocation{
		{Method: Equal, N: 60},
		{Method: Proportional, N: 60},
		{Method: Neyman, N: 60, SDColumn: "auto_count"},
		{Method: Accuracy, N: 60},
	} {
		totals := make([]float64, R)
		for r := range totals {
			res, err := Draw(f, Design{Strata: specs, Alloc: a, Seed: uint64(r + 1)})
			if err != nil {
				t.Fatal(err)
			}
			totals[r] = htTotal(res.Drawn, y)
		}
		checkUnbiased(t, a.Method.String(), totals, census)
	}

	// Adaptive two-phase: phase 1 equal allocation of 40 under a subject
	// cap, phase 2 of 40 allocated from the phase-1 verdict share in each
	// stratum (TopUpAdaptive's conditional weights).
	d := Design{Strata: specs, Alloc: Allocation{Method: Equal, N: 40}, Cap: 8}
	totals := make([]float64, R)
	for r := range totals {
		d.Seed = uint64(r + 1)
		p1, err := Draw(f, d)
		if err != nil {
			t.Fatal(err)
		}
		res, err := TopUpAdaptive(f, d, p1.Drawn, 40, d.Seed+7, phaseEstimates(p1.Drawn, y))
		if err != nil {
			t.Fatal(err)
		}
		totals[r] = htTotal(res.Drawn, y)
	}
	checkUnbiased(t, "adaptive two-phase", totals, census)
}

// phaseEstimates plays the panel: per stratum, the share of drawn events
// that are IEDs, and a disagreement share of half that.
func phaseEstimates(d []Drawn, y map[string]float64) map[string]PhaseEstimate {
	k, m := map[string]float64{}, map[string]int{}
	for _, u := range d {
		k[u.Stratum] += y[u.EventID]
		m[u.Stratum]++
	}
	est := map[string]PhaseEstimate{}
	for h, n := range m {
		p := k[h] / float64(n)
		est[h] = PhaseEstimate{Prevalence: p, Disagreement: p / 2, Rated: n}
	}
	return est
}

func TestAdaptiveWeightsCountTheStratum(t *testing.T) {
	// Without a cap, T = λT₁ + (1−λ)T₂ applied to y ≡ 1 gives λN + (1−λ)N:
	// the weights of every stratum add up to N_h exactly, and none is below
	// 1 (TopUpAdaptive's limit on n2_h).
	f, truth := simFrame()
	y := map[string]float64{}
	for i, id := range f.ID {
		if truth[i] {
			y[id] = 1
		}
	}
	specs, _ := ParseStrata("score:q4,lobe")
	d := Design{Strata: specs, Alloc: Allocation{Method: Proportional, N: 40}, Seed: 9}
	p1, err := Draw(f, d)
	if err != nil {
		t.Fatal(err)
	}
	res, err := TopUpAdaptive(f, d, p1.Drawn, 60, 10, phaseEstimates(p1.Drawn, y))
	if err != nil {
		t.Fatal(err)
	}
	sum := map[string]float64{}
	for _, u := range res.Drawn {
		sum[u.Stratum] += u.Weight
		if u.Weight < 1 || math.Abs(u.Pi*u.Weight-1) > 1e-12 {
			t.Errorf("%s: weight %v, pi %v", u.EventID, u.Weight, u.Pi)
		}
	}
	for _, s := range res.Strata {
		if math.Abs(sum[s.Label]-float64(s.N)) > 1e-9 {
			t.Errorf("stratum %s: weights add to %v, N_h = %d", s.Label, sum[s.Label], s.N)
		}
	}
	if len(res.Phase.Allocation) == 0 || len(res.Phase.Baseline) == 0 || res.Phase.Phase != 2 {
		t.Errorf("phase record incomplete: %+v", res.Phase)
	}
}
