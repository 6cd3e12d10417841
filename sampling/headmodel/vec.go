package headmodel

import "math"

// Vec3 is a point or direction in the head frame (x right, y anterior,
// z up).
type Vec3 [3]float64

// Add returns a+b.
func (a Vec3) Add(b Vec3) Vec3 { return Vec3{a[0] + b[0], a[1] + b[1], a[2] + b[2]} }

// Sub returns a-b.
func (a Vec3) Sub(b Vec3) Vec3 { return Vec3{a[0] - b[0], a[1] - b[1], a[2] - b[2]} }

// Scale returns s·a.
func (a Vec3) Scale(s float64) Vec3 { return Vec3{s * a[0], s * a[1], s * a[2]} }

// Dot returns a·b.
func (a Vec3) Dot(b Vec3) float64 { return a[0]*b[0] + a[1]*b[1] + a[2]*b[2] }

// Cross returns a×b.
func (a Vec3) Cross(b Vec3) Vec3 {
	return Vec3{a[1]*b[2] - a[2]*b[1], a[2]*b[0] - a[0]*b[2], a[0]*b[1] - a[1]*b[0]}
}

// Norm returns the Euclidean length of a.
func (a Vec3) Norm() float64 { return math.Sqrt(a.Dot(a)) }

// Unit returns a scaled to unit length; the zero vector is returned as is.
func (a Vec3) Unit() Vec3 {
	n := a.Norm()
	if n == 0 {
		return a
	}
	return a.Scale(1 / n)
}

// Angle returns the angle between a and b in radians, in [0, π].
// atan2 of the cross and dot products keeps small angles accurate where
// acos of the cosine would not.
func (a Vec3) Angle(b Vec3) float64 {
	return math.Atan2(a.Cross(b).Norm(), a.Dot(b))
}

// ScaleAll returns the points multiplied by r, e.g. to place unit-sphere
// electrode positions on a scalp of radius r.
func ScaleAll(ps []Vec3, r float64) []Vec3 {
	out := make([]Vec3, len(ps))
	for i, p := range ps {
		out[i] = p.Scale(r)
	}
	return out
}
