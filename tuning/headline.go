package tuning

import (
	"context"
	"fmt"
	"math"
	"math/rand/v2"
	"runtime"
	"sync"
	"sync/atomic"

	"gonum.org/v1/gonum/stat/distuv"

	"github.com/quorate-eeg/quorate/internal/progress"
	"github.com/quorate-eeg/quorate/tuning/accuracy"
)

// HeadlineMethod names the estimator behind Headline.
const HeadlineMethod = "optimism-corrected subject bootstrap (Harrell, Lee & Mark 1996), whole selection repeated in every replicate; basic bootstrap interval widened for few subjects (t with subjects − 1 df)"

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
// bootstrap interval of the d_b (Davison & Hinkley 1997, Bootstrap Methods
// and their Application, §5.2) about the estimate E = A − d̄,
//
//	[E − c·(q(1−α/2) − d̄), E − c·(q(α/2) − d̄)],
//
// clipped to the figure's range, where q are the d_b's percentiles. It
// carries both the sampling error of the estimate and the spread of the
// selection. With a subjects, c = √(a/(a−1)) · t(a−1, 1−α/2) / z(1−α/2)
// widens it for few subjects: resampling a clusters understates the
// variance by the factor (a−1)/a (Davison & Hinkley 1997, §3.8), and a
// design with a primary sampling units has a − 1 degrees of freedom
// (Korn & Graubard 1999, Analysis of Health Surveys, §5.2; from memory).
// With 8 subjects c = 1.29; c → 1 as a grows.
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
	variants                      map[string][4]Estimate
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
func headline(ctx context.Context, s *evset, f *autoFit, method string, p accuracy.Policy, B int, seed uint64, level float64, bar progress.Bar, withVariants bool) (*Headline, error) {
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
		d   [4]float64
		hit []bool // the replicate's rule applied to the original events
		ok  bool
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
					hs := fb.decide(s)
					ab, ob := figures(sb, fb.decide(sb)), figures(s, hs)
					reps[b].hit = hs
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
	subjects := map[string]bool{}
	for _, x := range s.subject {
		subjects[x] = true
	}
	c := fewSubjects(len(subjects), level)
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
		qlo, qhi := percentiles(append([]float64(nil), d[m]...), level)
		clip := func(x float64) float64 { return math.Min(math.Max(x, 0), upper[m]) }
		e := app[m] - mean
		*out[m] = Estimate{clip(e), clip(e - c*(qhi-mean)), clip(e - c*(qlo-mean))}
	}
	if withVariants {
		h.variants = variants(s, app, draws, func(b int) []bool { return reps[b].hit }, d, c, level)
		h.variants["loso"] = loso(s, method, p, d, c, level)
	}
	cf := accuracy.Tally(hit, s.truth, nil)
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
		if cf.FN == 0 {
			withhold(&h.Sens, "the rule missed no reference IED in the sample: how often it misses cannot be estimated, so sensitivity has no interval")
		}
		if cf.FP == 0 {
			withhold(&h.Spec, "the rule made no false call in the sample: how often it does cannot be estimated, so specificity has no interval")
		}
	}
	return h, nil
}

// fewSubjects is the widening factor c of Headline's interval for a
// subjects at the two-sided level: √(a/(a−1)) · t(a−1, 1−α/2) / z(1−α/2);
// 1 when a < 2.
func fewSubjects(a int, level float64) float64 {
	if a < 2 {
		return 1
	}
	p := 1 - (1-level)/2
	n := float64(a)
	return math.Sqrt(n/(n-1)) * distuv.StudentsT{Mu: 0, Sigma: 1, Nu: n - 1}.Quantile(p) / distuv.UnitNormal.Quantile(p)
}
