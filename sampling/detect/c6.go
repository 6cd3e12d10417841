package detect

import (
	"math"

	"github.com/quorate-eeg/quorate/sampling/headmodel"
)

// fieldResult is criterion 6's measures.
type fieldResult struct {
	gof    float64
	pos    headmodel.Vec3 // fraction of the scalp radius, head frame
	orient string
	extent int
}

// cerebralField measures criterion 6, a field suggesting a cerebral dipolar
// source (Kane et al. 2017): the goodness of fit
//
//	GOF = 1 − ‖v − L p‖² / ‖v‖²
//
// of the single equivalent current dipole (headmodel.Fitter: three-shell
// sphere of Rush & Driscoll 1968, common-average reference) that best
// explains the common-average voltage map v at the peak sample, over the
// good electrodes with known 10-10 positions; the dipole's position as a
// fraction of the scalp radius; its orientation class (radial, tangential,
// oblique: angle between moment and radius, headmodel.Classify); and the
// field extent, the channels of the peak's sign at ≥ 50 % of its magnitude
// (headmodel.FieldExtent). A single-electrode artefact or independent
// channel noise fits a dipole poorly and has extent 1. NaN GOF, empty
// orientation, when no fitter is available (fewer than four positioned
// electrodes) or the fit fails.
func cerebralField(f *headmodel.Fitter, v []float64) fieldResult {
	r := fieldResult{gof: math.NaN(), pos: headmodel.Vec3{math.NaN(), math.NaN(), math.NaN()}}
	r.extent = headmodel.FieldExtent(v)
	if f == nil {
		return r
	}
	d, err := f.Fit(v)
	if err != nil {
		return r
	}
	r.gof = d.GOF
	r.pos = d.Pos.Scale(1 / headmodel.DefaultHead().Radius())
	if d.Orientation != headmodel.Undetermined {
		r.orient = d.Orientation.String()
	}
	return r
}
