package headmodel

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/optimize"
)

// TestNelderMeadMatchesGonum checks nelderMead3 against gonum's
// optimize.Minimize with NelderMead, the general-purpose implementation it
// follows step for step (gonum v0.17): same minimiser and value bit for bit
// on Rosenbrock's function (Rosenbrock 1960, Comput J 3:175–184, the
// standard test of Nelder–Mead), on a function with a flat region, under a
// tight evaluation budget, and on the dipole fit's own residual variance for
// random maps.
func TestNelderMeadMatchesGonum(t *testing.T) {
	rosen := func(x []float64) float64 {
		return 100*(x[1]-x[0]*x[0])*(x[1]-x[0]*x[0]) + (1-x[0])*(1-x[0]) + (x[2]-x[1])*(x[2]-x[1])
	}
	flat := func(x []float64) float64 { return math.Floor(4*math.Abs(x[0]-0.3)) + x[1]*x[1] + math.Abs(x[2]) }
	penalised := func(x []float64) float64 {
		if n := math.Sqrt(x[0]*x[0] + x[1]*x[1] + x[2]*x[2]); n > 1 {
			return 1 + 100*(n-1)
		}
		return (x[0]-0.5)*(x[0]-0.5) + 2*(x[1]+0.2)*(x[1]+0.2) + x[2]*x[2]*x[2]*x[2]
	}
	// a rugged function, on which contractions fail and the simplex shrinks
	rugged := func(x []float64) float64 {
		return x[0]*x[0] + x[1]*x[1] + x[2]*x[2] + 0.5*math.Sin(37*x[0])*math.Cos(29*x[1]+x[2])
	}
	// the dipole objective for a random map on the 10-20 electrodes
	var pos []Vec3
	for _, n := range []string{"Fp1", "Fp2", "F7", "F3", "Fz", "F4", "F8", "T3", "C3", "Cz", "C4", "T4", "T5", "P3", "Pz", "P4", "T6", "O1", "O2"} {
		p, _ := Position(n)
		pos = append(pos, p)
	}
	f, err := NewFitter(pos, DefaultHead(), FitOptions{MaxEccentricity: 0.85})
	if err != nil {
		t.Fatal(err)
	}
	rng := rand.New(rand.NewPCG(3, 4))
	w := make([]float64, len(pos))
	lead := make([]Vec3, len(pos))
	R := f.head.Radius()
	dip := func(x []float64) float64 {
		p := Vec3{x[0], x[1], x[2]}
		if ex := p.Norm() - f.rmax; ex > 0 {
			return 1 + 100*ex/R
		}
		inv, ok := inverse3(f.carLead(lead, p))
		if !ok {
			return 1
		}
		var ss float64
		for _, v := range w {
			ss += v * v
		}
		return 1 - quad(inv, project(lead, w))/ss
	}
	type run struct {
		name    string
		f       func([]float64) float64
		x0      Vec3
		size    float64
		maxEval int
		tol     float64
		iters   int
	}
	runs := []run{
		{"rosenbrock", rosen, Vec3{-1.2, 1, 0.5}, 0.5, 300, 1e-9, 8},
		{"rosenbrock long", rosen, Vec3{-1.2, 1, 0.5}, 0.1, 5000, 1e-12, 20},
		{"rosenbrock budget", rosen, Vec3{2, 2, 2}, 0.3, 37, 1e-9, 8},
		{"flat", flat, Vec3{1, 1, 1}, 0.25, 300, 1e-9, 8},
		{"rugged", rugged, Vec3{1.5, -1, 0.7}, 0.6, 400, 1e-9, 8},
		{"rugged 2", rugged, Vec3{-0.3, 0.8, 2}, 0.05, 400, 1e-9, 8},
		{"penalised", penalised, Vec3{0.9, 0.3, 0.2}, 0.4, 300, 1e-9, 8},
	}
	for k := range 6 {
		runs = append(runs, run{"dipole", dip, f.grid[rng.IntN(len(f.grid))].pos, 0.5 * 0.2 * R, 300, 1e-9, 8 + k})
	}
	for _, r := range runs {
		if r.name == "dipole" {
			var m float64
			for i := range w {
				w[i] = rng.NormFloat64()
				m += w[i]
			}
			for i := range w {
				w[i] -= m / float64(len(w))
			}
		}
		want, err := optimize.Minimize(optimize.Problem{Func: r.f}, r.x0[:], &optimize.Settings{
			FuncEvaluations: r.maxEval,
			Converger:       &optimize.FunctionConverge{Absolute: r.tol, Iterations: r.iters},
		}, &optimize.NelderMead{SimplexSize: r.size})
		if err != nil {
			t.Fatal(r.name, err)
		}
		got := nelderMead3(r.f, r.x0, r.size, r.maxEval, r.tol, r.iters)
		if !got.ok || got.f != want.F || got.x != (Vec3{want.X[0], want.X[1], want.X[2]}) {
			t.Errorf("%s: got %v at %v, gonum %v at %v (%d evaluations)", r.name, got.f, got.x, want.F, want.X, want.Stats.FuncEvaluations)
		}
	}
	// a start gonum refuses (+Inf) is refused too
	if r := nelderMead3(func([]float64) float64 { return math.Inf(1) }, Vec3{}, 1, 10, 1e-9, 8); r.ok {
		t.Error("a start at +Inf was accepted")
	}
}
