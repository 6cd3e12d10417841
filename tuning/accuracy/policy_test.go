package accuracy

import (
	"errors"
	"math"
	"strings"
	"testing"

	"gonum.org/v1/gonum/stat/distuv"
)

func TestParsePolicy(t *testing.T) {
	for _, c := range []struct {
		in   string
		want Policy
	}{
		{"", Policy{MinSpecificity, 0.95}},
		{"youden", Policy{Youden, 0}},
		{" Youden ", Policy{Youden, 0}},
		{"min-specificity=0.95", Policy{MinSpecificity, 0.95}},
		{"min-sensitivity=0.9", Policy{MinSensitivity, 0.9}},
		{"max-false-per-hour=2", Policy{MaxFalsePerHour, 2}},
		{"cost-ratio=3", Policy{CostRatio, 3}},
	} {
		got, err := ParsePolicy(c.in)
		if err != nil || got != c.want {
			t.Errorf("ParsePolicy(%q) = %v, %v; want %v", c.in, got, err, c.want)
		}
		if c.in != "" && c.want.Kind != Youden {
			if back, _ := ParsePolicy(got.String()); back != got {
				t.Errorf("round trip of %v gave %v", got, back)
			}
		}
	}
	for _, c := range []struct{ in, expect string }{
		{"max-specificity=0.9", "one of"},
		{"youden=1", "without a value"},
		{"min-specificity", "min-specificity=<number>"},
		{"min-specificity=high", "finite number"},
		{"min-specificity=1.5", "between 0 and 1"},
		{"max-false-per-hour=-1", "non-negative"},
		{"cost-ratio=0", "positive cost ratio"},
		{"cost-ratio=NaN", "finite number"},
	} {
		_, err := ParsePolicy(c.in)
		var pe *policyError
		if !errors.As(err, &pe) || pe.Input != c.in || !strings.Contains(pe.Expect, c.expect) {
			t.Errorf("ParsePolicy(%q) error %v; want policyError expecting %q", c.in, err, c.expect)
		}
		if err != nil && !strings.Contains(err.Error(), c.in) {
			t.Errorf("error %q does not name the input", err)
		}
	}
}

// hand-made curve, thresholds ascending; hours = 10.
var handPoints = []Point{
	{Threshold: 1, Sens: 0.98, Spec: 0.50, FalsePerHour: 9, Prevalence: 0.2},
	{Threshold: 2, Sens: 0.90, Spec: 0.80, FalsePerHour: 4, Prevalence: 0.2},
	{Threshold: 3, Sens: 0.90, Spec: 0.90, FalsePerHour: 2, Prevalence: 0.2},
	{Threshold: 4, Sens: 0.80, Spec: 0.96, FalsePerHour: 0.8, Prevalence: 0.2},
	{Threshold: 5, Sens: 0.80, Spec: 0.96, FalsePerHour: 0.8, Prevalence: 0.2},
	{Threshold: 6, Sens: 0.40, Spec: 0.99, FalsePerHour: 0.2, Prevalence: 0.2},
}

func TestChooseHand(t *testing.T) {
	for _, c := range []struct {
		p    Policy
		want int
	}{
		// Spec ≥ 0.95: points 3,4,5; best sens 0.8 at 3 and 4, same spec,
		// higher threshold wins → 4.
		{Policy{MinSpecificity, 0.95}, 4},
		// Sens ≥ 0.9: points 0,1,2; best spec 0.9 → 2.
		{Policy{MinSensitivity, 0.9}, 2},
		// ≤ 2 false/h: points 2..5; best sens 0.9 → 2.
		{Policy{MaxFalsePerHour, 2}, 2},
		// J: 0.48, 0.70, 0.80, 0.76, 0.76, 0.39 → 2.
		{Policy{Youden, 0}, 2},
		// cost r=3, π=0.2: 0.6·0.02+0.8·0.5 = 0.412, 0.22, 0.14, 0.152,
		// 0.152, 0.368 → 2.
		{Policy{CostRatio, 3}, 2},
		// r=0.5: 0.402, 0.17, 0.09, 0.052, 0.052, 0.068 → tie 3/4, same
		// sens, higher threshold → 4.
		{Policy{CostRatio, 0.5}, 4},
	} {
		got, err := Choose(handPoints, c.p)
		if err != nil || got != c.want {
			t.Errorf("Choose(%v) = %d, %v; want %d", c.p, got, err, c.want)
		}
	}
}

func TestChooseNoPoint(t *testing.T) {
	_, err := Choose(handPoints, Policy{MinSpecificity, 0.995})
	var npe *NoPointError
	if !errors.As(err, &npe) {
		t.Fatalf("want NoPointError, got %v", err)
	}
	// Shortfalls 0.005 (5), 0.035 (3), 0.035 (4): stable order.
	if want := []int{5, 3, 4}; len(npe.Index) != 3 || npe.Index[0] != want[0] || npe.Index[1] != want[1] || npe.Index[2] != want[2] {
		t.Errorf("closest = %v, want %v", npe.Index, want)
	}
	if msg := err.Error(); !strings.Contains(msg, "min-specificity=0.995") || !strings.Contains(msg, "closest") {
		t.Errorf("message %q lacks policy or closest points", msg)
	}
	if _, err := Choose(nil, Policy{Youden, 0}); !errors.As(err, &npe) {
		t.Errorf("empty points: got %v", err)
	}
}

// binormalPoints returns the operating points of an equal-variance binormal
// model, negatives N(0,1) and positives N(d,1), on a threshold grid.
func binormalPoints(d, prev, step float64) []Point {
	var pts []Point
	for t := -4.0; t <= 4+d; t += step {
		pts = append(pts, Point{
			Threshold:  t,
			Sens:       1 - distuv.UnitNormal.CDF(t-d),
			Spec:       distuv.UnitNormal.CDF(t),
			Prevalence: prev,
		})
	}
	return pts
}

func TestChooseBinormalClosedForm(t *testing.T) {
	const d, prev, step = 1.5, 0.2, 0.001
	pts := binormalPoints(d, prev, step)
	// Youden's J of the equal-variance binormal model peaks where the
	// densities cross, t = d/2 (Schisterman et al. 2005, Epidemiology
	// 16:73–81).
	i, _ := Choose(pts, Policy{Youden, 0})
	if got := pts[i].Threshold; math.Abs(got-d/2) > step {
		t.Errorf("Youden threshold %v, want %v", got, d/2)
	}
	// Expected cost is least where the likelihood ratio φ(t−d)/φ(t) equals
	// (1−π)/(π·r) (Metz 1978, Seminars in Nuclear Medicine 8:283–298), so
	// t* = d/2 + ln((1−π)/(π·r))/d.
	for _, r := range []float64{1, 3, 10} {
		i, _ := Choose(pts, Policy{CostRatio, r})
		want := d/2 + math.Log((1-prev)/(prev*r))/d
		if got := pts[i].Threshold; math.Abs(got-want) > step {
			t.Errorf("cost-ratio=%v threshold %v, want %v", r, got, want)
		}
	}
	// Spec ≥ 0.95 with sensitivity rising as t falls: the lowest t with
	// Φ(t) ≥ 0.95, t = z_{0.95} = 1.6449 (Abramowitz & Stegun 1964,
	// Table 26.5).
	i, _ = Choose(pts, Policy{MinSpecificity, 0.95})
	if got := pts[i].Threshold; math.Abs(got-1.6448536) > step {
		t.Errorf("min-specificity threshold %v, want 1.6449", got)
	}
}
