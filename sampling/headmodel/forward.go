package headmodel

import (
	"math"

	"gonum.org/v1/gonum/mat"
)

// seriesTol bounds the neglected tail of the Legendre series relative to
// its first term.
const seriesTol = 1e-13

// maxTerms caps the Legendre series; it is reached only for sources within
// about 1 % of the inner shell's radius.
const maxTerms = 20000

// Potentials writes into dst the potential (V, infinite reference) at each
// electrode of a current dipole with moment (A·m) at pos (m). Electrodes
// are projected radially onto the scalp. dst must have one element per
// electrode.
//
// For a single shell the closed form of Frank (1952) and Brody, Terry &
// Ideker (1973) is used, with d = e − r0 for scalp point e (|e| = R):
//
//	V = 1/(4πσ) p·[ 2d/|d|³ + (R d + |d| e) / (R |d| (R |d| + e·d)) ].
//
// For several shells V is the Legendre series (de Munck & Peters 1993)
//
//	V = 1/(4πσ₁R²) Σ_{n≥1} τ_n t^(n−1) [ n P_n(x) p·ŝ + P_n'(x) (p·ê − x p·ŝ) ]
//
// with t = |r0|/R, ŝ = r0/|r0|, ê = e/|e|, x = ê·ŝ and τ_n the shell
// transfer ratio (see transfer); terms are summed until the tail bound
// τ_n t^(n−1) n(n+1) falls below 1e-13 τ_1. Both forms reduce to
// 3 p·ê/(4πσR²) for a dipole at the centre.
//
// Potentials panics if len(dst) != len(electrodes) or if pos is not
// strictly inside the innermost shell.
func (s Sphere) Potentials(dst []float64, electrodes []Vec3, pos, moment Vec3) {
	if len(dst) != len(electrodes) {
		panic(&lengthError{Field: "dst", Got: len(dst), Want: len(electrodes)})
	}
	lf := s.leadVectors(electrodes, pos)
	for i, g := range lf {
		dst[i] = g.Dot(moment)
	}
}

// LeadField returns the len(electrodes)×3 matrix L with V = L p for a
// dipole at pos, using the same forms as Potentials.
func (s Sphere) LeadField(electrodes []Vec3, pos Vec3) *mat.Dense {
	lf := s.leadVectors(electrodes, pos)
	l := mat.NewDense(len(electrodes), 3, nil)
	for i, g := range lf {
		l.SetRow(i, g[:])
	}
	return l
}

func (s Sphere) leadVectors(electrodes []Vec3, pos Vec3) []Vec3 {
	if err := s.Validate(); err != nil {
		panic(err)
	}
	if pos.Norm() >= s.Radii[0] {
		panic(&mapError{Msg: "dipole position outside the innermost shell"})
	}
	out := make([]Vec3, len(electrodes))
	if len(s.Radii) == 1 {
		for i, e := range electrodes {
			out[i] = homogeneousLead(e, pos, s.Radii[0], s.Sigma[0])
		}
		return out
	}
	R := s.Radius()
	t := pos.Norm() / R
	taus := s.transfers(t)
	shat := pos.Unit()
	if t == 0 {
		shat = Vec3{0, 0, 1} // any direction: only n = 1 survives.
	}
	k := 1 / (4 * math.Pi * s.Sigma[0] * R * R)
	for i, e := range electrodes {
		a, b := seriesLead(taus, t, e.Unit().Dot(shat))
		out[i] = shat.Scale(k * a).Add(e.Unit().Scale(k * b))
	}
	return out
}

// transfers returns τ_1 … τ_N with N large enough for eccentricity t.
func (s Sphere) transfers(t float64) []float64 {
	var taus []float64
	tp := 1.0
	for n := 1; n <= maxTerms; n++ {
		tau := s.transfer(n)
		taus = append(taus, tau)
		fn := float64(n)
		if tau*tp*fn*(fn+1) < seriesTol*taus[0] {
			break
		}
		tp *= t
	}
	return taus
}

// seriesLead returns A = Σ τ_n t^(n−1) (n P_n − x P_n') and
// B = Σ τ_n t^(n−1) P_n', the coefficients of ŝ and ê in the lead vector.
// P_n follows Bonnet's recurrence and P_n' the recurrence
// P'_{n+1} = P'_{n−1} + (2n+1) P_n (Abramowitz & Stegun 1964, chs. 8
// and 22; the chapters from memory), which stays finite at x = ±1. The
// potentials built from it are checked against an independent solution
// with scipy.special.eval_legendre and numpy.linalg.solve in
// TestMultiShellAgainstReference (testdata/gen_sphere.py).
func seriesLead(taus []float64, t, x float64) (a, b float64) {
	pPrev, p := 1.0, x   // P_0, P_1
	dPrev, d := 0.0, 1.0 // P_0', P_1'
	tp := 1.0
	for i, tau := range taus {
		n := float64(i + 1)
		a += tau * tp * (n*p - x*d)
		b += tau * tp * d
		tp *= t
		pNext := ((2*n+1)*x*p - n*pPrev) / (n + 1)
		dNext := dPrev + (2*n+1)*p
		pPrev, p = p, pNext
		dPrev, d = d, dNext
	}
	return a, b
}

// homogeneousLead returns the lead vector g (V = g·p) at scalp direction e
// of a dipole at r0 in a homogeneous sphere of radius R and conductivity
// sigma (Frank 1952; Brody, Terry & Ideker 1973): the dipole field of the
// insulated-sphere point-source potential 2/d − (1/R) ln((R d + R² − e·r0)/2R²).
func homogeneousLead(e, r0 Vec3, R, sigma float64) Vec3 {
	e = e.Unit().Scale(R)
	dv := e.Sub(r0)
	d := dv.Norm()
	g := dv.Scale(2 / (d * d * d))
	den := R * d * (R*d + e.Dot(dv))
	g = g.Add(dv.Scale(R / den)).Add(e.Scale(d / den))
	return g.Scale(1 / (4 * math.Pi * sigma))
}
