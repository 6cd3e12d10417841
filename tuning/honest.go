package tuning

import (
	"context"
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"slices"

	"github.com/quorate-eeg/quorate/internal/progress"
	"github.com/quorate-eeg/quorate/tuning/accuracy"
)

// BootstrapIntervals are subject-resampled percentile intervals for the
// chosen operating point's design-weighted figures. Each replicate draws as
// many subjects as there are, with replacement (accuracy.ClusterResample;
// Davison & Hinkley 1997, Bootstrap Methods and their Application, §3.8),
// and recomputes the figures of the fixed rule from the drawn subjects'
// weighted counts; FalsePerHour divides by the full recording hours, the
// resample standing for the same archive. The rule is not re-selected in
// each replicate, so these intervals show sampling variability of the
// chosen point, not of the choice, and are centred on its optimistic
// in-sample figure (Headline repeats the choice). Percentiles are the order statistics at ranks ⌈αB⌉ and ⌈(1−α)B⌉,
// α = (1−level)/2, among the replicates where the figure is defined.
type BootstrapIntervals struct {
	Replicates      int
	Sens, Spec, PPV Estimate
	FalsePerHour    Estimate
	Undefined       int // replicates where some figure had an empty denominator
}

// crossValidateAuto repeats the whole automatic-rule selection inside the
// folds and returns the pooled held-out metrics.
func crossValidateAuto(ctx context.Context, s *evset, folds [][]int, method string, p accuracy.Policy, level float64, bar progress.Bar) (*CrossValidated, []string, error) {
	cv := &CrossValidated{Folds: len(folds)}
	held := make([]bool, s.n())
	var warn []string
	for fi, test := range folds {
		if err := ctx.Err(); err != nil {
			return nil, nil, err
		}
		f, _, err := fitRule(s.subset(complement(test, s.n())), method, p)
		var npe *accuracy.NoPointError
		switch {
		case errors.As(err, &npe):
			warn = append(warn, fmt.Sprintf("cross-validation fold %d: no rule met %s on its training subjects; the nearest was used", fi+1, p))
		case err != nil:
			return nil, nil, err
		}
		cv.FoldRules = append(cv.FoldRules, f.name(f.cut, f.k))
		for _, i := range test {
			held[i] = f.hits(s.src[i], &f.cut, f.k)
		}
		bar.Add(1)
	}
	cv.Metrics = measure(s, held, level)
	return cv, warn, nil
}

// bootstrapPoint computes BootstrapIntervals for the decisions hit.
func bootstrapPoint(ctx context.Context, s *evset, hit []bool, B int, seed uint64, level float64, bar progress.Bar) (*BootstrapIntervals, error) {
	// Pool each subject's weighted cells once; a replicate is then a sum
	// over drawn subjects.
	at := make(map[string]int)
	var names []string
	var cells [][5]float64 // TP, FP, TN, FN, false detections among candidates
	for i, subj := range s.subject {
		k, ok := at[subj]
		if !ok {
			k = len(names)
			at[subj] = k
			names = append(names, subj)
			cells = append(cells, [5]float64{})
		}
		w := s.weight[i]
		switch {
		case hit[i] && s.truth[i]:
			cells[k][0] += w
		case hit[i]:
			cells[k][1] += w
			if s.candidate[i] {
				cells[k][4] += w
			}
		case s.truth[i]:
			cells[k][3] += w
		default:
			cells[k][2] += w
		}
	}
	rng := rand.New(rand.NewPCG(seed, 0x74756e65)) // "tune"
	reps := [4][]float64{make([]float64, 0, B), make([]float64, 0, B), make([]float64, 0, B), make([]float64, 0, B)}
	bi := &BootstrapIntervals{Replicates: B}
	for b := range B {
		if b%100 == 0 {
			if err := ctx.Err(); err != nil {
				return nil, err
			}
		}
		var c [5]float64
		for _, k := range accuracy.ClusterResample(names, rng) {
			for m := range c {
				c[m] += cells[k][m]
			}
		}
		conf := accuracy.Confusion{TP: c[0], FP: c[1], TN: c[2], FN: c[3]}
		v := [4]float64{conf.Sensitivity(), conf.Specificity(), conf.PPV(), falsePerHour(c[4], s.hours)}
		undefined := false
		for m, x := range v {
			if math.IsNaN(x) {
				undefined = true
				continue
			}
			reps[m] = append(reps[m], x)
		}
		if undefined {
			bi.Undefined++
		}
		bar.Add(1)
	}
	full := accuracy.Tally(hit, s.truth, s.weight)
	var fc float64
	for i := range hit {
		if hit[i] && !s.truth[i] && s.candidate[i] {
			fc += s.weight[i]
		}
	}
	vals := [4]float64{full.Sensitivity(), full.Specificity(), full.PPV(), falsePerHour(fc, s.hours)}
	out := [4]*Estimate{&bi.Sens, &bi.Spec, &bi.PPV, &bi.FalsePerHour}
	for m := range out {
		lo, hi := percentiles(reps[m], level)
		*out[m] = Estimate{vals[m], lo, hi}
	}
	return bi, nil
}

func percentiles(r []float64, level float64) (lo, hi float64) {
	if len(r) == 0 {
		return math.NaN(), math.NaN()
	}
	slices.Sort(r)
	a := (1 - level) / 2
	n := float64(len(r))
	l := max(int(math.Ceil(a*n))-1, 0)
	h := min(max(int(math.Ceil((1-a)*n))-1, 0), len(r)-1)
	return r[l], r[h]
}
