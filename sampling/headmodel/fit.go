package headmodel

import (
	"math"
	"sort"

	"gonum.org/v1/gonum/mat"
)

// Dipole is an equivalent current dipole fitted to a voltage map.
type Dipole struct {
	Pos    Vec3    // m, head frame
	Moment Vec3    // A·m
	GOF    float64 // 1 − residual variance, common-average reference
	// Orientation classifies Moment against the radius through Pos.
	Orientation OrientationClass
}

// FitOptions tunes Fit. Zero values select the defaults.
type FitOptions struct {
	// GridStep is the spacing of the starting grid as a fraction of the
	// scalp radius (default 0.2: about 300 grid points in the brain).
	GridStep float64
	// MaxEccentricity bounds |Pos| as a fraction of the innermost radius
	// (default 0.95).
	MaxEccentricity float64
	// Starts is the number of best grid points refined (default 2).
	Starts int
	// MaxEval bounds objective evaluations per start (default 300).
	MaxEval int
}

func (o FitOptions) withDefaults() FitOptions {
	if o.GridStep <= 0 {
		o.GridStep = 0.2
	}
	if o.MaxEccentricity <= 0 || o.MaxEccentricity >= 1 {
		o.MaxEccentricity = 0.95
	}
	if o.Starts <= 0 {
		o.Starts = 2
	}
	if o.MaxEval <= 0 {
		o.MaxEval = 300
	}
	return o
}

// Fitter holds what a dipole fit needs for one montage and head: the
// Berg–Scherg approximation of the head and common-average lead fields
// on a starting grid. A Fitter is safe for concurrent use.
type Fitter struct {
	electrodes []Vec3
	head       Sphere
	bs         BergScherg
	opts       FitOptions
	rmax       float64
	grid       []gridPoint
}

type gridPoint struct {
	pos  Vec3
	lead []Vec3 // common-average lead vectors
	inv  [3][3]float64
}

// NewFitter prepares fits of maps recorded at electrodes (projected
// radially onto the scalp of head). At least four electrodes are needed.
func NewFitter(electrodes []Vec3, head Sphere, opts FitOptions) (*Fitter, error) {
	if err := head.Validate(); err != nil {
		return nil, err
	}
	if len(electrodes) < 4 {
		return nil, &lengthError{Field: "electrodes", Got: len(electrodes), Want: 4}
	}
	R := head.Radius()
	f := &Fitter{head: head, opts: opts.withDefaults()}
	for i, e := range electrodes {
		n := e.Norm()
		if !(n > 0) || math.IsInf(n, 0) {
			return nil, &electrodeError{Index: i, Pos: e}
		}
		f.electrodes = append(f.electrodes, e.Scale(R/n))
	}
	bs, err := head.BergScherg()
	if err != nil {
		return nil, err
	}
	f.bs = bs
	f.rmax = f.opts.MaxEccentricity * head.Radii[0]
	h := f.opts.GridStep * R
	k := int(f.rmax / h)
	for i := -k; i <= k; i++ {
		for j := -k; j <= k; j++ {
			for l := -k; l <= k; l++ {
				p := Vec3{float64(i), float64(j), float64(l)}.Scale(h)
				if p.Norm() > f.rmax {
					continue
				}
				g := gridPoint{pos: p, lead: make([]Vec3, len(f.electrodes))}
				m := f.carLead(g.lead, p)
				inv, ok := inverse3(m)
				if !ok {
					continue
				}
				g.inv = inv
				f.grid = append(f.grid, g)
			}
		}
	}
	return f, nil
}

// carLead fills dst with the common-average-referenced lead vectors at pos
// and returns their Gram matrix Σ l lᵀ.
func (f *Fitter) carLead(dst []Vec3, pos Vec3) [3][3]float64 {
	m, _ := f.carLeadProject(dst, pos, nil)
	return m
}

// carLeadProject is carLead that also returns Lᵀw (project) for the
// referenced lead vectors when w is not nil, accumulated in the same loop
// and the same order as project adds them.
func (f *Fitter) carLeadProject(dst []Vec3, pos Vec3, w []float64) ([3][3]float64, Vec3) {
	mean := f.bs.leadsOnScalp(dst, f.electrodes, pos)
	mean = mean.Scale(1 / float64(len(dst)))
	// the Gram matrix's six distinct sums, each in the same order as a
	// full 3×3 loop would add them, so the result is the same bit for bit
	var m00, m01, m02, m11, m12, m22 float64
	var b0, b1, b2 float64
	if w != nil {
		w = w[:len(dst)]
	}
	for i := range dst {
		l := dst[i].Sub(mean)
		dst[i] = l
		m00 += l[0] * l[0]
		m01 += l[0] * l[1]
		m02 += l[0] * l[2]
		m11 += l[1] * l[1]
		m12 += l[1] * l[2]
		m22 += l[2] * l[2]
		if w != nil {
			b0 += l[0] * w[i]
			b1 += l[1] * w[i]
			b2 += l[2] * w[i]
		}
	}
	return [3][3]float64{{m00, m01, m02}, {m01, m11, m12}, {m02, m12, m22}}, Vec3{b0, b1, b2}
}

// Fit fits one equivalent dipole to v (one value per electrode, any
// common reference) with a fresh Fitter; use NewFitter and Fitter.Fit to
// fit many maps from the same montage.
func Fit(v []float64, electrodes []Vec3, head Sphere, opts FitOptions) (Dipole, error) {
	f, err := NewFitter(electrodes, head, opts)
	if err != nil {
		return Dipole{}, err
	}
	return f.Fit(v)
}

// Fit returns the single current dipole that best explains v in the least-
// squares sense. Map and lead field are re-referenced to the common
// average, which makes the result independent of the recording reference.
// For a trial position r the moment is the linear least-squares solution
// p = (LᵀL)⁻¹Lᵀv, leaving the residual variance
//
//	RV(r) = ‖v − L p‖² / ‖v‖²,
//
// which is minimised over r by Nelder–Mead (Nelder & Mead 1965; nelderMead3,
// step for step as gonum's optimize.NelderMead) from the best grid points,
// with positions beyond MaxEccentricity·r₁ penalised as 1 + 100·excess/R.
// GOF = 1 − RV, the share of the map's variance the dipole explains.
// The forward model is the Berg–Scherg approximation of head,
// accurate to about 5e-4 relative RMS (see tests). The final moment is
// solved with gonum's QR least squares.
func (f *Fitter) Fit(v []float64) (Dipole, error) {
	n := len(f.electrodes)
	if len(v) != n {
		return Dipole{}, &lengthError{Field: "v", Got: len(v), Want: n}
	}
	w := make([]float64, n)
	mean := 0.0
	for _, x := range v {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return Dipole{}, &mapError{Msg: "map has non-finite values"}
		}
		mean += x
	}
	mean /= float64(n)
	ss := 0.0
	for i, x := range v {
		w[i] = x - mean
		ss += w[i] * w[i]
	}
	if ss == 0 {
		return Dipole{}, &mapError{Msg: "map is flat after common-average reference"}
	}

	type cand struct {
		pos Vec3
		rv  float64
	}
	cands := make([]cand, 0, len(f.grid))
	for i := range f.grid {
		g := &f.grid[i]
		b := project(g.lead, w)
		cands = append(cands, cand{g.pos, 1 - quad(g.inv, b)/ss})
	}
	starts := min(f.opts.Starts, len(cands))
	if !smallestFirst(cands, starts, func(c cand) float64 { return c.rv }) {
		sort.Slice(cands, func(a, b int) bool { return cands[a].rv < cands[b].rv })
	}

	lead := make([]Vec3, n)
	R := f.head.Radius()
	obj := func(x []float64) float64 {
		p := Vec3{x[0], x[1], x[2]}
		if ex := p.Norm() - f.rmax; ex > 0 {
			return 1 + 100*ex/R
		}
		m, b := f.carLeadProject(lead, p, w)
		inv, ok := inverse3(m)
		if !ok {
			return 1
		}
		return 1 - quad(inv, b)/ss
	}
	best := cand{rv: math.Inf(1)}
	for s := 0; s < starts; s++ {
		c := cands[s]
		res := nelderMead3(obj, c.pos, 0.5*f.opts.GridStep*R, f.opts.MaxEval, 1e-9, 8)
		if !res.ok {
			continue
		}
		if res.f < best.rv {
			best = cand{res.x, res.f}
		}
	}

	f.carLead(lead, best.pos)
	a := mat.NewDense(n, 3, nil)
	for i, l := range lead {
		a.SetRow(i, l[:])
	}
	var p mat.VecDense
	if err := p.SolveVec(a, mat.NewVecDense(n, w)); err != nil {
		return Dipole{}, &mapError{Msg: "singular lead field at fitted position"}
	}
	mom := Vec3{p.AtVec(0), p.AtVec(1), p.AtVec(2)}
	var res mat.VecDense
	res.MulVec(a, &p)
	res.SubVec(&res, mat.NewVecDense(n, w))
	return Dipole{
		Pos:         best.pos,
		Moment:      mom,
		GOF:         1 - mat.Dot(&res, &res)/ss,
		Orientation: Classify(best.pos, mom, f.head.Radii[0]),
	}, nil
}

// smallestFirst moves the k elements of c with the smallest keys to
// c[:k], in increasing order, and reports true, when that order is the
// only one a sort by key could give: the k smallest keys are distinct, no
// other key equals the k-th, and no key is NaN. Otherwise (ties or NaN,
// where an unstable sort's order depends on its algorithm) it reports
// false, having only permuted c, and the caller sorts. A partial selection
// by insertion costs O(k·len(c)) comparisons, against O(len(c)·log len(c))
// for a sort.
func smallestFirst[T any](c []T, k int, key func(T) float64) bool {
	if k <= 0 {
		return true
	}
	for i := 0; i < k; i++ {
		// move the smallest of c[i:] to i; a tie with it is left behind
		m := i
		for j := i + 1; j < len(c); j++ {
			if key(c[j]) < key(c[m]) {
				m = j
			}
		}
		c[i], c[m] = c[m], c[i]
	}
	last := key(c[k-1])
	for i := 0; i < k; i++ {
		if x := key(c[i]); x != x || (i > 0 && !(key(c[i-1]) < x)) {
			return false
		}
	}
	for _, x := range c[k:] {
		if x := key(x); x != x || !(x > last) {
			return false
		}
	}
	return true
}

// project returns Lᵀw for the lead vectors l.
func project(l []Vec3, w []float64) Vec3 {
	var b0, b1, b2 float64
	for j, x := range l {
		b0 += x[0] * w[j]
		b1 += x[1] * w[j]
		b2 += x[2] * w[j]
	}
	return Vec3{b0, b1, b2}
}

// quad returns bᵀ M b for symmetric M.
func quad(m [3][3]float64, b Vec3) float64 {
	s := 0.0
	for i := 0; i < 3; i++ {
		for j := 0; j < 3; j++ {
			s += b[i] * m[i][j] * b[j]
		}
	}
	return s
}

// inverse3 inverts a 3×3 matrix by cofactors, failing when it is
// numerically singular relative to its trace.
func inverse3(m [3][3]float64) ([3][3]float64, bool) {
	var c [3][3]float64
	for i := 0; i < 3; i++ {
		for j := 0; j < 3; j++ {
			i1, i2 := (i+1)%3, (i+2)%3
			j1, j2 := (j+1)%3, (j+2)%3
			c[j][i] = m[i1][j1]*m[i2][j2] - m[i1][j2]*m[i2][j1]
		}
	}
	det := m[0][0]*c[0][0] + m[0][1]*c[1][0] + m[0][2]*c[2][0]
	tr := m[0][0] + m[1][1] + m[2][2]
	if !(math.Abs(det) > 1e-14*tr*tr*tr) {
		return c, false
	}
	for i := range c {
		for j := range c[i] {
			c[i][j] /= det
		}
	}
	return c, true
}
