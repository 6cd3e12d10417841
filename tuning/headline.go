package tuning

import (
	"context"
	"fmt"
	"math"
	"math/rand/v2"
	"runtime"
	"sync"
	"sync/atomic"

	"github.com/quorate-eeg/quorate/internal/progress"
	"github.com/quorate-eeg/quorate/tuning/accuracy"
)

// HeadlineMethod names the estimator behind Headline.
const HeadlineMethod = "optimism-corrected subject bootstrap (Harrell, Lee & Mark 1996), whole selection repeated in every replicate; basic bootstrap interval"

// minHeadlineSubjects is the fewest subjects a subject-resampled interval is
// given for: with fewer, the resamples take too few distinct values to
// describe the spread (common practice).
const minHeadlineSubjects = 5

// Headline is the figure to expect when the chosen rule meets new
// recordings like these: its design-weighted sensitivity, specificity, PPV
// and false detections per hour, corrected for the optimism of having been
// chosen on the same events.
//
// Method (Harrell, Lee & Mark 1996, Stat Med 15:361–387; Efron &
// Tibshirani 1993, An Introduction to the Bootstrap, ch. 17): each replicate
// draws as many subjects as there are, with replacement, keeping the design
// weights of their events, and repeats the whole selection on them (every
// cutoff, k, the policy). The fitted rule's apparent figure on the drawn
// events, minus its figure on the original events, is that replicate's
// optimism d_b. The estimate is the apparent figure A of the chosen rule
// minus the mean optimism. Reading the original events as the population
// and the replicate as a study drawn from it, d_b is the error that study
// makes in judging its own chosen rule, so the interval is the basic
// bootstrap interval [A − q(1−α/2), A − q(α/2)] of the d_b (Davison &
// Hinkley 1997, Bootstrap Methods and their Application, §5.2), clipped to the figure's range. It carries both the
// sampling error of the estimate and the spread of the selection.
//
// Rates are undefined (NaN) in a replicate with an empty denominator; such
// replicates are left out of that figure. An interval is withheld (NaN,
// with a note) when there are fewer than five subjects, when the sample has
// no missed reference IED (sensitivity) or no false call (specificity):
// the resamples then cannot show how often that happens.
type Headline struct {
	Method                        string
	Replicates                    int
	Sens, Spec, PPV, FalsePerHour Estimate
	Optimism                      [4]float64 // mean d_b of sensitivity, specificity, PPV, false per hour
	Notes                         []string   // why an interval is withheld
}

// figures are the headline's four design-weighted figures of decisions hit.
func figures(s *evset, hit []bool) [4]float64 {
	c := accuracy.Tally(hit, s.truth, s.weight)
	var fc float64
	for i := range hit {
		if hit[i] && !s.truth[i] && s.candidate[i] {
			fc += s.weight[i]
		}
	}
	return [4]float64{c.Sensitivity(), c.Specificity(), c.PPV(), falsePerHour(fc, s.hours)}
}

func (f *autoFit) decide(s *evset) []bool {
	hit := make([]bool, s.n())
	for i, e := range s.src {
		hit[i] = f.hits(e, &f.cut, f.k)
	}
	return hit
}

// headline computes Headline for the rule f fitted on s by method.
func headline(ctx context.Context, s *evset, f *autoFit, method string, p accuracy.Policy, B int, seed uint64, level float64, bar progress.Bar) (*Headline, error) {
	h := &Headline{Method: HeadlineMethod, Replicates: B}
	hit := f.decide(s)
	app := figures(s, hit)
	// The resamples are drawn in order from one seeded stream, then fitted
	// in parallel; each replicate's result has its own slot, so the output
	// does not depend on scheduling.
	rng := rand.New(rand.NewPCG(seed, 0x68656164)) // "head"
	draws := make([][]int, B)
	for b := range draws {
		draws[b] = accuracy.ClusterResample(s.subject, rng)
	}
	type rep struct {
		d  [4]float64
		ok bool
	}
	reps := make([]rep, B)
	var next atomic.Int64
	var wg sync.WaitGroup
	var mu sync.Mutex
	for range max(1, min(runtime.GOMAXPROCS(0), B)) {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for {
				b := int(next.Add(1)) - 1
				if b >= B || ctx.Err() != nil {
					return
				}
				sb := s.subset(draws[b])
				// A resample on which no rule can be fitted (a one-sided
				// majority everywhere) says nothing about optimism.
				if fb, _, _ := fitRule(sb, method, p); fb != nil {
					ab, ob := figures(sb, fb.decide(sb)), figures(s, fb.decide(s))
					for m := range 4 {
						reps[b].d[m] = ab[m] - ob[m]
					}
					reps[b].ok = true
				}
				mu.Lock()
				bar.Add(1)
				mu.Unlock()
			}
		}()
	}
	wg.Wait()
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	var d [4][]float64
	for _, r := range reps {
		if !r.ok {
			continue
		}
		for m := range 4 {
			if !math.IsNaN(r.d[m]) {
				d[m] = append(d[m], r.d[m])
			}
		}
	}
	out := [4]*Estimate{&h.Sens, &h.Spec, &h.PPV, &h.FalsePerHour}
	upper := [4]float64{1, 1, 1, math.Inf(1)}
	for m := range out {
		if len(d[m]) == 0 || math.IsNaN(app[m]) {
			*out[m] = pointOnly(app[m])
			h.Optimism[m] = math.NaN()
			continue
		}
		var mean float64
		for _, x := range d[m] {
			mean += x
		}
		mean /= float64(len(d[m]))
		h.Optimism[m] = mean
		qlo, qhi := percentiles(d[m], level)
		clip := func(x float64) float64 { return math.Min(math.Max(x, 0), upper[m]) }
		*out[m] = Estimate{clip(app[m] - mean), clip(app[m] - qhi), clip(app[m] - qlo)}
	}
	subjects := map[string]bool{}
	for _, x := range s.subject {
		subjects[x] = true
	}
	c := accuracy.Tally(hit, s.truth, nil)
	withhold := func(e *Estimate, why string) {
		e.Lo, e.Hi = math.NaN(), math.NaN()
		h.Notes = append(h.Notes, why)
	}
	switch {
	case len(subjects) < minHeadlineSubjects:
		for _, e := range out {
			e.Lo, e.Hi = math.NaN(), math.NaN()
		}
		h.Notes = append(h.Notes, fmt.Sprintf("only %d subjects: too few for a subject-resampled interval (at least %d needed); the figures are point estimates", len(subjects), minHeadlineSubjects))
	default:
		if c.FN == 0 {
			withhold(&h.Sens, "the rule missed no reference IED in the sample: how often it misses cannot be estimated, so sensitivity has no interval")
		}
		if c.FP == 0 {
			withhold(&h.Spec, "the rule made no false call in the sample: how often it does cannot be estimated, so specificity has no interval")
		}
	}
	return h, nil
}
