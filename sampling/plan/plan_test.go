package plan

import (
	"context"
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"github.com/quorate-eeg/quorate/sampling/design"
	"github.com/quorate-eeg/quorate/sampling/draw"
)

func TestMajorityErrorCondorcet(t *testing.T) {
	// Three independent voters each right with probability 0.8: the majority
	// is right with probability 0.8³ + 3·0.8²·0.2 = 0.896 (Condorcet's jury
	// theorem, the usual worked example — arithmetic by hand).
	if e := MajorityError(0.8, 3); math.Abs(e-0.104) > 1e-12 {
		t.Errorf("MajorityError(0.8, 3) = %v, want 0.104", e)
	}
	// Two raters: a tie (one right, one wrong, 2·0.8·0.2) counts half.
	if e := MajorityError(0.8, 2); math.Abs(e-(0.04+0.16)) > 1e-12 {
		t.Errorf("MajorityError(0.8, 2) = %v, want 0.2", e)
	}
}

func TestRaterAccuracyClosedForm(t *testing.T) {
	// At prevalence ½ chance agreement is ½ and κ = (2a−1)²: κ = 0.36 ↔ a = 0.8
	// (Cohen 1960's kappa written out for the symmetric two-class model).
	if a := RaterAccuracy(0.36, 0.5); math.Abs(a-0.8) > 1e-9 {
		t.Errorf("RaterAccuracy(0.36, 0.5) = %v, want 0.8", a)
	}
}

// population is 600 candidates in score quartiles with IEDs concentrated
// at high scores, and a rule of sensitivity 0.8 and specificity 0.9.
func population() (*draw.Frame, []bool, []bool) {
	rng := rand.New(rand.NewPCG(7, 7))
	f := &draw.Frame{Num: map[string][]float64{"score": nil, "auto_count": nil}}
	var truth, pred []bool
	for i := range 600 {
		s := rng.Float64()
		tr := rng.Float64() < 0.03+0.45*s*s
		p := rng.Float64() < 0.1
		if tr {
			p = rng.Float64() < 0.8
		}
		f.ID = append(f.ID, fmt.Sprintf("e%03d", i))
		f.Subject = append(f.Subject, fmt.Sprint(i)) // one event per subject: deff 1
		f.Num["score"] = append(f.Num["score"], s)
		f.Num["auto_count"] = append(f.Num["auto_count"], math.Floor(6*s))
		truth, pred = append(truth, tr), append(pred, p)
	}
	return f, truth, pred
}

func TestPredictedHalfWidthWithin20PercentOfAchieved(t *testing.T) {
	f, truth, pred := population()
	specs, _ := draw.ParseStrata("score:q4")
	st, err := draw.Stratify(f, specs)
	if err != nil {
		t.Fatal(err)
	}
	// true stratum prevalences as the plan's prior; true Se and Sp
	k, m := make([]float64, len(st.Labels)), make([]float64, len(st.Labels))
	var tp, pos, tn, neg float64
	for i, h := range st.Row {
		m[h]++
		if truth[i] {
			k[h]++
			pos++
			if pred[i] {
				tp++
			}
		} else {
			neg++
			if !pred[i] {
				tn++
			}
		}
	}
	prior := map[string]float64{}
	for h, l := range st.Labels {
		prior[l] = k[h] / m[h]
	}
	alloc := draw.Allocation{Method: draw.Accuracy, Prior: prior}
	d := draw.Design{Strata: specs, Alloc: alloc}
	sp, err := draw.PlanStrata(f, d)
	if err != nil {
		t.Fatal(err)
	}
	const n = 150
	rows, err := Run(context.Background(), Options{Strata: sp, Alloc: alloc, Sizes: []int{n},
		Sens: tp / pos, Spec: tn / neg, DesignEffect: 1, Kappa: 1})
	if err != nil || len(rows) != 1 {
		t.Fatal(rows, err)
	}
	// Achieved: 1.96 × the SD of the design-weighted estimates over 400
	// draws (Cochran 1977, §6.11 is the prediction; the simulation is the
	// reference).
	idx := map[string]int{}
	for i, id := range f.ID {
		idx[id] = i
	}
	var se, spc []float64
	d.Alloc.N = n
	for r := range 400 {
		d.Seed = uint64(r + 1)
		res, err := draw.Draw(f, d)
		if err != nil {
			t.Fatal(err)
		}
		var s design.Sample
		var pr, tr []bool
		for _, u := range res.Drawn {
			s.Stratum, s.Weight = append(s.Stratum, u.Stratum), append(s.Weight, u.Weight)
			pr, tr = append(pr, pred[idx[u.EventID]]), append(tr, truth[idx[u.EventID]])
		}
		a, err1 := design.Sensitivity(s, pr, tr)
		b, err2 := design.Specificity(s, pr, tr)
		if err1 != nil || err2 != nil {
			t.Fatal(err1, err2)
		}
		se, spc = append(se, a.Value), append(spc, b.Value)
	}
	for _, c := range []struct {
		name      string
		est       []float64
		predicted float64
	}{{"sensitivity", se, rows[0].SensHalfWidth}, {"specificity", spc, rows[0].SpecHalfWidth}} {
		achieved := 1.959964 * sd(c.est)
		t.Logf("%s: predicted ±%.4f, achieved ±%.4f", c.name, c.predicted, achieved)
		if r := c.predicted / achieved; r < 0.8 || r > 1.2 {
			t.Errorf("%s: predicted half-width %.4f, achieved %.4f (ratio %.2f)", c.name, c.predicted, achieved, r)
		}
	}
	// The accuracy allocation predicts a narrower sensitivity interval than
	// proportional allocation at the same n (it minimises that variance).
	prop, _ := Run(context.Background(), Options{Strata: sp, Alloc: draw.Allocation{Method: draw.Proportional}, Sizes: []int{n},
		Sens: tp / pos, Spec: tn / neg, DesignEffect: 1, Kappa: 1})
	t.Logf("sensitivity: accuracy ±%.4f (%.1f IEDs), proportional ±%.4f (%.1f IEDs)", rows[0].SensHalfWidth, rows[0].Positives, prop[0].SensHalfWidth, prop[0].Positives)
	if !(rows[0].SensHalfWidth < prop[0].SensHalfWidth) {
		t.Errorf("accuracy ±%.3f not narrower than proportional ±%.3f", rows[0].SensHalfWidth, prop[0].SensHalfWidth)
	}
}

func sd(v []float64) float64 {
	var m, ss float64
	for _, x := range v {
		m += x
	}
	m /= float64(len(v))
	for _, x := range v {
		ss += (x - m) * (x - m)
	}
	return math.Sqrt(ss / float64(len(v)-1))
}
