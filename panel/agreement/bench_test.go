package agreement

import (
	"math/rand/v2"
	"testing"
)

// BenchmarkAgreementBootstrap is the merge workload: 7 raters × 2,000 items
// from 100 subjects, 6 IFCN criteria + overall, 4 coefficients each,
// 2,000 subject-level replicates. Target: well under 5 s per op.
func BenchmarkAgreementBootstrap(b *testing.B) {
	const items, raters, subjects, tables = 2000, 7, 100, 7
	rng := rand.New(rand.NewPCG(1, 2))
	clusters := make([]int, items)
	for i := range clusters {
		clusters[i] = i * subjects / items
	}
	counts := make([]*Counts, tables)
	for k := range counts {
		rows := make([][]int, items)
		for i := range rows {
			rows[i] = make([]int, raters)
			p := 0.2 + 0.6*float64(clusters[i]%5)/4
			for r := range rows[i] {
				switch {
				case rng.Float64() < 0.1:
					rows[i][r] = Missing
				case rng.Float64() < p:
					rows[i][r] = 1
				}
			}
		}
		tab, _ := NewTable(rows, 2)
		counts[k] = tab.Counts()
	}
	stats := []Statistic{
		(*Totals).ObservedAgreement, (*Totals).FleissKappa,
		(*Totals).GwetAC1, (*Totals).KrippendorffAlphaNominal,
	}
	for b.Loop() {
		for _, c := range counts {
			if _, err := Bootstrap(c, clusters, stats, 2000, 9, 0.95); err != nil {
				b.Fatal(err)
			}
		}
	}
}
