package tuning

import (
	"cmp"
	"fmt"
	"math"
	"math/bits"
	"slices"

	"github.com/quorate-eeg/quorate/tuning/accuracy"
)

// SubsetRule is one criterion-subset rule of accuracy.SubsetRules on the
// panel's majority criteria.
type SubsetRule struct {
	Point
	Subset uint8   // bit j set: criterion j+1 required
	K      int     // at least K criteria present
	Youden float64 // design-weighted J, the ranking key
}

// CrossValidated is a selection procedure repeated inside subject-grouped
// k-fold cross-validation: on each fold's training subjects the procedure
// picks its rule, which then decides the held-out events. Metrics are those
// of the pooled held-out decisions, so each event is judged by a rule that
// was chosen without it. The intervals treat the pooled decisions as fixed
// and so leave out the variability of the selection itself.
type CrossValidated struct {
	Folds     int
	FoldRules []string // the rule each fold's training events chose
	Metrics
}

// Subsets is analysis (b): every "all of these criteria present" rule and
// every "at least k, these among them" rule, ranked by design-weighted
// Youden's J (ties by name).
type Subsets struct {
	Rules   []SubsetRule // ranked, best first
	Top     []SubsetTop  // the five best, measured in full
	Warning string       // the multiple-comparisons caution
	// CV repeats "take the rule of highest J" inside cross-validation;
	// nil when there are too few subjects for folds.
	CV *CrossValidated
}

// SubsetTop is one of the best-ranked rules with its full metrics and how
// many cross-validation folds picked it.
type SubsetTop struct {
	Name        string
	Subset      uint8
	K           int
	TimesChosen int
	Metrics
}

func maskOf(row []bool) uint8 {
	var m uint8
	for j, b := range row {
		if b {
			m |= 1 << j
		}
	}
	return m
}

func (r SubsetRule) hits(mask uint8) bool {
	return mask&r.Subset == r.Subset && bits.OnesCount8(mask) >= r.K
}

// rankSubsets evaluates and ranks all subset rules on the events at idx (nil:
// all).
func rankSubsets(s *evset, crit [][]bool) []SubsetRule {
	plain := accuracy.SubsetRules(crit, s.truth, nil)
	wt := accuracy.SubsetRules(crit, s.truth, s.weight)
	fp := candidateFP(s, crit)
	out := make([]SubsetRule, len(plain))
	for i, r := range plain {
		out[i] = SubsetRule{
			Point:  Point{Rule: r.Name, Threshold: float64(r.K), Counts: r.Confusion, Weighted: wt[i].Confusion, FalsePerHour: falsePerHour(fp(r), s.hours)},
			Subset: r.Subset, K: r.K, Youden: wt[i].Youden(),
		}
	}
	slices.SortStableFunc(out, func(a, b SubsetRule) int {
		ja, jb := a.Youden, b.Youden
		if math.IsNaN(ja) {
			ja = math.Inf(-1)
		}
		if math.IsNaN(jb) {
			jb = math.Inf(-1)
		}
		if c := cmp.Compare(jb, ja); c != 0 {
			return c
		}
		return cmp.Compare(a.Rule, b.Rule)
	})
	return out
}

// candidateFP returns, for a rule, the design-weighted reference-negative
// candidates it calls positive, from pattern totals.
func candidateFP(s *evset, crit [][]bool) func(accuracy.Rule) float64 {
	var byMask [1 << 6]float64
	for i, row := range crit {
		if !s.truth[i] && s.candidate[i] {
			byMask[maskOf(row)] += s.weight[i]
		}
	}
	return func(r accuracy.Rule) float64 {
		sr := SubsetRule{Subset: r.Subset, K: r.K}
		var t float64
		for m, w := range byMask {
			if sr.hits(uint8(m)) {
				t += w
			}
		}
		return t
	}
}

func subsetAnalysis(s *evset, folds [][]int, level float64) Subsets {
	crit := majorityCriteria(s)
	ranked := rankSubsets(s, crit)
	all := 0
	for _, r := range ranked {
		if bits.OnesCount8(r.Subset) == r.K {
			all++
		}
	}
	sub := Subsets{
		Rules: ranked,
		Warning: fmt.Sprintf("%d rules (%d \"all of these\" and %d \"at least k including these\") were compared on the same events; "+
			"the best of many looks better here than it will on new recordings (multiple comparisons). "+
			"Trust the cross-validated figures, not the in-sample ranking.", len(ranked), all, len(ranked)-all),
	}
	masks := make([]uint8, s.n())
	for i, row := range crit {
		masks[i] = maskOf(row)
	}
	hit := make([]bool, s.n())
	for _, r := range ranked[:min(5, len(ranked))] {
		for i, m := range masks {
			hit[i] = r.hits(m)
		}
		sub.Top = append(sub.Top, SubsetTop{Name: r.Rule, Subset: r.Subset, K: r.K, Metrics: measure(s, hit, level)})
	}
	if folds == nil {
		return sub
	}
	cv := &CrossValidated{Folds: len(folds)}
	held := make([]bool, s.n())
	for _, test := range folds {
		train := complement(test, s.n())
		ts := s.subset(train)
		best := rankSubsets(ts, pick(crit, train))[0]
		cv.FoldRules = append(cv.FoldRules, best.Rule)
		for _, i := range test {
			held[i] = best.hits(masks[i])
		}
		for t := range sub.Top {
			if sub.Top[t].Name == best.Rule {
				sub.Top[t].TimesChosen++
			}
		}
	}
	cv.Metrics = measure(s, held, level)
	sub.CV = cv
	return sub
}

// complement returns the indices 0…n−1 not in the ascending list idx.
func complement(idx []int, n int) []int {
	out := make([]int, 0, n-len(idx))
	j := 0
	for i := range n {
		if j < len(idx) && idx[j] == i {
			j++
			continue
		}
		out = append(out, i)
	}
	return out
}

func pick[T any](v []T, idx []int) []T {
	out := make([]T, len(idx))
	for k, i := range idx {
		out[k] = v[i]
	}
	return out
}
