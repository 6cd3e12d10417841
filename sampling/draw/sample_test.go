package draw

import (
	"math"
	"testing"

	"github.com/quorate-eeg/quorate/sampling/design"
)

// Without a cap the draw is stratified simple random sampling, so the
// weighted total of Result.Sample must equal N·ȳ_st with variance
// N²·v(ȳ_st) (Cochran 1977, §5.3), computed by design.StratMean from N_h.
func TestResultSampleIsStratifiedSRS(t *testing.T) {
	f := fixture()
	res, err := Draw(f, Design{Strata: regionSpec, Alloc: Allocation{Method: Proportional, N: 10}, Seed: 5})
	if err != nil {
		t.Fatal(err)
	}
	score := map[string]float64{}
	for i, id := range f.ID {
		score[id] = f.Num["score"][i]
	}
	var y []float64
	var stratum []string
	for _, u := range res.Drawn {
		y = append(y, score[u.EventID])
		stratum = append(stratum, u.Stratum)
	}
	Nh := map[string]float64{}
	for _, s := range res.Strata {
		Nh[s.Label] = float64(s.N)
	}
	tot, err := design.Total(res.Sample(), y)
	if err != nil {
		t.Fatal(err)
	}
	m, err := design.StratMean(Nh, stratum, y)
	if err != nil {
		t.Fatal(err)
	}
	const N = 25
	if math.Abs(tot.Value-N*m.Value) > 1e-9 || math.Abs(tot.Var-N*N*m.Var) > 1e-9*tot.Var {
		t.Errorf("Total %+v, N·StratMean %v (var %v)", tot, N*m.Value, N*N*m.Var)
	}
}
