package spline

import (
	"fmt"
	"math"
	"sync"

	"github.com/quorate-eeg/quorate/sampling/headmodel"
	"gonum.org/v1/gonum/mat"
)

// DefaultOrder is the spline order m used when New is given m ≤ 0;
// Perrin et al. (1989) recommend m = 4 for potential maps.
const DefaultOrder = 4

// DefaultTerms is the number of Legendre terms used when New is given
// nTerms ≤ 0. For m = 4 the terms fall as n^(−7), so term 50 is below
// 1e-12 of the first (common practice).
const DefaultTerms = 50

// Error reports an invalid argument; Field names it and Index, when
// non-negative, the offending element.
type Error struct {
	Field string
	Index int
	Msg   string
}

func (e *Error) Error() string {
	if e.Index >= 0 {
		return fmt.Sprintf("spline: %s[%d]: %s", e.Field, e.Index, e.Msg)
	}
	return fmt.Sprintf("spline: %s: %s", e.Field, e.Msg)
}

// Coeffs are the spline weights c_i, one per electrode, and the constant
// c_0 of an interpolated map.
type Coeffs struct {
	C  []float64
	C0 float64
}

// Interpolator interpolates maps recorded at a fixed set of electrodes.
// It is safe for concurrent use.
type Interpolator struct {
	el     []headmodel.Vec3 // unit vectors
	w      []float64        // kernel weights
	lambda float64
	lu     mat.LU

	mu    sync.Mutex
	grids map[gridKey]*gridBasis
}

// New prepares spherical-spline interpolation of order m with smoothing
// lambda and nTerms Legendre terms between the given electrodes (only
// their directions matter). The coefficients of a map v solve
// (Perrin et al. 1989; λ > 0 smooths instead of interpolating)
//
//	(G + λI) c + 1·c₀ = v,   1ᵀc = 0,   G_ij = g_m(ê_i·ê_j),
//
// and the map at a point ê is V(ê) = c₀ + Σ c_i g_m(ê·ê_i). The system is
// factorised once (gonum LU). m must be at least 2, for which the kernel
// series converges at x = 1.
func New(electrodes []headmodel.Vec3, m int, lambda float64, nTerms int) (*Interpolator, error) {
	if m <= 0 {
		m = DefaultOrder
	}
	if m < 2 {
		return nil, &Error{Field: "m", Index: -1, Msg: "order must be at least 2"}
	}
	if nTerms <= 0 {
		nTerms = DefaultTerms
	}
	if lambda < 0 || math.IsNaN(lambda) {
		return nil, &Error{Field: "lambda", Index: -1, Msg: "must be non-negative"}
	}
	if len(electrodes) < 2 {
		return nil, &Error{Field: "electrodes", Index: -1, Msg: "need at least two"}
	}
	ip := &Interpolator{w: weights(m, nTerms), lambda: lambda, grids: map[gridKey]*gridBasis{}}
	for i, e := range electrodes {
		n := e.Norm()
		if !(n > 0) || math.IsInf(n, 0) {
			return nil, &Error{Field: "electrodes", Index: i, Msg: "not a usable position"}
		}
		ip.el = append(ip.el, e.Scale(1/n))
	}
	n := len(ip.el)
	a := mat.NewDense(n+1, n+1, nil)
	for i := 0; i < n; i++ {
		for j := 0; j < n; j++ {
			a.Set(i, j, kernel(ip.w, ip.el[i].Dot(ip.el[j])))
		}
		a.Set(i, i, a.At(i, i)+lambda)
		a.Set(i, n, 1)
		a.Set(n, i, 1)
	}
	ip.lu.Factorize(a)
	if c := ip.lu.Cond(); c > 1e14 || math.IsInf(c, 0) || math.IsNaN(c) {
		return nil, &Error{Field: "electrodes", Index: -1, Msg: fmt.Sprintf("spline system is singular (condition %.3g): duplicate electrodes?", c)}
	}
	return ip, nil
}

// Fit returns the spline coefficients of the map v (one value per
// electrode).
func (ip *Interpolator) Fit(v []float64) (Coeffs, error) {
	n := len(ip.el)
	if len(v) != n {
		return Coeffs{}, &Error{Field: "values", Index: -1, Msg: fmt.Sprintf("have %d values for %d electrodes", len(v), n)}
	}
	for i, x := range v {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return Coeffs{}, &Error{Field: "values", Index: i, Msg: "not finite"}
		}
	}
	b := mat.NewVecDense(n+1, append(append([]float64(nil), v...), 0))
	var x mat.VecDense
	if err := ip.lu.SolveVecTo(&x, false, b); err != nil {
		return Coeffs{}, &Error{Field: "electrodes", Index: -1, Msg: err.Error()}
	}
	c := Coeffs{C: make([]float64, n), C0: x.AtVec(n)}
	for i := range c.C {
		c.C[i] = x.AtVec(i)
	}
	return c, nil
}

// Value returns the interpolated map at the direction of point.
func (ip *Interpolator) Value(c Coeffs, point headmodel.Vec3) float64 {
	u := point.Unit()
	s := c.C0
	for i, e := range ip.el {
		s += c.C[i] * kernel(ip.w, u.Dot(e))
	}
	return s
}
