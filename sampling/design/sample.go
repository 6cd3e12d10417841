package design

import (
	"errors"
	"fmt"
	"math"
)

// Sample is a stratified sample: one entry per drawn unit, parallel slices.
type Sample struct {
	Stratum []string
	Weight  []float64 // design weight 1/π_i

	// FPC holds the sampling fraction f_h per stratum used in the finite
	// population correction 1−f_h; a stratum absent from the map has
	// f_h = 0 (the with-replacement approximation, which overstates the
	// variance). For stratified simple random sampling f_h = n_h/N_h; for
	// the capped design of package draw, n_h/N'_h ignores the thinning
	// stage and is an approximation.
	FPC map[string]float64

	// Cluster optionally names each unit's primary sampling unit (PSU),
	// in quorate the subject its events come from; nil makes every unit
	// its own PSU. With clusters the variance is the with-replacement
	// ultimate-cluster estimator (see clusterVar) and FPC is not used.
	Cluster []string
}

// FieldError reports an input slice or value that does not fit the sample.
type FieldError struct {
	Field string
	Index int // −1 when not tied to one element
	Msg   string
}

func (e *FieldError) Error() string {
	if e.Index < 0 {
		return fmt.Sprintf("design: %s: %s", e.Field, e.Msg)
	}
	return fmt.Sprintf("design: %s[%d]: %s", e.Field, e.Index, e.Msg)
}

// ErrInput is matched by errors.Is on a FieldError.
var ErrInput = errors.New("design: unusable sample")

// Unwrap gives ErrInput.
func (e *FieldError) Unwrap() error { return ErrInput }

// Estimate is a point estimate with its estimated variance and the design
// degrees of freedom of that variance (Sample.DF; 0 when unknown).
type Estimate struct {
	Value float64
	Var   float64
	DF    float64
}

// SE returns the standard error √Var.
func (e Estimate) SE() float64 { return math.Sqrt(e.Var) }

func (s Sample) check(n int, cols map[string]int) error {
	if len(s.Stratum) != len(s.Weight) {
		return &FieldError{Field: "Weight", Index: -1, Msg: fmt.Sprintf("%d weights for %d units", len(s.Weight), len(s.Stratum))}
	}
	for name, l := range cols {
		if l != len(s.Stratum) {
			return &FieldError{Field: name, Index: -1, Msg: fmt.Sprintf("%d values for %d units", l, len(s.Stratum))}
		}
	}
	for i, w := range s.Weight {
		if !(w >= 1) || math.IsInf(w, 0) {
			return &FieldError{Field: "Weight", Index: i, Msg: fmt.Sprintf("weight %v is not 1/π with 0 < π ≤ 1", w)}
		}
	}
	if s.Cluster != nil {
		if len(s.Cluster) != len(s.Stratum) {
			return &FieldError{Field: "Cluster", Index: -1, Msg: fmt.Sprintf("%d cluster ids for %d units", len(s.Cluster), len(s.Stratum))}
		}
		for i, c := range s.Cluster {
			if c == "" {
				return &FieldError{Field: "Cluster", Index: i, Msg: "empty cluster id"}
			}
		}
	}
	for h, f := range s.FPC {
		if !(f >= 0 && f <= 1) {
			return &FieldError{Field: "FPC", Index: -1, Msg: fmt.Sprintf("stratum %q: fraction %v outside [0,1]", h, f)}
		}
	}
	return nil
}

// groups returns the unit indices of each stratum, strata in first-seen order.
func (s Sample) groups() [][]int {
	at := make(map[string]int)
	var g [][]int
	for i, h := range s.Stratum {
		k, isNew := firstSeen(at, h)
		if isNew {
			g = append(g, nil)
		}
		g[k] = append(g[k], i)
	}
	return g
}

// firstSeen returns key's dense index in at, numbering keys in the order
// they are first seen, and whether key is new.
func firstSeen[K comparable](at map[K]int, key K) (int, bool) {
	k, ok := at[key]
	if !ok {
		k = len(at)
		at[key] = k
	}
	return k, !ok
}

// linVar is the stratified variance estimator of a weighted total Σ w_i z_i
// (with-replacement form within each stratum, times 1−f_h; Särndal,
// Swensson & Wretman 1992, §§3.7 and 5.5):
//
//	v = Σ_h (1−f_h) n_h/(n_h−1) Σ_{i∈h} (w_i z_i − mean_h(w z))².
//
// With w_i = N_h/n_h and f_h = n_h/N_h this is the unbiased
// Σ_h N_h² (1−f_h) s²_zh / n_h (Cochran 1977, §5.3, Theorem 5.3 times N²).
// A stratum with n_h = 1 contributes 0. With Sample.Cluster set the
// ultimate-cluster estimator clusterVar is used instead.
func (s Sample) linVar(z []float64) float64 {
	if s.Cluster != nil {
		return s.clusterVar(z)
	}
	v := 0.0
	for _, g := range s.groups() {
		t := make([]float64, len(g))
		for k, i := range g {
			t[k] = s.Weight[i] * z[i]
		}
		v += (1 - s.FPC[s.Stratum[g[0]]]) * spread(t)
	}
	return v
}

// spread returns n/(n−1) Σ (t_k − t̄)², the with-replacement variance
// estimate of a total from n independent expanded values t_k (the pwr
// estimator, Särndal, Swensson & Wretman 1992, §2.9 — section from
// memory); 0 for n < 2.
func spread(t []float64) float64 {
	n := float64(len(t))
	if n < 2 {
		return 0
	}
	mean := 0.0
	for _, x := range t {
		mean += x
	}
	mean /= n
	ss := 0.0
	for _, x := range t {
		ss += (x - mean) * (x - mean)
	}
	return n / (n - 1) * ss
}
