package tuning

import (
	"math"

	"github.com/quorate-eeg/quorate/tuning/accuracy"
)

// Headline.Variants: the estimators the headline was compared with on the
// demo's design seeds 101–110 (README, performance), computed from the
// same replicates so that only the estimator differs. Keys:
//
//   - "harrell": the headline itself (Headline's estimate and interval).
//   - "loo": the leave-one-out bootstrap Err(1) (Efron 1983, JASA 78:316–331;
//     Efron & Tibshirani 1997, JASA 92:548–560): each event judged only by
//     the rules of replicates whose draw left its subject out, pooled
//     design-weighted; point estimate only.
//   - "632": 0.368·apparent + 0.632·Err(1), on the error scale 1 − figure
//     (Efron 1983).
//   - "632+": the .632+ estimator (Efron & Tibshirani 1997, eq. 29–32): the
//     weight w = 0.632/(1 − 0.368·R) with relative overfitting rate
//     R = (Err(1) − err)/(γ − err), γ the no-information error, here the
//     error of calls made independently of the reference at the rule's
//     overall design-weighted rate of positive calls q (1 − q for
//     sensitivity, q for specificity); Err(1) capped at γ.
//   - "loso": leave-one-subject-out cross-validation with the whole
//     selection repeated for each left-out subject, pooled.
//
// The intervals of "632", "632+" and "loso" are Headline's interval shape
// (the optimism spread, widened by c) moved onto their estimate. Only
// sensitivity and specificity are filled.
func (h *Headline) Variants() map[string][4]Estimate { return h.variants }

// variants computes Headline.Variants other than "loso".
func variants(s *evset, app [4]float64, draws [][]int, hitOf func(int) []bool, d [4][]float64, c, level float64) map[string][4]Estimate {
	n := s.n()
	// Leave-one-out bootstrap (Efron 1983; Efron & Tibshirani 1997): each
	// event judged only by replicates whose draw left its subject out.
	sum := make([]float64, n)
	cnt := make([]float64, n)
	for b, dr := range draws {
		hit := hitOf(b)
		if hit == nil {
			continue
		}
		in := make([]bool, n)
		for _, i := range dr {
			in[i] = true
		}
		for i := range n {
			if !in[i] {
				cnt[i]++
				if hit[i] {
					sum[i]++
				}
			}
		}
	}
	var tp, pos, tn, neg, callAll, wAll float64
	for i := range n {
		if cnt[i] == 0 || !s.candidate[i] {
			continue
		}
		r := sum[i] / cnt[i]
		w := s.weight[i]
		wAll += w
		callAll += w * r
		if s.truth[i] {
			tp += w * r
			pos += w
		} else {
			tn += w * (1 - r)
			neg += w
		}
	}
	loo := [2]float64{tp / pos, tn / neg}
	// no-information rates: calls independent of truth.
	q := callAll / wAll
	gamma := [2]float64{q, 1 - q}
	out := map[string][4]Estimate{}
	var e632, e632p, harrell [4]Estimate
	for m := range 2 {
		// errors as 1 − figure
		errApp, err1, g := 1-app[m], 1-loo[m], 1-gamma[m]
		err1p := math.Min(err1, g)
		R := 0.0
		if err1 > errApp && g > errApp {
			R = (err1p - errApp) / (g - errApp)
		}
		w := 0.632 / (1 - 0.368*R)
		v632 := 1 - (0.368*errApp + 0.632*err1)
		v632p := 1 - ((1-w)*errApp + w*err1p)
		var mean float64
		for _, x := range d[m] {
			mean += x
		}
		mean /= float64(len(d[m]))
		qlo, qhi := percentiles(append([]float64(nil), d[m]...), level)
		// interval: the optimism's spread about its mean, centred on the estimate
		shift := func(v float64) Estimate {
			return Estimate{v, clamp01(v - c*(qhi-mean)), clamp01(v - c*(qlo-mean))}
		}
		e632[m], e632p[m] = shift(v632), shift(v632p)
		harrell[m] = shift(app[m] - mean)
		out["loo"] = [4]Estimate{{Value: loo[0]}, {Value: loo[1]}}
	}
	out["632"], out["632+"], out["harrell"] = e632, e632p, harrell
	return out
}

func clamp01(x float64) float64 { return math.Min(math.Max(x, 0), 1) }

// loso is Headline.Variants' "loso".
func loso(s *evset, method string, p accuracy.Policy, d [4][]float64, c, level float64) [4]Estimate {
	idx := map[string][]int{}
	for i, x := range s.subject {
		idx[x] = append(idx[x], i)
	}
	held := make([]bool, s.n())
	for _, test := range idx {
		f, _, _ := fitRule(s.subset(complement(test, s.n())), method, p)
		if f == nil {
			continue
		}
		for _, i := range test {
			held[i] = f.hits(s.src[i], &f.cut, f.k)
		}
	}
	v := figures(s, held)
	var out [4]Estimate
	for m := range 2 {
		var mean float64
		for _, x := range d[m] {
			mean += x
		}
		mean /= float64(len(d[m]))
		qlo, qhi := percentiles(append([]float64(nil), d[m]...), level)
		out[m] = Estimate{v[m], clamp01(v[m] - c*(qhi-mean)), clamp01(v[m] - c*(qlo-mean))}
	}
	return out
}
