package headmodel

import "math"

// OrientationClass names the orientation of an equivalent dipole relative
// to the scalp, in the radial/tangential/oblique terms used to describe
// interictal spike sources (Ebersole 1997): a radial source points at the
// overlying scalp and gives a single-signed peak over itself; a tangential
// source lies parallel to the scalp and gives a positive–negative pair.
type OrientationClass int

const (
	// Undetermined: zero moment, or a source so close to the centre
	// (within 5 % of the inner radius) that "radial" has no direction.
	Undetermined OrientationClass = iota
	// Radial: moment within 30° of the radius through the source.
	Radial
	// Oblique: between 30° and 60° from the radius.
	Oblique
	// Tangential: moment within 30° of the plane tangent to the sphere.
	Tangential
)

// RadialMaxAngle and TangentialMinAngle (degrees) split the angle between
// moment and radius into the three classes; equal thirds of 0–90° are
// common practice.
const (
	RadialMaxAngle     = 30.0
	TangentialMinAngle = 60.0
)

func (c OrientationClass) String() string {
	switch c {
	case Radial:
		return "radial"
	case Oblique:
		return "oblique"
	case Tangential:
		return "tangential"
	}
	return "undetermined"
}

// RadialAngle returns the angle in degrees, in [0, 90], between the line
// of the moment and the radius through pos (sign of the moment ignored).
func RadialAngle(pos, moment Vec3) float64 {
	r := pos.Unit()
	return math.Atan2(moment.Cross(r).Norm(), math.Abs(moment.Dot(r))) / deg
}

// Classify returns the orientation class of a dipole with the given
// moment at pos inside a head whose innermost radius is inner.
func Classify(pos, moment Vec3, inner float64) OrientationClass {
	if moment.Norm() == 0 || pos.Norm() < 0.05*inner {
		return Undetermined
	}
	a := RadialAngle(pos, moment)
	switch {
	case a <= RadialMaxAngle:
		return Radial
	case a >= TangentialMinAngle:
		return Tangential
	}
	return Oblique
}
