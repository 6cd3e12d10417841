package synth

import "math"

// standInPositions are the idealised spherical 10-20 positions (Jasper
// 1958): equatorial electrodes 36° apart, the inner ring at about 40–45°
// elevation. Approximate, for the stand-in forward model only.
var standInPositions = map[string][3]float64{
	"Fp1": sph(108, 0), "Fp2": sph(72, 0), "F7": sph(144, 0), "F8": sph(36, 0),
	"T7": sph(180, 0), "T8": sph(0, 0), "P7": sph(-144, 0), "P8": sph(-36, 0),
	"O1": sph(-108, 0), "O2": sph(-72, 0),
	"F3": sph(130, 40), "Fz": sph(90, 45), "F4": sph(50, 40),
	"C3": sph(180, 45), "Cz": {0, 0, 1}, "C4": sph(0, 45),
	"P3": sph(-130, 40), "Pz": sph(-90, 45), "P4": sph(-50, 40),
}

// standInForward is a current dipole in an infinite homogeneous medium,
// V(r) = m·(r−r₀) / (4πσ|r−r₀|³) (Nunez & Srinivasan 2006, Electric Fields
// of the Brain, 2nd ed., ch. 1), with σ = 1, re-referenced to the common
// average. Unknown electrodes sit at the vertex.
func standInForward(electrodes []string, pos, m [3]float64) []float64 {
	v := make([]float64, len(electrodes))
	var mean float64
	for i, e := range electrodes {
		r, ok := standInPositions[e]
		if !ok {
			r = [3]float64{0, 0, 1}
		}
		d := [3]float64{r[0] - pos[0], r[1] - pos[1], r[2] - pos[2]}
		l := norm(d)
		v[i] = dot(m, d) / (4 * math.Pi * l * l * l)
		mean += v[i]
	}
	mean /= float64(len(v))
	for i := range v {
		v[i] -= mean
	}
	return v
}
