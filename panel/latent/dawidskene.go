package latent

import (
	"math"
)

// Missing marks a rater who gave no answer for an item.
const Missing = -1

// Options control the EM fit. The zero value selects the defaults.
type Options struct {
	// Tol stops EM when the penalised log-likelihood (see Fit) changes by
	// less than Tol·(1+|value|) between iterations. Default 1e-10.
	Tol float64
	// MaxIter bounds the number of EM iterations. Default 1000.
	MaxIter int
	// Smoothing is an additive pseudo-count α added to every confusion-matrix
	// cell and every class count in the M-step (a symmetric Dirichlet(1+α)
	// prior, so the fit is the MAP estimate). It keeps rates off 0 and 1,
	// where a rater who never erred on a small panel would otherwise veto
	// the posterior. Default 0.5; set a negative value for pure maximum
	// likelihood (α = 0).
	Smoothing float64
}

func (o Options) withDefaults() (Options, error) {
	if o.Tol == 0 {
		o.Tol = 1e-10
	}
	if o.MaxIter == 0 {
		o.MaxIter = 1000
	}
	switch {
	case o.Smoothing == 0:
		o.Smoothing = 0.5
	case o.Smoothing < 0:
		o.Smoothing = 0
	}
	if o.Tol < 0 || math.IsNaN(o.Tol) {
		return o, &optionError{Field: "Tol", Reason: "must be positive"}
	}
	if o.MaxIter < 0 {
		return o, &optionError{Field: "MaxIter", Reason: "must be positive"}
	}
	return o, nil
}

// Result is a fitted Dawid–Skene model.
type Result struct {
	K int
	// Posterior[i][j] is P(item i is of class j | all answers).
	Posterior [][]float64
	// Prevalence[j] is the estimated share of items of class j.
	Prevalence []float64
	// Confusion[r][j][l] is P(rater r answers l | true class j).
	Confusion [][][]float64
	// Iterations is the number of EM iterations run; Converged reports
	// whether the tolerance was met within MaxIter.
	Iterations int
	Converged  bool
	// LogLikelihood is the observed-data log-likelihood
	// Σ_i log Σ_j p_j Π_r π_r[j][v_ir] at the returned parameters (without
	// the smoothing prior's term).
	LogLikelihood float64
}

// Sensitivity returns P(rater answers 1 | class 1), Confusion[r][1][1].
// It is meaningful for present/absent (K = 2) fits.
func (res *Result) Sensitivity(r int) float64 { return res.Confusion[r][1][1] }

// Specificity returns P(rater answers 0 | class 0), Confusion[r][0][0].
func (res *Result) Specificity(r int) float64 { return res.Confusion[r][0][0] }

// PositiveProb returns P(class 1 | answers) for every item of a K = 2 fit.
func (res *Result) PositiveProb() []float64 {
	p := make([]float64, len(res.Posterior))
	for i, row := range res.Posterior {
		p[i] = row[1]
	}
	return p
}

// Fit estimates the Dawid & Skene (1979, "Maximum likelihood estimation of
// observer error-rates using the EM algorithm", Appl. Statist. 28:20–28)
// model: item i has latent class j with probability p_j, and rater r answers
// l with probability π_r[j][l] independently of the other raters given j.
//
// ratings is items × raters with classes 0..k−1 or Missing; a missing answer
// simply contributes no factor to its item's likelihood (D&S §2.1 allow any
// number of answers per rater and item). EM starts, as in D&S §3.1, from each
// item's vote shares T_ij = n_ij / n_i (a soft majority vote; an item nobody
// answered starts uniform), then alternates
//
//	M: π_r[j][l] = (α + Σ_i T_ij [v_ir=l]) / (kα + Σ_i T_ij [v_ir≠Missing]),
//	   p_j = (α + Σ_i T_ij) / (kα + N),
//	E: T_ij ∝ p_j Π_r π_r[j][v_ir],
//
// computed in log space, until the penalised log-likelihood
// ℓ + α Σ log θ (θ every prevalence and confusion entry) changes by less than
// Options.Tol relative or Options.MaxIter is reached. α is Options.Smoothing. The
// majority start fixes the class labels (no label switching) provided raters
// are better than chance on average. Fit is deterministic.
func Fit(ratings [][]int, k int, opt Options) (*Result, error) {
	opt, err := opt.withDefaults()
	if err != nil {
		return nil, err
	}
	if k < 2 {
		return nil, &optionError{Field: "k", Reason: "need at least 2 classes"}
	}
	nItems := len(ratings)
	nRaters := 0
	if nItems > 0 {
		nRaters = len(ratings[0])
	}
	for i, row := range ratings {
		if len(row) != nRaters {
			return nil, &shapeError{Item: i, Got: len(row), Want: nRaters}
		}
		for r, v := range row {
			if v != Missing && (v < 0 || v >= k) {
				return nil, &cellError{Item: i, Rater: r, Value: v, K: k}
			}
		}
	}

	res := &Result{
		K:          k,
		Posterior:  make([][]float64, nItems),
		Prevalence: make([]float64, k),
		Confusion:  make([][][]float64, nRaters),
	}
	for r := range res.Confusion {
		res.Confusion[r] = make([][]float64, k)
		for j := range res.Confusion[r] {
			res.Confusion[r][j] = make([]float64, k)
		}
	}
	for i, row := range ratings {
		t := make([]float64, k)
		n := 0.0
		for _, v := range row {
			if v != Missing {
				t[v]++
				n++
			}
		}
		for j := range t {
			if n == 0 {
				t[j] = 1 / float64(k)
			} else {
				t[j] /= n
			}
		}
		res.Posterior[i] = t
	}

	prev := math.Inf(-1)
	for res.Iterations < opt.MaxIter {
		res.Iterations++
		mStep(ratings, res, opt.Smoothing)
		ll := eStep(ratings, res)
		res.LogLikelihood = ll
		// EM with the Dirichlet prior climbs the penalised likelihood, not ℓ
		// alone, so that is what convergence watches.
		obj := ll + logPrior(res, opt.Smoothing)
		if math.Abs(obj-prev) <= opt.Tol*(1+math.Abs(obj)) {
			res.Converged = true
			break
		}
		prev = obj
	}
	return res, nil
}

func mStep(ratings [][]int, res *Result, alpha float64) {
	k := res.K
	for j := range res.Prevalence {
		res.Prevalence[j] = alpha
	}
	for r := range res.Confusion {
		for j := range k {
			for l := range k {
				res.Confusion[r][j][l] = alpha
			}
		}
	}
	for i, row := range ratings {
		t := res.Posterior[i]
		for j, tj := range t {
			res.Prevalence[j] += tj
		}
		for r, v := range row {
			if v == Missing {
				continue
			}
			for j, tj := range t {
				res.Confusion[r][j][v] += tj
			}
		}
	}
	normalise(res.Prevalence)
	for r := range res.Confusion {
		for j := range k {
			normalise(res.Confusion[r][j])
		}
	}
}

// logPrior is α Σ log θ over all prevalence and confusion entries θ: the log
// density, up to a constant, of the symmetric Dirichlet(1+α) prior.
func logPrior(res *Result, alpha float64) float64 {
	if alpha == 0 {
		return 0
	}
	var s float64
	for _, p := range res.Prevalence {
		s += math.Log(p)
	}
	for _, c := range res.Confusion {
		for _, row := range c {
			for _, p := range row {
				s += math.Log(p)
			}
		}
	}
	return alpha * s
}

// normalise scales p to sum 1; an all-zero row (a rater who never answered,
// with α = 0) becomes uniform so that it carries no information.
func normalise(p []float64) {
	var s float64
	for _, v := range p {
		s += v
	}
	for i := range p {
		if s == 0 {
			p[i] = 1 / float64(len(p))
		} else {
			p[i] /= s
		}
	}
}

// eStep replaces the posteriors and returns the observed-data log-likelihood
// at the current parameters.
func eStep(ratings [][]int, res *Result) float64 {
	k := res.K
	// The logarithms depend on the rater, class and answer only, not on the item:
	// take them once per iteration instead of once per answer.
	logPrev := make([]float64, k)
	for j := range k {
		logPrev[j] = math.Log(res.Prevalence[j])
	}
	logConf := make([][][]float64, len(res.Confusion))
	for r, cr := range res.Confusion {
		logConf[r] = make([][]float64, k)
		for j := range k {
			logConf[r][j] = make([]float64, len(cr[j]))
			for v, x := range cr[j] {
				logConf[r][j][v] = math.Log(x)
			}
		}
	}
	logp := make([]float64, k)
	var ll float64
	for i, row := range ratings {
		copy(logp, logPrev)
		for r, v := range row {
			if v == Missing {
				continue
			}
			lc := logConf[r]
			for j := range k {
				logp[j] += lc[j][v]
			}
		}
		m := math.Inf(-1)
		for _, v := range logp {
			m = max(m, v)
		}
		var s float64
		for _, v := range logp {
			s += math.Exp(v - m)
		}
		lse := m + math.Log(s)
		ll += lse
		t := res.Posterior[i]
		for j := range k {
			t[j] = math.Exp(logp[j] - lse)
		}
	}
	return ll
}
