package accuracy

import (
	"math/bits"
	"strconv"
	"strings"
)

// MaxCriteria is the largest number of per-event criteria SubsetRules
// accepts: the six IFCN criteria for an interictal epileptiform discharge
// (Kane et al. 2017, Clinical Neurophysiology Practice 2:170–185).
const MaxCriteria = 6

// KSweep returns the confusion counts of the rules "at least k criteria
// present" for k = 1..n, result[k−1], where criteria[i][j] reports
// criterion j for event i and every row has the same length n. Event i
// carries weights[i] (nil counts each event once).
//
// Because the rules are nested (an event meeting k+1 criteria meets k),
// sensitivity never rises and specificity never falls as k grows. KSweep
// panics on ragged rows, mismatched lengths or negative weights, and
// returns nil for no events.
func KSweep(criteria [][]bool, truth []bool, weights []float64) []Confusion {
	n := checkCriteria(criteria, truth, weights, -1)
	if len(criteria) == 0 {
		return nil
	}
	// pos[c], neg[c]: weight of events with exactly c criteria present.
	pos := make([]float64, n+1)
	neg := make([]float64, n+1)
	for i, row := range criteria {
		c := 0
		for _, b := range row {
			if b {
				c++
			}
		}
		w := 1.0
		if weights != nil {
			w = weights[i]
		}
		if truth[i] {
			pos[c] += w
		} else {
			neg[c] += w
		}
	}
	out := make([]Confusion, n)
	var tp, fp float64 // weight with ≥ k present, built from k = n down
	var totPos, totNeg float64
	for c := range pos {
		totPos += pos[c]
		totNeg += neg[c]
	}
	for k := n; k >= 1; k-- {
		tp += pos[k]
		fp += neg[k]
		out[k-1] = Confusion{TP: tp, FP: fp, FN: Remainder(totPos, tp), TN: Remainder(totNeg, fp)}
	}
	return out
}

// Rule is a criterion rule evaluated by SubsetRules.
type Rule struct {
	// Name is "c1+c4+c6 all" for "all of these present" or
	// "≥4 incl. c1,c6" for "at least K criteria, these among them".
	Name string
	// Subset has bit j set when criterion j+1 is required.
	Subset uint8
	// K is the minimum number of criteria present; for an "all" rule it is
	// the size of Subset.
	K int
	Confusion
}

// SubsetRules evaluates, for every non-empty subset S of the n ≤ 6
// criteria, the rule "all of S present" and the rules "at least k of the n
// present, S among them" for k = |S|+1..n (k = |S| is the "all" rule).
// Rules are ordered by subset bitmask, each "all" rule followed by its
// "≥k" rules in increasing k. Arguments are as for KSweep; it panics when
// n exceeds MaxCriteria.
//
// Events are first pooled by their pattern of criteria (at most 64), so the
// cost is one pass over the events plus 64 per rule.
func SubsetRules(criteria [][]bool, truth []bool, weights []float64) []Rule {
	n := checkCriteria(criteria, truth, weights, MaxCriteria)
	if len(criteria) == 0 || n == 0 {
		return nil
	}
	var pos, neg [1 << MaxCriteria]float64
	for i, row := range criteria {
		var m uint8
		for j, b := range row {
			if b {
				m |= 1 << j
			}
		}
		w := 1.0
		if weights != nil {
			w = weights[i]
		}
		if truth[i] {
			pos[m] += w
		} else {
			neg[m] += w
		}
	}
	patterns := 1 << n
	var rules []Rule
	for s := 1; s < patterns; s++ {
		size := bits.OnesCount8(uint8(s))
		for k := size; k <= n; k++ {
			var c Confusion
			for m := 0; m < patterns; m++ {
				hit := m&s == s && bits.OnesCount8(uint8(m)) >= k
				c.add(hit, true, pos[m])
				c.add(hit, false, neg[m])
			}
			rules = append(rules, Rule{Name: ruleName(uint8(s), k, size), Subset: uint8(s), K: k, Confusion: c})
		}
	}
	return rules
}

func ruleName(s uint8, k, size int) string {
	var names []string
	for j := range MaxCriteria {
		if s&(1<<j) != 0 {
			names = append(names, "c"+strconv.Itoa(j+1))
		}
	}
	if k == size {
		return strings.Join(names, "+") + " all"
	}
	return "≥" + strconv.Itoa(k) + " incl. " + strings.Join(names, ",")
}

// checkCriteria validates the inputs of KSweep and SubsetRules and returns
// the number of criteria per event. maxN < 0 means no limit.
func checkCriteria(criteria [][]bool, truth []bool, weights []float64, maxN int) int {
	if len(criteria) != len(truth) {
		panic("accuracy: criteria and truth length mismatch")
	}
	checkWeights(weights, len(truth))
	if len(criteria) == 0 {
		return 0
	}
	n := len(criteria[0])
	for _, row := range criteria {
		if len(row) != n {
			panic("accuracy: criteria rows differ in length")
		}
	}
	if maxN >= 0 && n > maxN {
		panic("accuracy: too many criteria for subset rules")
	}
	return n
}
