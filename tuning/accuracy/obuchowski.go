package accuracy

import "math"

// DeLongClustered returns the empirical AUC and Obuchowski's (1997,
// "Nonparametric analysis of clustered ROC curve data", Biometrics
// 53:567–578) variance for events clustered in subjects, the clustered
// extension of DeLong et al. (1988). With I clusters (subjects), M
// positives and N negatives in all, ψ as in DeLong, the structural
// components V10(X) = (1/N) Σ_Y ψ(X,Y) and V01(Y) = (1/M) Σ_X ψ(X,Y) are
// summed per cluster, V10ᵢ and V01ᵢ, with mᵢ positives and nᵢ negatives in
// cluster i, and
//
//	A   = Σᵢ V10ᵢ / M,
//	S10 = I/((I−1)M) Σᵢ (V10ᵢ − mᵢA)²,
//	S01 = I/((I−1)N) Σᵢ (V01ᵢ − nᵢA)²,
//	S11 = I/(I−1) Σᵢ (V10ᵢ − mᵢA)(V01ᵢ − nᵢA),
//	Var(A) = S10/M + S01/N + 2·S11/(M·N).
//
// A cluster holding only positives or only negatives contributes with
// zero on the other side. Pairs are formed across all clusters, as in the
// paper. The variance is NaN with fewer than two clusters or an empty
// class. Design weights are not used (see DeLong). It panics on
// mismatched lengths or NaN scores.
func DeLongClustered(scores []float64, truth []bool, cluster []string) (auc, variance float64) {
	if len(cluster) != len(truth) {
		panic("accuracy: cluster and truth length mismatch")
	}
	c := placements(scores, truth)
	at := map[string]int{}
	var v10, v01, m, n []float64
	ip, in := 0, 0
	for i, t := range truth {
		k, ok := at[cluster[i]]
		if !ok {
			k = len(v10)
			at[cluster[i]] = k
			v10, v01, m, n = append(v10, 0), append(v01, 0), append(m, 0), append(n, 0)
		}
		if t {
			v10[k] += c.v10[ip]
			m[k]++
			ip++
		} else {
			v01[k] += c.v01[in]
			n[k]++
			in++
		}
	}
	I, M, N := float64(len(v10)), float64(ip), float64(in)
	if I < 2 || M == 0 || N == 0 {
		return c.auc, math.NaN()
	}
	a := c.auc
	var s10, s01, s11 float64
	for k := range v10 {
		d1, d0 := v10[k]-m[k]*a, v01[k]-n[k]*a
		s10 += d1 * d1
		s01 += d0 * d0
		s11 += d1 * d0
	}
	f := I / (I - 1)
	s10 *= f / M
	s01 *= f / N
	s11 *= f
	return a, s10/M + s01/N + 2*s11/(M*N)
}
