package detect

import (
	"math"

	"github.com/quorate-eeg/quorate/sampling/candidate"
)

// decide sets the six criterion decisions of row at the cutoffs cut, and the
// ranking score. A NaN feature is not met. Directions (see FEATURES.md):
// c1 duration below its cutoff and sharpness at or above; c2, c3, c4, c5
// and the c6 GOF at or above, with the c6 field extent at or above its own.
//
// The score ranks candidates for the draw and the panel:
//
//	score = auto_count + 1/(1 + exp(−(z − θ)))
//
// with z the main-phase amplitude in background scales and θ the detection
// threshold: the number of criteria met, broken by a logistic of how far
// the event stands out. The logistic part is in (0, 1), so an event meeting
// more criteria always ranks higher, and among equals the larger one first.
func decide(row *candidate.Row, z, thr float64, cut map[string]float64) {
	ge := func(v float64, k string) bool { return v >= cut[k] }
	var m [6]bool
	m[0] = row.C1DurationMS < cut["c1_duration_ms"] && ge(row.C1Sharpness, "c1_sharpness")
	m[1] = ge(row.C2DurationLogRatio, "c2_duration_log_ratio")
	m[2] = ge(row.C3Asymmetry, "c3_asymmetry")
	m[3] = ge(row.C4SlowWaveRatio, "c4_slow_wave_ratio")
	m[4] = ge(row.C5Disruption, "c5_disruption")
	m[5] = ge(row.C6DipoleGOF, "c6_dipole_gof") && float64(row.C6FieldExtent) >= cut["c6_field_extent"]
	row.SetMet(m)
	l := 0.0
	if !math.IsNaN(z) {
		l = 1 / (1 + math.Exp(-(z - thr)))
	}
	row.Score = float64(row.AutoCount) + l
}
