package tuning

import (
	"errors"
	"fmt"
	"math"
	"slices"
	"sort"
	"strconv"
	"strings"

	"github.com/quorate-eeg/quorate/sampling/candidate"
	"github.com/quorate-eeg/quorate/tuning/accuracy"
)

// Cutoff is one criterion's automatic decision: met when the feature is at
// or above Value (Direction +1) or at or below it (Direction −1). Direction 0
// means the criterion is left out (a constant or unmeasured feature) and
// never counts.
type Cutoff struct {
	Criterion int
	Feature   string
	Direction int
	Value     float64
}

func (c Cutoff) String() string {
	switch c.Direction {
	case 1:
		return c.Feature + " ≥ " + formatCut(c.Value)
	case -1:
		return c.Feature + " ≤ " + formatCut(c.Value)
	}
	return c.Feature + " left out"
}

// AutoCandidate is the best "at least K criteria met at these cutoffs" rule
// the search found for one K.
type AutoCandidate struct {
	K       int
	Cutoffs [6]Cutoff
	Score   Cutoff // the detector score's vote; Direction 0 when the method has none
	Point
}

// AutoRule is analysis (c), second part: the automatic rule "at least k of
// the six criteria met at these cutoffs" against the reference standard,
// with the cutoffs and k chosen jointly under the study's policy.
//
// Search: each feature (turned so that higher means present, by the
// direction of its criterion ROC) gets a grid of candidate cutoffs, the
// 5th, 10th, …, 95th percentiles of its measured values plus its Youden
// cutoff for the criterion. For each k = 1…6 a coordinate ascent starts
// from the per-criterion Youden cutoffs and, criterion by criterion, moves
// that criterion's cutoff to the grid value the policy prefers with the
// others held (accuracy.Choose; while no grid value satisfies the policy it
// moves to the nearest one), until a pass changes nothing (at most 8
// passes). One step costs one pass over the events for all grid values at
// once: an event whose other criteria already reach k is a hit whatever the
// cutoff, one short of k is a hit exactly when its feature clears the
// cutoff, and the rest are misses. The policy then picks k among the six
// results (ties to the larger k). Rates are design-weighted.
type AutoRule struct {
	Method  string          // one of the Method constants
	ByK     []AutoCandidate // K = 1…6, or 1…7 when the score votes
	Chosen  int             // index into ByK
	K       int
	Cutoffs [6]Cutoff
	Score   Cutoff // the detector score's vote (MethodScoreVote); Direction 0 otherwise
}

// votes is the number of slots of an automatic rule: the six criteria and,
// in slot scoreSlot, the detector score.
const (
	votes     = 7
	scoreSlot = 6
)

// value is slot j of event e: criterion j's feature, or the score.
func value(e *Event, j int) float64 {
	if j == scoreSlot {
		return e.Score
	}
	return e.Features[j]
}

// slotName is the column name of slot j.
func slotName(j int) string {
	if j == scoreSlot {
		return "score"
	}
	return candidate.FeatureNames[j]
}

// slotLabel is how messages name slot j: "c1"…"c6" or "score".
func slotLabel(j int) string {
	if j == scoreSlot {
		return "score"
	}
	return "c" + strconv.Itoa(j+1)
}

// autoFit is a fitted automatic rule in direction-adjusted units.
type autoFit struct {
	k      int
	slots  int // 6, or 7 when the score votes; k runs 1…slots
	dir    [votes]float64
	cut    [votes]float64
	active [votes]bool
	byK    [votes]struct {
		g     [6]int
		cut   [votes]float64
		point accuracy.Point
		w     accuracy.Confusion
		fp    float64
	}
	grid [6][]float64
}

// met reports whether event e meets the fitted rule with cutoffs cut at k.
func (f *autoFit) hits(e *Event, cut *[votes]float64, k int) bool {
	n := 0
	for j := range votes {
		if f.active[j] && f.dir[j]*value(e, j) >= cut[j] {
			n++
		}
	}
	return n >= k
}

func (f *autoFit) cutoffs(cut [votes]float64) [6]Cutoff {
	var out [6]Cutoff
	for j := range 6 {
		out[j] = f.slot(cut, j)
	}
	return out
}

// slot is slot j's cutoff; the score's has Criterion 0.
func (f *autoFit) slot(cut [votes]float64, j int) Cutoff {
	c := Cutoff{Criterion: j + 1, Feature: slotName(j), Value: math.NaN()}
	if j == scoreSlot {
		c.Criterion = 0
	}
	if f.active[j] {
		c.Direction = int(f.dir[j])
		c.Value = f.dir[j] * cut[j]
	}
	return c
}

func (f *autoFit) name(cut [votes]float64, k int) string {
	var parts []string
	for j := range votes {
		if c := f.slot(cut, j); c.Direction != 0 {
			parts = append(parts, c.String())
		}
	}
	return "at least " + strconv.Itoa(k) + " of: " + strings.Join(parts, "; ")
}

// fitAuto runs the joint search on s. A policy no rule satisfies still
// returns the nearest rule, with the *accuracy.NoPointError.
func fitAuto(s *evset, p accuracy.Policy) (*autoFit, []string, error) {
	f := &autoFit{slots: 6}
	var warn []string
	n := s.n()
	var level [6][]uint8
	var start [6]int
	for j := range 6 {
		cf := fitCriterion(s, j, false)
		var xs []float64
		dir := 1.0
		if cf.ok {
			dir = cf.dir
		}
		for _, e := range s.src {
			if v := e.Features[j]; !math.IsNaN(v) {
				xs = append(xs, dir*v)
			}
		}
		slices.Sort(xs)
		if len(xs) == 0 || xs[0] == xs[len(xs)-1] {
			warn = append(warn, fmt.Sprintf("c%d: %s is constant or unmeasured; left out of the automatic rule", j+1, candidate.FeatureNames[j]))
			continue
		}
		f.active[j], f.dir[j] = true, dir
		var grid []float64
		for q := 5; q <= 95; q += 5 {
			grid = append(grid, xs[(q*(len(xs)-1))/100])
		}
		if cf.ok {
			grid = append(grid, cf.cut)
		}
		slices.Sort(grid)
		grid = slices.Compact(grid)
		f.grid[j] = grid
		if cf.ok {
			start[j], _ = slices.BinarySearch(grid, cf.cut)
		} else {
			start[j] = len(grid) / 2
		}
		level[j] = make([]uint8, n)
		for i, e := range s.src {
			v := dir * e.Features[j]
			if !math.IsNaN(v) {
				// number of grid values ≤ v: met at grid[g] iff level > g.
				level[j][i] = uint8(sort.Search(len(grid), func(g int) bool { return grid[g] > v }))
			}
		}
	}
	if f.active == [votes]bool{} {
		return nil, warn, &NoDataError{Msg: "no criterion feature varies: no automatic rule can be tuned"}
	}
	var totPos, totNeg float64
	for i, t := range s.truth {
		if t {
			totPos += s.weight[i]
		} else {
			totNeg += s.weight[i]
		}
	}
	count := make([]int8, n)
	var hp, hn, hc [32]float64 // weight by level: positives, negatives, negative candidates
	pts := make([]accuracy.Point, 0, 32)
	var cs [32]accuracy.Confusion
	var fcs [32]float64
	var kpts [6]accuracy.Point
	for k := 1; k <= 6; k++ {
		g := start
		for i := range count {
			count[i] = 0
			for j := range 6 {
				if f.active[j] && level[j][i] > uint8(g[j]) {
					count[i]++
				}
			}
		}
		var best accuracy.Point
		var bestW accuracy.Confusion
		var bestFP float64
		for pass := 0; pass < 8; pass++ {
			moved := false
			for j := range 6 {
				if !f.active[j] {
					continue
				}
				hp, hn, hc = [32]float64{}, [32]float64{}, [32]float64{}
				var ap, an, ac float64 // always hit
				lj := level[j]
				gj := uint8(g[j])
				for i := range n {
					l := lj[i]
					others := int(count[i])
					if l > gj {
						others--
					}
					w := s.weight[i]
					switch {
					case others >= k:
						if s.truth[i] {
							ap += w
						} else {
							an += w
							if s.candidate[i] {
								ac += w
							}
						}
					case others == k-1:
						if s.truth[i] {
							hp[l] += w
						} else {
							hn[l] += w
							if s.candidate[i] {
								hc[l] += w
							}
						}
					}
				}
				grid := f.grid[j]
				pts = pts[:0]
				// hits at grid[gg] are the levels gg+1…G: suffix sums.
				var sp, sn, sc float64
				for gg := len(grid) - 1; gg >= 0; gg-- {
					sp += hp[gg+1]
					sn += hn[gg+1]
					sc += hc[gg+1]
					cs[gg] = accuracy.Confusion{TP: ap + sp, FP: an + sn, FN: accuracy.Remainder(totPos, ap+sp), TN: accuracy.Remainder(totNeg, an+sn)}
					fcs[gg] = ac + sc
				}
				for gg := range grid {
					pt := accuracy.NewPoint(grid[gg], cs[gg], 1)
					pt.FalsePerHour = falsePerHour(fcs[gg], s.hours)
					pts = append(pts, pt)
				}
				idx, err := accuracy.Choose(pts, p)
				if err != nil {
					var npe *accuracy.NoPointError
					idx = g[j]
					if errors.As(err, &npe) && len(npe.Index) > 0 {
						idx = npe.Index[0]
					}
				}
				best, bestW, bestFP = pts[idx], cs[idx], fcs[idx]
				if idx != g[j] {
					moved = true
					for i := range n {
						was, now := lj[i] > gj, lj[i] > uint8(idx)
						if was && !now {
							count[i]--
						} else if now && !was {
							count[i]++
						}
					}
					g[j] = idx
				}
			}
			if !moved {
				break
			}
		}
		bk := &f.byK[k-1]
		bk.g = g
		for j := range 6 {
			if f.active[j] {
				bk.cut[j] = f.grid[j][g[j]]
			}
		}
		best.Threshold = float64(k)
		bk.point, bk.w, bk.fp = best, bestW, bestFP
		kpts[k-1] = best
	}
	for k := range f.slots {
		placeCuts(s, f, &f.byK[k].cut)
	}
	idx, err := chooseK(kpts[:], p)
	f.k = idx + 1 // k of 6
	f.cut = f.byK[idx].cut
	return f, warn, err
}

// chooseK picks among the six "at least k" points by the policy; when none
// satisfies it, the nearest, with the *accuracy.NoPointError.
func chooseK(kpts []accuracy.Point, p accuracy.Policy) (int, error) {
	idx, err := accuracy.Choose(kpts, p)
	if err != nil {
		var npe *accuracy.NoPointError
		idx = 0
		if errors.As(err, &npe) && len(npe.Index) > 0 {
			idx = npe.Index[0]
		}
	}
	return idx, err
}
