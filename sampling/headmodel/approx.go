package headmodel

import (
	"fmt"
	"math"
	"sync"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/optimize"
)

// BergScherg approximates a multi-shell sphere by three dipoles in a
// homogeneous sphere of the scalp radius and the innermost conductivity
// (Berg & Scherg 1994): a dipole p at r0 is replaced by dipoles λ_i p at
// μ_i r0, so that
//
//	V(e) ≈ Σ_i λ_i V_hom(e; μ_i r0, p).
//
// In the Legendre series this replaces the degree-n transfer ratio
// f_n = τ_n n/(2n+1) by Σ_i λ_i μ_i^(n−1). The closed form of V_hom makes
// the approximation two orders of magnitude cheaper than the series, which
// is what the dipole fit evaluates hundreds of times per event.
type BergScherg struct {
	Lambda, Mu [3]float64
	R, Sigma   float64
}

// bsTerms is the number of series degrees matched by the fit.
const bsTerms = 200

// BergScherg fits the three-dipole approximation of s. The weights of the
// least-squares fit of f_n are n·t^(n−1) with t = 0.95 r₁/R, the largest
// eccentricity a fitted source is allowed, so that each degree counts as
// much as it can contribute to the potential of the most eccentric
// source; f_1 is matched (near) exactly so that deep sources are exact.
// Fixed μ gives λ by linear least squares; μ is found by Nelder–Mead on
// logit(μ) from a few starts.
// Results are cached per head, as the fit takes tens of milliseconds.
func (s Sphere) BergScherg() (BergScherg, error) {
	if err := s.Validate(); err != nil {
		return BergScherg{}, err
	}
	key := fmt.Sprint(s.Radii, s.Sigma)
	bsCache.Lock()
	defer bsCache.Unlock()
	if bs, ok := bsCache.m[key]; ok {
		return bs, nil
	}
	bs, err := s.fitBergScherg()
	if err == nil {
		bsCache.m[key] = bs
	}
	return bs, err
}

var bsCache = struct {
	sync.Mutex
	m map[string]BergScherg
}{m: map[string]BergScherg{
	fmt.Sprint(DefaultHead().Radii, DefaultHead().Sigma): defaultBergScherg,
}}

// defaultBergScherg is fitBergScherg's result for DefaultHead, written
// with the shortest decimals that read back to the same float64 values,
// so that a process need not spend the fit's tenths of a second on the
// head every detection uses; TestDefaultBergSchergTabulated fits it again
// and requires the same values bit for bit.
var defaultBergScherg = BergScherg{
	Lambda: [3]float64{0.35668086657268433, 0.23807887850570728, 0.06615949865556886},
	Mu:     [3]float64{0.44260321741222247, 0.7687429854154715, 0.9898563436487641},
	R:      0.09,
	Sigma:  0.33,
}

func (s Sphere) fitBergScherg() (BergScherg, error) {
	R := s.Radius()
	bs := BergScherg{R: R, Sigma: s.Sigma[0]}
	f := make([]float64, bsTerms)
	w := make([]float64, bsTerms)
	tmax := 0.95 * s.Radii[0] / R
	for i := range f {
		n := float64(i + 1)
		f[i] = s.transfer(i+1) * n / (2*n + 1)
		w[i] = n * math.Pow(tmax, n-1)
	}
	w[0] = 1e3
	a := mat.NewDense(bsTerms, 3, nil)
	y := mat.NewVecDense(bsTerms, nil)
	for i := range f {
		y.SetVec(i, w[i]*f[i])
	}
	var lam mat.VecDense
	solve := func(mu [3]float64) ([3]float64, float64) {
		for i := range f {
			for j := 0; j < 3; j++ {
				a.Set(i, j, w[i]*math.Pow(mu[j], float64(i)))
			}
		}
		if err := lam.SolveVec(a, y); err != nil {
			return [3]float64{}, math.Inf(1)
		}
		var r mat.VecDense
		r.MulVec(a, &lam)
		r.SubVec(&r, y)
		return [3]float64{lam.AtVec(0), lam.AtVec(1), lam.AtVec(2)}, mat.Dot(&r, &r)
	}
	toMu := func(x []float64) [3]float64 {
		var mu [3]float64
		for j := range mu {
			mu[j] = 1 / (1 + math.Exp(-x[j]))
		}
		return mu
	}
	best := math.Inf(1)
	for _, start := range [][]float64{{-1, 0.5, 2}, {0, 1, 3}, {-2, 0, 1.5}} {
		res, err := optimize.Minimize(optimize.Problem{Func: func(x []float64) float64 {
			_, ssr := solve(toMu(x))
			return ssr
		}}, start, &optimize.Settings{FuncEvaluations: 3000,
			Converger: &optimize.FunctionConverge{Absolute: 1e-30, Iterations: 200}},
			&optimize.NelderMead{SimplexSize: 0.5})
		if err != nil || res == nil {
			continue
		}
		x, fx := res.X, res.F
		if fx < best {
			best = fx
			bs.Mu = toMu(x)
			bs.Lambda, _ = solve(bs.Mu)
		}
	}
	if math.IsInf(best, 1) {
		return BergScherg{}, &mapError{Msg: "Berg–Scherg fit failed"}
	}
	return bs, nil
}

// lead returns the approximate lead vector at scalp direction e for a
// dipole at r0.
func (bs *BergScherg) lead(e, r0 Vec3) Vec3 {
	return bs.leadOnScalp(e.Unit().Scale(bs.R), r0)
}

// leadOnScalp is lead for e already on the scalp (|e| = R). It inlines
// homogeneousLead, since the dipole fit spends most of its time here.
func (bs *BergScherg) leadOnScalp(e, r0 Vec3) Vec3 {
	var g0, g1, g2 float64
	R := bs.R
	for i, mu := range bs.Mu {
		d0, d1, d2 := e[0]-mu*r0[0], e[1]-mu*r0[1], e[2]-mu*r0[2]
		d := math.Sqrt(d0*d0 + d1*d1 + d2*d2)
		ed := e[0]*d0 + e[1]*d1 + e[2]*d2
		lam := bs.Lambda[i]
		a := 2 * lam / (d * d * d)
		den := lam / (R * d * (R*d + ed))
		b := a + R*den // coefficient of d
		c := d * den   // coefficient of e
		g0 += b*d0 + c*e[0]
		g1 += b*d1 + c*e[1]
		g2 += b*d2 + c*e[2]
	}
	k := 1 / (4 * math.Pi * bs.Sigma)
	return Vec3{k * g0, k * g1, k * g2}
}

// leadsOnScalp sets dst[i] to leadOnScalp(electrodes[i], r0), bit for bit,
// and returns their sum Σ dst[i] (added in index order from zero). The
// products μ_j·r0, the factors 2λ_j and 1/(4πσ) are formed once per
// position rather than once per electrode, each by the same operation
// leadOnScalp performs, and the three image dipoles are unrolled; no
// operation is reordered, so every value is the same.
func (bs *BergScherg) leadsOnScalp(dst []Vec3, electrodes []Vec3, r0 Vec3) Vec3 {
	R := bs.R
	m0, m1, m2 := bs.Mu[0], bs.Mu[1], bs.Mu[2]
	a00, a01, a02 := m0*r0[0], m0*r0[1], m0*r0[2]
	a10, a11, a12 := m1*r0[0], m1*r0[1], m1*r0[2]
	a20, a21, a22 := m2*r0[0], m2*r0[1], m2*r0[2]
	l0, l1, l2 := bs.Lambda[0], bs.Lambda[1], bs.Lambda[2]
	t0, t1, t2 := 2*l0, 2*l1, 2*l2
	k := 1 / (4 * math.Pi * bs.Sigma)
	var s0, s1, s2 float64
	dst = dst[:len(electrodes)]
	for i, e := range electrodes {
		e0, e1, e2 := e[0], e[1], e[2]
		var g0, g1, g2 float64
		{
			d0, d1, d2 := e0-a00, e1-a01, e2-a02
			d := math.Sqrt(d0*d0 + d1*d1 + d2*d2)
			ed := e0*d0 + e1*d1 + e2*d2
			a := t0 / (d * d * d)
			den := l0 / (R * d * (R*d + ed))
			b := a + R*den
			c := d * den
			g0 += b*d0 + c*e0
			g1 += b*d1 + c*e1
			g2 += b*d2 + c*e2
		}
		{
			d0, d1, d2 := e0-a10, e1-a11, e2-a12
			d := math.Sqrt(d0*d0 + d1*d1 + d2*d2)
			ed := e0*d0 + e1*d1 + e2*d2
			a := t1 / (d * d * d)
			den := l1 / (R * d * (R*d + ed))
			b := a + R*den
			c := d * den
			g0 += b*d0 + c*e0
			g1 += b*d1 + c*e1
			g2 += b*d2 + c*e2
		}
		{
			d0, d1, d2 := e0-a20, e1-a21, e2-a22
			d := math.Sqrt(d0*d0 + d1*d1 + d2*d2)
			ed := e0*d0 + e1*d1 + e2*d2
			a := t2 / (d * d * d)
			den := l2 / (R * d * (R*d + ed))
			b := a + R*den
			c := d * den
			g0 += b*d0 + c*e0
			g1 += b*d1 + c*e1
			g2 += b*d2 + c*e2
		}
		v := Vec3{k * g0, k * g1, k * g2}
		dst[i] = v
		s0 += v[0]
		s1 += v[1]
		s2 += v[2]
	}
	return Vec3{s0, s1, s2}
}

// Potentials is Sphere.Potentials under the approximation.
func (bs *BergScherg) Potentials(dst []float64, electrodes []Vec3, pos, moment Vec3) {
	if len(dst) != len(electrodes) {
		panic(&lengthError{Field: "dst", Got: len(dst), Want: len(electrodes)})
	}
	for i, e := range electrodes {
		dst[i] = bs.lead(e, pos).Dot(moment)
	}
}
