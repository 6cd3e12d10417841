package headmodel

import (
	"math"
	"sort"
)

// nmResult is the outcome of nelderMead3: the best vertex at the last major
// iteration and its value; ok is false when the start could not be
// evaluated (+Inf or NaN), as gonum's Minimize then fails.
type nmResult struct {
	x  Vec3
	f  float64
	ok bool
}

// nelderMead3 minimises f over three coordinates from x0 by the simplex
// method of Nelder & Mead (1965, "A simplex method for function
// minimization", Comput J 7:308–313), step for step as gonum's
// optimize.Minimize with optimize.NelderMead{SimplexSize: size} and
// Settings{FuncEvaluations: maxEval, Converger: &FunctionConverge{Absolute:
// absTol, Iterations: iters}} (gonum v0.17, optimize/neldermead.go,
// minimize.go, functionconvergence.go): the same initial simplex (x0 and x0
// plus size along each axis), the same coefficients for three dimensions
// (reflection 1, expansion 1 + 2/3, contraction 3/4 − 1/6, shrink 1 − 1/3),
// the same vertex ordering (sort.Sort), the same arithmetic order, and the
// same stopping: after the maxEval-th evaluation, or when the best value of
// iters consecutive major iterations has not improved by more than absTol.
// It returns what Minimize returns, without Minimize's goroutines and
// channels, which cost about as much as the lead-field evaluations
// themselves in a 19-electrode fit. TestNelderMeadMatchesGonum checks the
// two agree bit for bit.
func nelderMead3(f func(x []float64) float64, x0 Vec3, size float64, maxEval int, absTol float64, iters int) nmResult {
	const dim = 3
	var (
		vbuf     [dim + 1][dim]float64
		vertices [dim + 1][]float64
		values   [dim + 1]float64
		centroid [dim]float64
		x        [dim]float64
		refl     [dim]float64
		evals    int
		opt      = nmResult{f: math.Inf(1), ok: true}
		best     float64
		stale    int
		first    = true
	)
	for i := range vertices {
		vertices[i] = vbuf[i][:]
	}
	reflection := 1.0
	expansion := 1 + 2/float64(dim)
	contraction := 0.75 - 1/(2*float64(dim))
	shrink := 1 - 1/float64(dim)
	// eval evaluates at x; false once the evaluation budget is spent
	eval := func() (float64, bool) {
		v := f(x[:])
		evals++
		return v, !(maxEval > 0 && evals >= maxEval)
	}
	// major records a major iteration at the best vertex; false when the
	// convergence test stops the search
	major := func(fx float64, px []float64) bool {
		opt.f = fx
		copy(opt.x[:], px)
		if math.IsInf(fx, -1) {
			return false
		}
		if first {
			best, first = fx, false
			return true
		}
		if iters == 0 {
			return true
		}
		maxAbs := math.Max(math.Abs(fx), math.Abs(best))
		if fx < best && best-fx > 0*maxAbs+absTol {
			best, stale = fx, 0
			return true
		}
		stale++
		return stale < iters
	}
	centre := func() {
		centroid = [dim]float64{}
		for i := range dim {
			for j, v := range vertices[i] {
				centroid[j] += v
			}
		}
		for i := range centroid {
			centroid[i] /= float64(dim)
		}
	}
	replaceWorst := func(px []float64, fx float64) {
		copy(vertices[dim], px)
		values[dim] = fx
		for i := dim - 1; i >= 0; i-- {
			if values[i] < fx {
				break
			}
			vertices[i], vertices[i+1] = vertices[i+1], vertices[i]
			values[i], values[i+1] = values[i+1], values[i]
		}
		for j := range centroid {
			centroid[j] += -1 / float64(dim) * vertices[dim][j]
		}
		for j := range centroid {
			centroid[j] += 1 / float64(dim) * px[j]
		}
	}
	// toward sets x = centroid + scale·(centroid − worst)
	toward := func(scale float64) {
		for j := range x {
			x[j] = centroid[j] - vertices[dim][j]
			x[j] *= scale
			x[j] += centroid[j]
		}
	}

	x = x0
	f0, more := eval()
	if math.IsInf(f0, 1) || math.IsNaN(f0) {
		return nmResult{}
	}
	if !more || !major(f0, x[:]) {
		return opt
	}
	// the initial simplex
	copy(vertices[dim], x[:])
	values[dim] = f0
	for i := range dim {
		copy(x[:], vertices[dim])
		x[i] += size
		v, more := eval()
		if !more {
			return opt
		}
		values[i] = v
		copy(vertices[i], x[:])
	}
	sort.Sort(vertexSorter{vertices[:], values[:]})
	centre()
	for major(values[0], vertices[0]) {
		toward(reflection)
		refl = x
		fr, more := eval()
		if !more {
			return opt
		}
		switch {
		case fr >= values[0] && fr < values[dim-1]:
			replaceWorst(x[:], fr)
			continue
		case fr < values[0]:
			toward(reflection * expansion)
			fe, more := eval()
			if !more {
				return opt
			}
			if fe < fr {
				replaceWorst(x[:], fe)
			} else {
				replaceWorst(refl[:], fr)
			}
			continue
		case fr < values[dim]:
			toward(reflection * contraction)
			fc, more := eval()
			if !more {
				return opt
			}
			if fc <= fr {
				replaceWorst(x[:], fc)
				continue
			}
		default:
			toward(-contraction)
			fc, more := eval()
			if !more {
				return opt
			}
			if fc < values[dim] {
				replaceWorst(x[:], fc)
				continue
			}
		}
		// shrink towards the best vertex
		for i := 1; i <= dim; i++ {
			for j := range x {
				x[j] = vertices[i][j] - vertices[0][j]
				x[j] *= shrink
				x[j] += vertices[0][j]
			}
			v, more := eval()
			if !more {
				return opt
			}
			copy(vertices[i], x[:])
			values[i] = v
		}
		sort.Sort(vertexSorter{vertices[:], values[:]})
		centre()
	}
	return opt
}

// vertexSorter orders simplex vertices by value, as gonum's does.
type vertexSorter struct {
	vertices [][]float64
	values   []float64
}

func (n vertexSorter) Len() int           { return len(n.values) }
func (n vertexSorter) Less(i, j int) bool { return n.values[i] < n.values[j] }
func (n vertexSorter) Swap(i, j int) {
	n.values[i], n.values[j] = n.values[j], n.values[i]
	n.vertices[i], n.vertices[j] = n.vertices[j], n.vertices[i]
}
