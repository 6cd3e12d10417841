package tuning

import (
	"math"
	"testing"
)

// Copying every event within its own subject adds no information: with subjects
// as clusters (Obuchowski 1997, Biometrics 53:567, eq. for S10, S01, S11) the
// interval is unchanged, where the independent-events DeLong (1988) interval
// would narrow by about √2. The check is a property of the estimator.
func TestAUCIntervalIgnoresCopiesWithinSubject(t *testing.T) {
	x := []float64{0.9, 0.8, 0.35, 0.7, 0.2, 0.6, 0.4, 0.3, 0.75, 0.1, 0.55, 0.5}
	tr := []bool{true, true, false, true, false, true, false, false, true, false, false, true}
	subj := []string{"a", "a", "a", "b", "b", "b", "c", "c", "c", "d", "d", "d"}
	one := aucEstimate(x, tr, subj, 0.95)
	x2 := append(append([]float64{}, x...), x...)
	t2 := append(append([]bool{}, tr...), tr...)
	s2 := append(append([]string{}, subj...), subj...)
	two := aucEstimate(x2, t2, s2, 0.95)
	if math.Abs(one.Value-two.Value) > 1e-12 || math.Abs(one.Lo-two.Lo) > 1e-9 || math.Abs(one.Hi-two.Hi) > 1e-9 {
		t.Errorf("copies within subjects changed the estimate: %+v → %+v", one, two)
	}
}
