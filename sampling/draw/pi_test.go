package draw

import (
	"math"
	"testing"

	"github.com/quorate-eeg/quorate/sampling/design"
)

const monteCarloDraws = 10000

var regionSpec = []StratumSpec{{Column: "region"}}

// Hand allocations below: shares by the textbook rules (Cochran 1977 §5.3
// proportional, §5.5 Neyman n_h = n N_h S_h/Σ N_h S_h), rounded by largest
// remainders. Strata in label order: frontal (N 8, N' 5), occipital
// (N 5, N' 4), temporal-left (N 12, N' 6); N' for a cap of 2.
var piCases = []struct {
	name  string
	alloc Allocation
	cap   int
	nh    map[string]int
}{
	// 9/3 = 3 each.
	{"equal", Allocation{Method: Equal, N: 9}, 0, nh(3, 3, 3)},
	// 10·(8,5,12)/25 = 3.2, 2.0, 4.8 → 3, 2, 5.
	{"proportional", Allocation{Method: Proportional, N: 10}, 0, nh(3, 2, 5)},
	// N_h S_h = 8·3, 5·2, 12·1 = 24, 10, 12; 10·(24,10,12)/46 = 5.217,
	// 2.174, 2.609 → 5, 2, 3.
	{"neyman", Allocation{Method: Neyman, N: 10, SD: map[string]float64{
		"region=frontal": 3, "region=occipital": 2, "region=temporal-left": 1}}, 0, nh(5, 2, 3)},
	// occipital taken whole: π = 1.
	{"table", Allocation{Method: Table, Table: map[string]int{
		"region=frontal": 4, "region=occipital": 5, "region=temporal-left": 2}}, 0, nh(4, 5, 2)},
	{"equal-cap", Allocation{Method: Equal, N: 9}, 2, nh(3, 3, 3)},
	// 8·(5,4,6)/15 = 2.667, 2.133, 3.2 → 3, 2, 3.
	{"proportional-cap", Allocation{Method: Proportional, N: 8}, 2, nh(3, 2, 3)},
	// N'_h S_h = 15, 8, 6; 8·(15,8,6)/29 = 4.138, 2.207, 1.655 → 4, 2, 2.
	{"neyman-cap", Allocation{Method: Neyman, N: 8, SD: map[string]float64{
		"region=frontal": 3, "region=occipital": 2, "region=temporal-left": 1}}, 2, nh(4, 2, 2)},
	{"table-cap", Allocation{Method: Table, Table: map[string]int{
		"region=frontal": 2, "region=occipital": 2, "region=temporal-left": 2}}, 2, nh(2, 2, 2)},
}

func nh(frontal, occipital, temporal int) map[string]int {
	return map[string]int{"frontal": frontal, "occipital": occipital, "temporal-left": temporal}
}

func TestInclusionProbabilitiesMonteCarlo(t *testing.T) {
	f := fixture()
	for _, c := range piCases {
		want := expectedPi(f, c.cap, c.nh)
		count := map[string]int{}
		for r := 0; r < monteCarloDraws; r++ {
			res, err := Draw(f, Design{Strata: regionSpec, Alloc: c.alloc, Cap: c.cap, Seed: uint64(r)})
			if err != nil {
				t.Fatalf("%s: %v", c.name, err)
			}
			for _, u := range res.Drawn {
				count[u.EventID]++
				if r == 0 && math.Abs(u.Pi-want[u.EventID]) > 1e-12 {
					t.Errorf("%s: unit %s reports π = %v, design gives %v", c.name, u.EventID, u.Pi, want[u.EventID])
				}
			}
		}
		checkFrequencies(t, c.name, count, monteCarloDraws, want)
	}
}

func TestTopUpInclusionProbabilities(t *testing.T) {
	f := fixture()
	cases := []struct {
		name   string
		cap    int
		n1, n2 int
		nh     map[string]int // union allocation
	}{
		// phase 1: 6·(8,5,12)/25 = 1.92, 1.2, 2.88 → 2, 1, 3; top-up of 4 on
		// room (6,4,9) with weights N_h: 4·(8,5,12)/25 = 1.28, 0.8, 1.92 →
		// 1, 1, 2; union 3, 2, 5.
		{"topup", 0, 6, 4, nh(3, 2, 5)},
		// cap 2: phase 1 5·(5,4,6)/15 = 1.667, 1.333, 2 → 2, 1, 2; top-up 3:
		// 3·(5,4,6)/15 = 1, 0.8, 1.2 → 1, 1, 1; union 3, 2, 3.
		{"topup-cap", 2, 5, 3, nh(3, 2, 3)},
	}
	for _, c := range cases {
		want := expectedPi(f, c.cap, c.nh)
		count := map[string]int{}
		for r := 0; r < monteCarloDraws; r++ {
			d := Design{Strata: regionSpec, Alloc: Allocation{Method: Proportional, N: c.n1}, Cap: c.cap, Seed: uint64(r)}
			first, err := Draw(f, d)
			if err != nil {
				t.Fatal(err)
			}
			res, err := TopUp(f, d, first.Drawn, c.n2, uint64(r)+1<<32)
			if err != nil {
				t.Fatalf("%s: %v", c.name, err)
			}
			if len(res.Drawn) != c.n1+c.n2 {
				t.Fatalf("%s: union of %d units, want %d", c.name, len(res.Drawn), c.n1+c.n2)
			}
			phase := map[int]int{}
			for _, u := range res.Drawn {
				count[u.EventID]++
				phase[u.Phase]++
				if math.Abs(u.Pi-want[u.EventID]) > 1e-12 {
					t.Fatalf("%s: unit %s reports π = %v, design gives %v", c.name, u.EventID, u.Pi, want[u.EventID])
				}
			}
			if phase[1] != c.n1 || phase[2] != c.n2 {
				t.Fatalf("%s: phases %v", c.name, phase)
			}
		}
		checkFrequencies(t, c.name, count, monteCarloDraws, want)
	}
}

// TestHorvitzThompsonUnbiased: E[Σ y/π] = Y for any design with π > 0
// (Horvitz & Thompson 1952). The mean of R estimates must lie within 4
// standard errors of the true total.
func TestHorvitzThompsonUnbiased(t *testing.T) {
	f := fixture()
	score := f.Num["score"]
	byID := map[string]float64{}
	truth := 0.0
	for i, id := range f.ID {
		byID[id] = score[i]
		truth += score[i]
	}
	for _, c := range piCases {
		var sum, sum2 float64
		for r := 0; r < monteCarloDraws; r++ {
			res, err := Draw(f, Design{Strata: regionSpec, Alloc: c.alloc, Cap: c.cap, Seed: uint64(r) + 99})
			if err != nil {
				t.Fatal(err)
			}
			var y, pi []float64
			for _, u := range res.Drawn {
				y, pi = append(y, byID[u.EventID]), append(pi, u.Pi)
			}
			tot, err := design.HTTotal(y, pi)
			if err != nil {
				t.Fatal(err)
			}
			sum += tot
			sum2 += tot * tot
		}
		R := float64(monteCarloDraws)
		mean := sum / R
		se := math.Sqrt((sum2/R - mean*mean) / R)
		if math.Abs(mean-truth) > 4*se+1e-9 {
			t.Errorf("%s: mean HT total %.3f, true %.3f (SE %.3f)", c.name, mean, truth, se)
		}
	}
}
