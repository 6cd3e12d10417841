package headmodel

import "math"

// Sphere is a head model of concentric spherical shells centred at the
// origin. Radii are the outer radii of the shells in metres, innermost
// (brain) first and scalp last; Sigma their conductivities in S/m.
// Sources must lie inside the innermost shell; electrodes are taken to lie
// on the outer surface (only their direction is used).
type Sphere struct {
	Radii []float64
	Sigma []float64
}

// DefaultHead returns the three-shell head of Rush & Driscoll (1968):
// brain, skull and scalp radii 0.87, 0.92 and 1.0 times a 90 mm scalp
// radius; brain and scalp 0.33 S/m and skull 80 times more resistive
// (0.33/80 ≈ 0.0041 S/m).
func DefaultHead() Sphere {
	const r = 0.09
	return Sphere{
		Radii: []float64{0.87 * r, 0.92 * r, r},
		Sigma: []float64{0.33, 0.33 / 80, 0.33},
	}
}

// Homogeneous returns the single-shell sphere of radius r and
// conductivity sigma.
func Homogeneous(r, sigma float64) Sphere {
	return Sphere{Radii: []float64{r}, Sigma: []float64{sigma}}
}

// Radius returns the scalp (outer) radius.
func (s Sphere) Radius() float64 { return s.Radii[len(s.Radii)-1] }

// Validate reports whether radii are positive and increasing and
// conductivities positive and as many.
func (s Sphere) Validate() error {
	if len(s.Radii) == 0 {
		return &lengthError{Field: "Radii", Got: 0, Want: 1}
	}
	if len(s.Sigma) != len(s.Radii) {
		return &lengthError{Field: "Sigma", Got: len(s.Sigma), Want: len(s.Radii)}
	}
	prev := 0.0
	for i, r := range s.Radii {
		if !(r > prev) || math.IsInf(r, 0) {
			return &shellError{Field: "Radii", Index: i, Value: r, Msg: "radii must be positive, finite and increasing"}
		}
		prev = r
	}
	for i, c := range s.Sigma {
		if !(c > 0) || math.IsInf(c, 0) {
			return &shellError{Field: "Sigma", Index: i, Value: c, Msg: "conductivity must be positive and finite"}
		}
	}
	return nil
}

// transfer returns τ_n, the ratio of the degree-n outer-surface potential
// to the degree-n coefficient of the source's own field in the innermost
// shell, both written in units where the outer radius is 1.
//
// In shell i the degree-n potential is a_i (r/R)^n + b_i (R/r)^(n+1).
// Zero normal current at the scalp gives n a_K = (n+1) b_K; at each
// interface the potential and the normal current σ ∂φ/∂r are continuous
// (de Munck & Peters 1993). Stepping inwards from a_K = n+1, b_K = n, the
// scalp potential is 2n+1 and τ_n = (2n+1)/b_1. For a homogeneous sphere
// τ_n = (2n+1)/n.
func (s Sphere) transfer(n int) float64 {
	k := len(s.Radii) - 1
	R := s.Radii[k]
	fn := float64(n)
	a, b := fn+1, fn
	for i := k - 1; i >= 0; i-- {
		rho := s.Radii[i] / R
		u := math.Pow(rho, fn)
		w := 1 / (u * rho)
		phi := a*u + b*w
		j := s.Sigma[i+1] * (fn*a*u - (fn+1)*b*w) / s.Sigma[i]
		a = ((fn+1)*phi + j) / (2*fn + 1) / u
		b = (fn*phi - j) / (2*fn + 1) / w
	}
	return (2*fn + 1) / b
}
