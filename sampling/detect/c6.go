package detect

import (
	"math"

	"github.com/quorate-eeg/quorate/sampling/headmodel"
)

// fitEccentricity bounds the fitted dipole's distance from the centre, as a
// fraction of the brain radius (0.85: 0.74 of the scalp radius, about 12 mm
// below the brain's surface in the default head). A scalp IED needs several
// square centimetres of synchronous cortex, and the equivalent dipole of
// such an extended patch lies deeper than the patch itself (from memory;
// common practice in source analysis), while the map of a single-electrode
// pop, a burst of muscle or the orbits' dipoles of a blink is more focal
// than any source at that depth can make it: the skull smears a cerebral
// field. Unit: fraction of the brain radius (headmodel.Fitter's bound).
// FEATURES.md (c6) gives the figures the bound was chosen on.
const fitEccentricity = 0.85

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
//	GOF = 1 − ‖m − L p‖² / ‖m‖²
//
// of the single equivalent current dipole (headmodel.Fitter: three-shell
// sphere of Rush & Driscoll 1968, common-average reference) that best
// explains the event's map m (see eventMap), over the good electrodes with
// known 10-10 positions; the dipole's position as a
// fraction of the scalp radius; its orientation class (radial, tangential,
// oblique: angle between moment and radius, headmodel.Classify); and the
// field extent, the channels of the peak's sign at ≥ 50 % of its magnitude
// (headmodel.FieldExtent) of the common-average map v at the peak sample.
// A single-electrode artefact or independent channel noise fits a dipole
// poorly and has extent 1. NaN GOF, empty orientation, when no fitter is
// available (fewer than four positioned electrodes) or the fit fails.
func cerebralField(f *headmodel.Fitter, v, m []float64) fieldResult {
	r := fieldResult{gof: math.NaN(), pos: headmodel.Vec3{math.NaN(), math.NaN(), math.NaN()}}
	r.extent = headmodel.FieldExtent(v)
	if f == nil {
		return r
	}
	d, err := f.Fit(m)
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

// eventMap writes to dst, for each trace of car listed in idx, the least-
// squares regression coefficient of that trace on the reference trace ref
// over the main phase [left, right]:
//
//	m_c = Σ (x_c(t) − x̄_c)(w(t) − w̄) / Σ (w(t) − w̄)²
//
// with w the peak electrode's common-average trace and means over the main
// phase. m is the event's voltage map in units of the peak electrode's
// deflection. Every channel that carries the event's waveform scaled by a
// lead-field gain (the field of one source) contributes that gain, while
// ongoing background, independent of the event's time course, averages
// towards zero over the main phase instead of adding its value at one
// sample: the map at a single sample is the event's field plus one sample
// of background, which for a 3–6 × background transient is a large share.
// A single-electrode pop or per-channel muscle activity, uncorrelated
// across channels, leaves a map concentrated on one or a few electrodes,
// which no cerebral dipole explains. The regression is the
// least-squares spatial pattern of a known time course (the "spatial
// filter" of a single temporal component; Scherg & von Cramon 1985 fitted
// dipoles to the whole time course in the same spirit; from memory). It
// returns NaN for every channel when the reference is flat over the main
// phase.
func eventMap(car [][]float32, idx []int, ref []float32, left, right int, dst []float64) []float64 {
	dst = dst[:0]
	n := float64(right - left + 1)
	var wm float64
	for _, v := range ref[left : right+1] {
		wm += float64(v)
	}
	wm /= n
	var ww float64
	for _, v := range ref[left : right+1] {
		ww += (float64(v) - wm) * (float64(v) - wm)
	}
	for _, c := range idx {
		x := car[c][left : right+1]
		var xm float64
		for _, v := range x {
			xm += float64(v)
		}
		xm /= n
		var s float64
		for i, v := range x {
			s += (float64(v) - xm) * (float64(ref[left+i]) - wm)
		}
		if ww > 0 {
			dst = append(dst, s/ww)
		} else {
			dst = append(dst, math.NaN())
		}
	}
	return dst
}
