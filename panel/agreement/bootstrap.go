package agreement

import (
	"fmt"
	"math"
	"math/rand/v2"
	"slices"

	"gonum.org/v1/gonum/stat"
)

// Interval is a two-sided confidence interval.
type Interval struct{ Lo, Hi float64 }

// Statistic evaluates a coefficient on weighted totals. The Totals methods
// are Statistics as method expressions, e.g. (*Totals).FleissKappa.
type Statistic func(*Totals) float64

// Bootstrap returns percentile confidence intervals for each statistic by
// resampling subjects, not items: clusters[i] names the subject (EEG record
// or patient) item i came from, and each replicate draws as many subjects as
// there are, uniformly with replacement, keeping all of a drawn subject's
// items. Items from one subject share montage, artefact and rater fatigue, so
// resampling items alone would understate the spread (Davison & Hinkley
// 1997, Bootstrap Methods and their Application, §3.8, two-stage sampling
// with the first stage resampled).
//
// Because the coefficients depend on items only through sums (Totals), each
// subject's totals are pooled once and a replicate is Σ_c m_c·T_c with m_c the
// number of times subject c was drawn; cost per replicate is O(subjects·K).
//
// The interval is the percentile interval (Efron & Tibshirani 1993, An
// Introduction to the Bootstrap, §13.3): the empirical (1−level)/2 and
// (1+level)/2 quantiles of the replicates (gonum stat.Empirical). Replicates
// where a statistic is NaN (e.g. a draw with one category only) are dropped
// for that statistic; an interval with no finite replicate is NaN. Cluster
// ids are any non-negative ints. The draws depend only on seed and the
// number of distinct clusters, so calls with the same seed and clustering
// (say, one per IFCN criterion) see the same resampled subjects.
func Bootstrap(c *Counts, clusters []int, stats []Statistic, reps int, seed uint64, level float64) ([]Interval, error) {
	dense, nc, err := checkBootstrap(c.Items(), clusters, reps, level)
	if err != nil {
		return nil, err
	}
	pooled := make([]Totals, nc)
	for j := range pooled {
		pooled[j] = newTotals(c.K)
	}
	for i, j := range dense {
		pooled[j].addItem(c.Row(i), 1)
	}
	vals := make([][]float64, len(stats))
	for s := range vals {
		vals[s] = make([]float64, 0, reps)
	}
	tot := newTotals(c.K)
	d := newDrawer(nc, seed)
	for range reps {
		m := d.draw()
		tot.reset()
		for j, mj := range m {
			if mj != 0 {
				tot.addScaled(&pooled[j], float64(mj))
			}
		}
		for s, f := range stats {
			if v := f(&tot); !math.IsNaN(v) {
				vals[s] = append(vals[s], v)
			}
		}
	}
	out := make([]Interval, len(stats))
	for s := range out {
		out[s] = percentile(vals[s], level)
	}
	return out, nil
}

// BootstrapTable is Bootstrap for a statistic that needs the raw table, such
// as a CohenKappa between two raters. Each replicate builds the resampled
// table (a drawn subject's rows repeated m_c times), so it is much slower than
// Bootstrap; the draws are identical to Bootstrap's for the same seed.
func BootstrapTable(t Table, clusters []int, stat func(Table) float64, reps int, seed uint64, level float64) (Interval, error) {
	dense, nc, err := checkBootstrap(t.Items(), clusters, reps, level)
	if err != nil {
		return Interval{}, err
	}
	members := make([][]int, nc)
	for i, j := range dense {
		members[j] = append(members[j], i)
	}
	vals := make([]float64, 0, reps)
	rows := make([][]int, 0, t.Items())
	d := newDrawer(nc, seed)
	for range reps {
		m := d.draw()
		rows = rows[:0]
		for j, mj := range m {
			for range mj {
				for _, i := range members[j] {
					rows = append(rows, t.Ratings[i])
				}
			}
		}
		if v := stat(Table{K: t.K, Ratings: rows}); !math.IsNaN(v) {
			vals = append(vals, v)
		}
	}
	return percentile(vals, level), nil
}

func checkBootstrap(items int, clusters []int, reps int, level float64) (dense []int, n int, err error) {
	if len(clusters) != items {
		return nil, 0, &argError{Arg: "clusters", Index: -1, Reason: fmt.Sprintf("length %d, want one per item (%d)", len(clusters), items)}
	}
	if reps < 1 {
		return nil, 0, &argError{Arg: "reps", Index: -1, Reason: "need at least one replicate"}
	}
	if !(level > 0 && level < 1) {
		return nil, 0, &argError{Arg: "level", Index: -1, Reason: "must lie in (0,1)"}
	}
	// Dense ids in order of first appearance keep the draws independent of
	// how callers number subjects.
	id := make(map[int]int)
	dense = make([]int, items)
	for i, c := range clusters {
		if c < 0 {
			return nil, 0, &argError{Arg: "clusters", Index: i, Reason: "negative cluster id"}
		}
		j, ok := id[c]
		if !ok {
			j = len(id)
			id[c] = j
		}
		dense[i] = j
	}
	return dense, len(id), nil
}

// drawer yields multinomial(n; 1/n,…,1/n) counts: how often each cluster is
// drawn when n clusters are sampled with replacement.
type drawer struct {
	rng *rand.Rand
	m   []int
}

func newDrawer(n int, seed uint64) *drawer {
	// The second PCG word is a fixed odd constant (2^64/φ) so that a single
	// user seed fully determines the stream.
	return &drawer{rng: rand.New(rand.NewPCG(seed, 0x9e3779b97f4a7c15)), m: make([]int, n)}
}

func (d *drawer) draw() []int {
	clear(d.m)
	n := len(d.m)
	for range n {
		d.m[d.rng.IntN(n)]++
	}
	return d.m
}

func percentile(v []float64, level float64) Interval {
	if len(v) == 0 {
		return Interval{math.NaN(), math.NaN()}
	}
	slices.Sort(v)
	return Interval{
		Lo: stat.Quantile((1-level)/2, stat.Empirical, v, nil),
		Hi: stat.Quantile((1+level)/2, stat.Empirical, v, nil),
	}
}
