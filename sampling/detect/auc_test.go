package detect

import (
	"math"
	"sort"

	"github.com/quorate-eeg/quorate/sampling/candidate"
	"github.com/quorate-eeg/quorate/sampling/synth"
	"gonum.org/v1/gonum/integrate"
	"gonum.org/v1/gonum/stat"
)

// auc is the area under the empirical ROC curve of scores x for classes y,
// from gonum's stat.ROC integrated by the trapezoidal rule, which for an
// empirical ROC equals the Mann–Whitney probability P(X₁ > X₀) + ½P(X₁ =
// X₀) (Hanley & McNeil 1982, Radiology 143:29–36).
func auc(x []float64, y []bool) float64 {
	idx := make([]int, len(x))
	for i := range idx {
		idx[i] = i
	}
	sort.Slice(idx, func(a, b int) bool { return x[idx[a]] < x[idx[b]] })
	xs := make([]float64, len(x))
	ys := make([]bool, len(x))
	for k, i := range idx {
		xs[k], ys[k] = x[i], y[i]
	}
	tpr, fpr, _ := stat.ROC(nil, xs, ys, nil)
	return integrate.Trapezoidal(fpr, tpr)
}

// match returns, for each truth event, the index of the row nearest its
// onset within tol seconds, or −1.
func match(rows []candidate.Row, truth []synth.Event, tol float64) []int {
	out := make([]int, len(truth))
	for k, ev := range truth {
		out[k] = -1
		i := sort.Search(len(rows), func(i int) bool { return rows[i].OnsetS >= ev.Onset-tol })
		for ; i < len(rows) && rows[i].OnsetS <= ev.Onset+tol; i++ {
			if out[k] < 0 || math.Abs(rows[i].OnsetS-ev.Onset) < math.Abs(rows[out[k]].OnsetS-ev.Onset) {
				out[k] = i
			}
		}
	}
	return out
}
