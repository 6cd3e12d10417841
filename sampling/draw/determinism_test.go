package draw

import (
	"encoding/json"
	"math/rand/v2"
	"testing"
)

func permuted(f *Frame, seed uint64) *Frame {
	p := rand.New(rand.NewPCG(seed, 1)).Perm(f.Len())
	g := &Frame{Num: map[string][]float64{}, Cat: map[string][]string{}}
	for _, i := range p {
		g.ID = append(g.ID, f.ID[i])
		g.Subject = append(g.Subject, f.Subject[i])
		g.Recording = append(g.Recording, f.Recording[i])
		for k, c := range f.Num {
			g.Num[k] = append(g.Num[k], c[i])
		}
		for k, c := range f.Cat {
			g.Cat[k] = append(g.Cat[k], c[i])
		}
	}
	return g
}

func TestDeterministicWhateverRowOrder(t *testing.T) {
	f := fixture()
	d := Design{Strata: []StratumSpec{{Column: "score", Bins: 2}, {Column: "region"}},
		Alloc: Allocation{Method: Neyman, N: 9, SDColumn: "score"}, Cap: 2, Seed: 42}
	a, err := Draw(f, d)
	if err != nil {
		t.Fatal(err)
	}
	ja, _ := json.Marshal(a)
	for s := uint64(0); s < 5; s++ {
		b, err := Draw(permuted(f, s), d)
		if err != nil {
			t.Fatal(err)
		}
		if jb, _ := json.Marshal(b); string(ja) != string(jb) {
			t.Fatalf("permutation %d changes the draw:\n%s\n%s", s, ja, jb)
		}
	}
	d.Seed = 43
	c, _ := Draw(f, d)
	if jc, _ := json.Marshal(c); string(jc) == string(ja) {
		t.Error("another seed gives the same draw")
	}
	for i, u := range a.Drawn {
		if u.Order != i+1 {
			t.Errorf("row %d has order %d", i, u.Order)
		}
	}
}

func TestTopUpRejectsChangedStrata(t *testing.T) {
	f := fixture()
	d := Design{Strata: regionSpec, Alloc: Allocation{Method: Proportional, N: 5}, Seed: 1}
	first, err := Draw(f, d)
	if err != nil {
		t.Fatal(err)
	}
	prev := append([]Drawn(nil), first.Drawn...)
	prev[0].Stratum = "region=elsewhere"
	if _, err := TopUp(f, d, prev, 2, 2); err == nil {
		t.Error("changed stratum accepted")
	} else if pe, ok := err.(*phaseError); !ok || pe.EventID != prev[0].EventID {
		t.Errorf("error %v, want *phaseError for %s", err, prev[0].EventID)
	}
	d2 := d
	d2.Strata = []StratumSpec{{Column: "score", Bins: 2}}
	if _, err := TopUp(f, d2, first.Drawn, 2, 2); err == nil {
		t.Error("different strata spec accepted")
	}
}
