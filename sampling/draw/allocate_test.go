package draw

import (
	"errors"
	"math"
	"strings"
	"testing"
)

func TestNeymanMatchesTextbookFormula(t *testing.T) {
	// Caribou strata (Siniff & Skoog 1964, as tabulated in Lohr 2010 ch. 3
	// — from memory): N_h and s²_h. Cochran (1977) §5.5, eq. 5.26:
	// n_h = n N_h S_h / Σ N_h S_h, evaluated with numpy in
	// ../design/testdata/caribou.py.
	N := []int{400, 30, 61, 18, 70, 120}
	s2 := []float64{5575, 4064, 347556, 22798, 123578, 9795}
	labels := []string{"A", "B", "C", "D", "E", "F"}
	w := make([]float64, 6)
	for h := range w {
		w[h] = float64(N[h]) * math.Sqrt(s2[h])
	}
	cases := []struct {
		n     int
		exact []float64 // formula, from caribou.py
		want  []int
		warn  string
	}{
		// floors 27 1 33 2 23 11 (97); the 3 largest fractions A .928,
		// B .788, C .627 get one unit each.
		{100, []float64{27.927510182, 1.788330963, 33.627301814, 2.541386224, 23.010095057, 11.105375760},
			[]int{28, 2, 34, 2, 23, 11}, ""},
		// 67.25 > N_C = 61: C is taken whole and 139 re-shared by the same
		// formula over the others: 58.487 3.745 5.322 48.189 23.257 →
		// floors 58 3 5 48 23 (137), B .745 and A .487 get the 2 left.
		{200, []float64{58.486757679, 3.745184551, 61, 5.322258922, 48.188536858, 23.257261989},
			[]int{59, 4, 61, 5, 48, 23}, "C"},
	}
	for _, c := range cases {
		got, warns, err := Allocate(labels, N, w, c.n, 0)
		if err != nil {
			t.Fatal(err)
		}
		for h := range c.want {
			if got[h] != c.want[h] {
				t.Errorf("n=%d: n_%s = %d, want %d (formula %.3f)", c.n, labels[h], got[h], c.want[h], c.exact[h])
			}
		}
		if c.warn == "" && len(warns) > 0 || c.warn != "" && (len(warns) != 1 || warns[0].Stratum != c.warn) {
			t.Errorf("n=%d: warnings %v, want one for %q", c.n, warns, c.warn)
		}
	}
}

func TestLargestRemainder(t *testing.T) {
	// Hamilton's method by hand: quotas 7·(50,30,20)/100 = 3.5, 2.1, 1.4 →
	// floors 3, 2, 1; the unit left goes to the largest fraction (.5).
	got, _, err := Allocate([]string{"a", "b", "c"}, []int{50, 30, 20}, []float64{50, 30, 20}, 7, 0)
	if err != nil || got[0] != 4 || got[1] != 2 || got[2] != 1 {
		t.Errorf("got %v, %v; want [4 2 1]", got, err)
	}
	// Equal split of 10 in 3 ties every fraction (1/3): lowest index first.
	got, _, _ = Allocate([]string{"a", "b", "c"}, []int{50, 30, 20}, []float64{1, 1, 1}, 10, 0)
	if got[0] != 4 || got[1] != 3 || got[2] != 3 {
		t.Errorf("equal split %v, want [4 3 3]", got)
	}
}

func TestTakeAllRedistributes(t *testing.T) {
	// Equal 30 over sizes (2, 100, 100): 10 > 2, so the small stratum is
	// taken whole (warning) and 28 are re-split 14/14.
	got, warns, err := Allocate([]string{"small", "b", "c"}, []int{2, 100, 100}, []float64{1, 1, 1}, 30, 0)
	if err != nil {
		t.Fatal(err)
	}
	if got[0] != 2 || got[1] != 14 || got[2] != 14 {
		t.Errorf("got %v, want [2 14 14]", got)
	}
	if len(warns) != 1 || warns[0].Stratum != "small" {
		t.Errorf("warnings %v, want one for stratum small", warns)
	}
	// Minimum per stratum: proportional 20 over (1000, 10, 10) would give
	// 19.6, 0.2, 0.2; a minimum of 3 fixes the small strata at 3 and leaves
	// 14 for the large one.
	got, _, err = Allocate([]string{"a", "b", "c"}, []int{1000, 10, 10}, []float64{1000, 10, 10}, 20, 3)
	if err != nil || got[0] != 14 || got[1] != 3 || got[2] != 3 {
		t.Errorf("minimum: got %v, %v; want [14 3 3]", got, err)
	}
}

func TestTableTakeAllWarns(t *testing.T) {
	f := fixture()
	res, err := Draw(f, Design{Strata: regionSpec, Alloc: Allocation{Method: Table, Table: map[string]int{
		"region=frontal": 2, "region=occipital": 7, "region=temporal-left": 2}}})
	if err != nil {
		t.Fatal(err)
	}
	// occipital holds 5 < 7: taken whole; the surplus 2 goes to the others
	// in proportion to their table entries (1 each).
	want := map[string]int{"region=frontal": 3, "region=occipital": 5, "region=temporal-left": 3}
	for _, s := range res.Strata {
		if s.Sample != want[s.Label] {
			t.Errorf("%s: n_h = %d, want %d", s.Label, s.Sample, want[s.Label])
		}
	}
	if len(res.Warnings) != 1 || res.Warnings[0].Stratum != "region=occipital" {
		t.Errorf("warnings %v", res.Warnings)
	}
}

func TestSizeErrors(t *testing.T) {
	f := fixture()
	_, err := Draw(f, Design{Strata: regionSpec, Alloc: Allocation{Method: Equal, N: 26}})
	var se *sizeError
	if !errors.As(err, &se) || se.N != 26 || se.Available != 25 {
		t.Errorf("n > population: %v", err)
	}
	// cap 1 leaves 3 + 2 + 3 = 8 units (one per subject and stratum).
	_, err = Draw(f, Design{Strata: regionSpec, Alloc: Allocation{Method: Equal, N: 9}, Cap: 1})
	if !errors.As(err, &se) || se.Available != 8 || se.Cap != 1 || !strings.Contains(err.Error(), "cap") {
		t.Errorf("impossible cap: %v", err)
	}
	if _, err := Draw(f, Design{Strata: regionSpec, Alloc: Allocation{Method: Equal, N: 8}, Cap: 1}); err != nil {
		t.Errorf("n = Σ N'_h refused: %v", err)
	}
	_, err = Draw(f, Design{Strata: regionSpec, Alloc: Allocation{Method: Table, Table: map[string]int{"region=frontal": 1}}})
	var ae *allocationError
	if !errors.As(err, &ae) {
		t.Errorf("incomplete table: %v", err)
	}
}

func TestStratumSDPilot(t *testing.T) {
	// Sample SD (divisor n−1) of {2,4,4,4,5,5,7,9} is √(32/7) (closed form:
	// mean 5, Σ(x−5)² = 32); a lone value has no SD.
	col := []float64{2, 4, 4, 4, 5, 5, 7, 9, 1, math.NaN()}
	row := []int{0, 0, 0, 0, 0, 0, 0, 0, 1, 1}
	sd := stratumSD(col, row, 2)
	if math.Abs(sd[0]-math.Sqrt(32.0/7)) > 1e-14 || sd[1] != 0 {
		t.Errorf("sd = %v", sd)
	}
}
