package synth

import (
	"math"
	"math/rand/v2"
)

// Landmark directions on the unit sphere (x right, y nose, z up) for the
// idealised spherical 10-20 layout: equatorial electrodes 36° apart, Cz at
// the pole (Jasper 1958, "The ten-twenty electrode system of the
// International Federation", Electroenceph clin Neurophysiol 10:371–375).
// They place sources only; electrode positions belong to the forward model.
var (
	dirO1 = sph(-108, 0)
	dirO2 = sph(-72, 0)
	dirPz = sph(-90, 45)
	dirT7 = sph(180, 0)
	dirT8 = sph(0, 0)
	dirF7 = sph(144, 0)
	dirF8 = sph(36, 0)
	dirF3 = sph(130, 40)
	dirF4 = sph(50, 40)
	dirFz = sph(90, 60)
	dirCz = [3]float64{0, 0, 1}
)

// sph returns the unit vector at azimuth az (degrees from +x towards the
// nose) and elevation el (degrees above the equator).
func sph(az, el float64) [3]float64 {
	a, e := az*math.Pi/180, el*math.Pi/180
	return [3]float64{math.Cos(e) * math.Cos(a), math.Cos(e) * math.Sin(a), math.Sin(e)}
}

func scale(v [3]float64, s float64) [3]float64 { return [3]float64{v[0] * s, v[1] * s, v[2] * s} }

func add(u, v [3]float64) [3]float64 { return [3]float64{u[0] + v[0], u[1] + v[1], u[2] + v[2]} }

func dot(u, v [3]float64) float64 { return u[0]*v[0] + u[1]*v[1] + u[2]*v[2] }

func norm(v [3]float64) float64 { return math.Sqrt(dot(v, v)) }

func unit(v [3]float64) [3]float64 { return scale(v, 1/norm(v)) }

func cross(u, v [3]float64) [3]float64 {
	return [3]float64{u[1]*v[2] - u[2]*v[1], u[2]*v[0] - u[0]*v[2], u[0]*v[1] - u[1]*v[0]}
}

// randUnit draws a direction uniformly on the sphere.
func randUnit(r *rand.Rand) [3]float64 {
	for {
		v := [3]float64{r.NormFloat64(), r.NormFloat64(), r.NormFloat64()}
		if n := norm(v); n > 1e-9 {
			return scale(v, 1/n)
		}
	}
}

// tangent draws a unit vector perpendicular to the unit vector d.
func tangent(r *rand.Rand, d [3]float64) [3]float64 {
	for {
		t := cross(d, randUnit(r))
		if n := norm(t); n > 1e-6 {
			return scale(t, 1/n)
		}
	}
}

// jitter rotates the unit vector d by a random angle of at most maxDeg
// degrees, in a random direction.
func jitter(r *rand.Rand, d [3]float64, maxDeg float64) [3]float64 {
	ang := maxDeg * math.Pi / 180 * math.Sqrt(r.Float64()) // uniform over the cap's area
	t := tangent(r, d)
	return unit(add(scale(d, math.Cos(ang)), scale(t, math.Sin(ang))))
}

// cortical draws a direction over the convexity covered by scalp electrodes
// (not far below the 10-20 equator).
func cortical(r *rand.Rand) [3]float64 {
	for {
		d := randUnit(r)
		if d[2] > -0.15 {
			return d
		}
	}
}
