package draw

import (
	"fmt"
	"math"
	"sort"
)

// Method names an allocation rule.
type Method int

const (
	// Equal gives every stratum the same share.
	Equal Method = iota
	// Proportional gives shares ∝ N_h (Cochran 1977, §5.3).
	Proportional
	// Neyman gives shares ∝ N_h S_h, minimising v(ȳ_st) for a fixed n
	// (Cochran 1977, §5.5, eq. 5.26: n_h = n N_h S_h / Σ N_h S_h).
	Neyman
	// Table takes n_h from an explicit per-stratum table.
	Table
	// Accuracy oversamples strata likely to hold IEDs: the compromise
	// Neyman allocation for sensitivity and specificity from a prior
	// prevalence per stratum (AccuracyWeights), at least 2 per stratum.
	Accuracy
)

func (m Method) String() string {
	switch m {
	case Equal:
		return "equal"
	case Proportional:
		return "proportional"
	case Neyman:
		return "neyman"
	case Table:
		return "table"
	case Accuracy:
		return "accuracy"
	}
	return fmt.Sprintf("Method(%d)", int(m))
}

// Allocation says how many units each stratum contributes.
type Allocation struct {
	Method Method
	N      int // total sample size; for Table, 0 means Σ Table
	Min    int // minimum per stratum (a smaller stratum is taken whole)

	// Neyman: S_h is SD[label] when given, else the sample standard
	// deviation (divisor N_h−1) of the numeric column SDColumn within
	// the stratum, used as a pilot.
	SD       map[string]float64
	SDColumn string

	Table map[string]int // Table: n_h by stratum label

	// Accuracy: prior prevalence p_h by stratum label; strata without one
	// take the share of rows with PriorColumn ≥ PriorAt (defaults
	// auto_count and 4; see priorOf).
	Prior       map[string]float64
	PriorColumn string
	PriorAt     float64
}

// floor is the fewest units per stratum the method asks for.
func (a Allocation) floor() int {
	if a.Method == Accuracy {
		return max(a.Min, accuracyFloor)
	}
	return a.Min
}

// Allocate splits n among strata of the given sizes in proportion to
// weight, so that every stratum gets at least min(min, N_h) and at most N_h.
//
// Shares are found iteratively: a stratum whose share R·w_h/Σw falls below
// its minimum is fixed at the minimum; then, if none did, one whose share
// exceeds N_h is taken whole (warning); fixed strata leave the pool and the rest of n is shared
// again among the others by the same rule, until no share is out of range.
// If all remaining weights are zero the remaining strata share in
// proportion to N_h. Fractional shares are then rounded by the largest
// remainder method (Hamilton's method): each stratum gets ⌊share⌋ and the
// units left over go one each to the largest fractional parts, ties to the
// lower stratum index, so the n_h add up to n exactly.
func Allocate(labels []string, size []int, weight []float64, n, min int) ([]int, []Warning, error) {
	H := len(size)
	if len(weight) != H || len(labels) != H {
		return nil, nil, &allocationError{Msg: "labels, sizes and weights differ in length"}
	}
	total, minTotal := 0, 0
	for h := range size {
		total += size[h]
		minTotal += minInt(min, size[h])
		if w := weight[h]; w < 0 || math.IsNaN(w) || math.IsInf(w, 0) {
			return nil, nil, &allocationError{Stratum: labels[h], Msg: fmt.Sprintf("invalid weight %v", w)}
		}
	}
	if n < 0 {
		return nil, nil, &allocationError{Msg: fmt.Sprintf("negative sample size %d", n)}
	}
	if n > total {
		return nil, nil, &sizeError{N: n, Available: total, Population: total}
	}
	if minTotal > n {
		return nil, nil, &allocationError{Msg: fmt.Sprintf("minimum %d per stratum needs %d units, more than n=%d", min, minTotal, n)}
	}
	var warns []Warning
	alloc := make([]int, H)
	fixed := make([]bool, H)
	for h := range size {
		if size[h] == 0 {
			fixed[h] = true
		} else if min > size[h] {
			alloc[h], fixed[h] = size[h], true
			warns = append(warns, Warning{Stratum: labels[h], Msg: fmt.Sprintf("stratum of %d is smaller than the minimum %d: taken whole", size[h], min)})
		}
	}
	share := make([]float64, H)
	for {
		rest := n
		W := 0.0
		free := 0
		for h := range size {
			if fixed[h] {
				rest -= alloc[h]
			} else {
				W += weight[h]
				free++
			}
		}
		if free == 0 {
			break
		}
		w := weight
		if W == 0 {
			w = make([]float64, H)
			for h := range size {
				w[h] = float64(size[h])
				if !fixed[h] {
					W += w[h]
				}
			}
		}
		// Minimums are fixed before any stratum is taken whole: taking a
		// stratum whole first could leave less than the minimums need.
		changed := false
		for h := range size {
			if fixed[h] {
				continue
			}
			share[h] = float64(rest) * w[h] / W
			if share[h] < float64(min) {
				alloc[h], fixed[h], changed = min, true, true
			}
		}
		if !changed {
			for h := range size {
				if !fixed[h] && share[h] > float64(size[h]) {
					alloc[h], fixed[h], changed = size[h], true, true
					warns = append(warns, Warning{Stratum: labels[h], Msg: fmt.Sprintf("stratum of %d is smaller than its allocation %.4g: taken whole, surplus redistributed", size[h], share[h])})
				}
			}
		}
		if !changed {
			largestRemainder(alloc, share, fixed, rest)
			break
		}
	}
	return alloc, warns, nil
}

func largestRemainder(alloc []int, share []float64, fixed []bool, rest int) {
	type rem struct {
		h int
		r float64
	}
	var rs []rem
	for h := range alloc {
		if fixed[h] {
			continue
		}
		fl := math.Floor(share[h])
		if share[h]-fl > 1-1e-9 { // share an integer up to rounding error
			fl++
		}
		alloc[h] = int(fl)
		rest -= alloc[h]
		rs = append(rs, rem{h, share[h] - fl})
	}
	sort.SliceStable(rs, func(i, j int) bool { return rs[i].r > rs[j].r })
	for i := 0; i < rest && i < len(rs); i++ {
		alloc[rs[i].h]++
	}
}

func minInt(a, b int) int {
	if a < b {
		return a
	}
	return b
}

// weights returns the allocation weight of every stratum and the total n.
// size is N'_h (after any cap); sd holds S_h for Neyman.
func (a Allocation) weights(labels []string, size []int, sd func(h int) (float64, error), prior func() ([]float64, error)) ([]float64, int, error) {
	w := make([]float64, len(size))
	n := a.N
	switch a.Method {
	case Equal:
		for h := range w {
			w[h] = 1
		}
	case Proportional:
		for h := range w {
			w[h] = float64(size[h])
		}
	case Neyman:
		for h := range w {
			s, err := sd(h)
			if err != nil {
				return nil, 0, err
			}
			w[h] = float64(size[h]) * s
		}
	case Accuracy:
		p, err := prior()
		if err != nil {
			return nil, 0, err
		}
		w, err := AccuracyWeights(size, p)
		return w, n, err
	case Table:
		sum := 0
		known := make(map[string]bool, len(labels))
		var missing []string
		for h, l := range labels {
			known[l] = true
			v, ok := a.Table[l]
			if !ok {
				missing = append(missing, l)
				continue
			}
			if v < 0 {
				return nil, 0, &allocationError{Stratum: l, Msg: fmt.Sprintf("negative table entry %d", v)}
			}
			w[h] = float64(v)
			sum += v
		}
		if len(missing) > 0 {
			return nil, 0, &allocationError{Msg: fmt.Sprintf("table has no entry for strata %q", missing)}
		}
		for l := range a.Table {
			if !known[l] {
				return nil, 0, &allocationError{Stratum: l, Msg: fmt.Sprintf("table names a stratum not in the frame (strata: %q)", labels)}
			}
		}
		if n == 0 {
			n = sum
		}
	default:
		return nil, 0, &allocationError{Msg: fmt.Sprintf("unknown method %v", a.Method)}
	}
	return w, n, nil
}
