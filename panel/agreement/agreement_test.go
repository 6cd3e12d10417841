package agreement

import (
	"errors"
	"math"
	"math/rand/v2"
	"testing"
)

func TestNewTableErrors(t *testing.T) {
	_, err := NewTable([][]int{{0, 1}, {1, 2}}, 2)
	var ce *cellError
	if !errors.As(err, &ce) || ce.Item != 1 || ce.Rater != 1 || ce.Value != 2 {
		t.Errorf("out-of-range cell: got %v", err)
	}
	_, err = NewTable([][]int{{0, 1}, {1}}, 2)
	var se *shapeError
	if !errors.As(err, &se) || se.Item != 1 || se.Got != 1 || se.Want != 2 {
		t.Errorf("ragged row: got %v", err)
	}
	if _, err := NewTable([][]int{{0, Missing}}, 2); err != nil {
		t.Errorf("Missing rejected: %v", err)
	}
}

func TestWeightsRepeatItems(t *testing.T) {
	// Integer weights must equal repeating items: the property the cluster
	// bootstrap relies on (Davison & Hinkley 1997, §2.3: a bootstrap sample
	// is the data reweighted by multinomial counts).
	tab, _ := NewTable(krippendorff2011, 5)
	w := []float64{2, 0, 1, 3, 1, 2, 1, 1, 0, 2, 1, 1}
	var rows [][]int
	for i, r := range krippendorff2011 {
		for range int(w[i]) {
			rows = append(rows, r)
		}
	}
	rep, _ := NewTable(rows, 5)
	c, cr := tab.Counts(), rep.Counts()
	for _, f := range []struct {
		name string
		fn   func(*Counts, []float64) float64
	}{
		{"ObservedAgreement", ObservedAgreement},
		{"FleissKappa", FleissKappa},
		{"GwetAC1", GwetAC1},
		{"KrippendorffAlphaNominal", KrippendorffAlphaNominal},
	} {
		near(t, f.name, f.fn(c, w), f.fn(cr, nil), 1e-12)
	}
}

func TestSkipsItemsWithOneRating(t *testing.T) {
	// Items with fewer than two answers carry no pair and must not change
	// p_a or alpha (Krippendorff 2011, section C: unpairable values are
	// ignored).
	base := [][]int{{0, 0, 1}, {1, 1, 1}, {0, 1, 0}, {1, 1, Missing}}
	more := append(append([][]int{}, base...), []int{Missing, Missing, Missing}, []int{Missing, 1, Missing})
	a, _ := NewTable(base, 2)
	b, _ := NewTable(more, 2)
	near(t, "ObservedAgreement", ObservedAgreement(b.Counts(), nil), ObservedAgreement(a.Counts(), nil), 1e-15)
	near(t, "Alpha", KrippendorffAlphaNominal(b.Counts(), nil), KrippendorffAlphaNominal(a.Counts(), nil), 1e-15)
	// Hand count for base: P = 1/3, 1, 1/3, 1 → p_a = 2/3.
	near(t, "ObservedAgreement hand", ObservedAgreement(a.Counts(), nil), 2.0/3, 1e-15)
}

func TestRaterVsOthers(t *testing.T) {
	// Hand-worked: rater 0 against the majority of raters 1–3.
	tab, _ := NewTable([][]int{
		{1, 1, 1, 0},             // others 2:1 present, rater present → TP
		{0, 1, 1, Missing},       // others 2:0 present, rater absent → FN
		{0, 0, 0, 1},             // others 1:2 absent, rater absent → TN
		{1, 0, 0, 0},             // others absent, rater present → FP
		{1, 1, 0, Missing},       // others tie 1:1 → skipped
		{Missing, 1, 1, 1},       // rater missing → skipped
		{0, Missing, Missing, 0}, // others 0:1 absent, rater absent → TN
	}, 2)
	sens, spec, n := RaterVsOthers(tab, 0)
	if n != 5 {
		t.Errorf("n = %d, want 5", n)
	}
	near(t, "sens", sens, 0.5, 0)
	near(t, "spec", spec, 2.0/3, 1e-15)
}

func TestIntraRater(t *testing.T) {
	// The 2×2 table {{20,5},{10,15}} as first/second sittings: p_o = 0.7,
	// κ = 0.4 (closed form, see TestCohenPublished).
	a, b := expand([][]float64{{20, 5}, {10, 15}})
	a = append(a, Missing)
	b = append(b, 1)
	po, k, n := IntraRater(a, b)
	if n != 50 {
		t.Errorf("n = %d, want 50", n)
	}
	near(t, "po", po, 0.7, 1e-15)
	near(t, "kappa", k, 0.4, 1e-12)
}

// clusteredTable builds subjects whose items are exact copies of one random
// binary row, the extreme of within-subject correlation.
func clusteredTable(subjects, perSubject, raters int, seed uint64) (Table, []int) {
	rng := rand.New(rand.NewPCG(seed, 1))
	var rows [][]int
	var clusters []int
	for s := range subjects {
		row := make([]int, raters)
		p := rng.Float64()
		for r := range row {
			if rng.Float64() < p {
				row[r] = 1
			}
		}
		for range perSubject {
			rows = append(rows, row)
			clusters = append(clusters, s)
		}
	}
	tab, _ := NewTable(rows, 2)
	return tab, clusters
}

func TestBootstrapClusters(t *testing.T) {
	const subjects, per = 60, 10
	tab, clusters := clusteredTable(subjects, per, 5, 7)
	c := tab.Counts()
	items := make([]int, len(clusters))
	for i := range items {
		items[i] = i
	}
	stats := []Statistic{(*Totals).ObservedAgreement}
	bySubject, err := Bootstrap(c, clusters, stats, 2000, 11, 0.95)
	if err != nil {
		t.Fatal(err)
	}
	byItem, _ := Bootstrap(c, items, stats, 2000, 11, 0.95)
	ws := bySubject[0].Hi - bySubject[0].Lo
	wi := byItem[0].Hi - byItem[0].Lo
	// Identical items within a subject: the design effect is `per`, so the
	// subject interval should be about √10 ≈ 3.2 times wider (Kish 1965,
	// Survey Sampling, §5.4, deff = 1 + (m−1)ρ with ρ = 1).
	if r := ws / wi; r < 2.5 || r > 4 {
		t.Errorf("subject/item width ratio = %.2f, want ≈ √%d", r, per)
	}
	// Closed form: observed agreement is the mean of the subjects' P_c, so
	// the 95% percentile interval is ≈ ±1.96·sd(P_c)·√((C−1)/C)/√C.
	var mean, ss float64
	ps := make([]float64, subjects)
	for s := range subjects {
		row := c.Row(s * per)
		n := float64(row[0] + row[1])
		ps[s] = (float64(row[0]*(row[0]-1)) + float64(row[1]*(row[1]-1))) / (n * (n - 1))
		mean += ps[s] / subjects
	}
	for _, p := range ps {
		ss += (p - mean) * (p - mean)
	}
	want := 2 * 1.96 * math.Sqrt(ss/subjects) / math.Sqrt(subjects)
	if math.Abs(ws-want)/want > 0.12 {
		t.Errorf("subject interval width = %.4f, closed form ≈ %.4f", ws, want)
	}
}

func TestBootstrapDeterministic(t *testing.T) {
	tab, clusters := clusteredTable(30, 4, 7, 3)
	c := tab.Counts()
	stats := []Statistic{(*Totals).FleissKappa, (*Totals).GwetAC1, (*Totals).KrippendorffAlphaNominal}
	a, _ := Bootstrap(c, clusters, stats, 500, 42, 0.9)
	b, _ := Bootstrap(c, clusters, stats, 500, 42, 0.9)
	d, _ := Bootstrap(c, clusters, stats, 500, 43, 0.9)
	for s := range a {
		if a[s] != b[s] {
			t.Errorf("stat %d: same seed gave %v and %v", s, a[s], b[s])
		}
	}
	if a[0] == d[0] && a[1] == d[1] && a[2] == d[2] {
		t.Errorf("different seeds gave identical intervals %v", a)
	}
	// BootstrapTable draws the same subjects for the same seed.
	it, err := BootstrapTable(tab, clusters, func(t Table) float64 { return FleissKappa(t.Counts(), nil) }, 500, 42, 0.9)
	if err != nil {
		t.Fatal(err)
	}
	near(t, "BootstrapTable Lo", it.Lo, a[0].Lo, 1e-12)
	near(t, "BootstrapTable Hi", it.Hi, a[0].Hi, 1e-12)
	// Point estimate lies inside its interval.
	k := FleissKappa(c, nil)
	if k < a[0].Lo || k > a[0].Hi {
		t.Errorf("kappa %.3f outside %v", k, a[0])
	}
}

func TestBootstrapErrors(t *testing.T) {
	tab, clusters := clusteredTable(3, 2, 3, 1)
	c := tab.Counts()
	var ae *argError
	if _, err := Bootstrap(c, clusters[:2], nil, 10, 1, 0.95); !errors.As(err, &ae) || ae.Arg != "clusters" {
		t.Errorf("short clusters: %v", err)
	}
	bad := append([]int{}, clusters...)
	bad[4] = -1
	if _, err := Bootstrap(c, bad, nil, 10, 1, 0.95); !errors.As(err, &ae) || ae.Index != 4 {
		t.Errorf("negative cluster: %v", err)
	}
	if _, err := Bootstrap(c, clusters, nil, 0, 1, 0.95); !errors.As(err, &ae) || ae.Arg != "reps" {
		t.Errorf("reps 0: %v", err)
	}
	if _, err := Bootstrap(c, clusters, nil, 10, 1, 1); !errors.As(err, &ae) || ae.Arg != "level" {
		t.Errorf("level 1: %v", err)
	}
}
