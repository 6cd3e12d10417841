package accuracy

import (
	"math/rand/v2"
	"testing"
)

func benchScores(n int) ([]float64, []bool) {
	rng := rand.New(rand.NewPCG(11, 12))
	s := make([]float64, n)
	tr := make([]bool, n)
	for i := range s {
		tr[i] = rng.Float64() < 0.3
		s[i] = rng.NormFloat64()
		if tr[i] {
			s[i] += 1
		}
	}
	return s, tr
}

func BenchmarkDeLong20000(b *testing.B) {
	s, tr := benchScores(20000)
	for b.Loop() {
		DeLong(s, tr)
	}
}

func BenchmarkROC20000(b *testing.B) {
	s, tr := benchScores(20000)
	for b.Loop() {
		ROC(s, tr, nil)
	}
}

func BenchmarkKSweep20000(b *testing.B) {
	crit, truth, w := randomCriteria(rand.New(rand.NewPCG(13, 14)), 20000, 6)
	for b.Loop() {
		KSweep(crit, truth, w)
	}
}

func BenchmarkSubsetRules20000(b *testing.B) {
	crit, truth, w := randomCriteria(rand.New(rand.NewPCG(13, 14)), 20000, 6)
	for b.Loop() {
		SubsetRules(crit, truth, w)
	}
}

func BenchmarkCounts20000(b *testing.B) {
	s, tr := benchScores(20000)
	for b.Loop() {
		Counts(s, tr, nil)
	}
}
