package candidate

import (
	"crypto/sha256"
	"encoding/hex"
	"fmt"
)

// Row is one candidate event. Feature columns are NaN where a feature could not be
// measured (for example c6 with too few electrodes); the criterion's Met is then false.
type Row struct {
	EventID     string   `parquet:"event_id"`
	RecordingID string   `parquet:"recording_id,dict"`
	SubjectKey  string   `parquet:"subject_key,dict"`
	Source      string   `parquet:"source,dict"` // "builtin", or "import:NAME" for an imported detector
	OnsetS      float64  `parquet:"onset_s"`     // peak time, seconds from the recording start
	PeakChannel string   `parquet:"peak_channel,dict"`
	Polarity    string   `parquet:"polarity,dict"` // "negative" or "positive" (surface, common average)
	Lobe        string   `parquet:"lobe,dict"`     // frontal, temporal, central, parietal, occipital
	Side        string   `parquet:"side,dict"`     // left, right, midline
	Region      string   `parquet:"region,dict"`   // lobe-side, e.g. "temporal-left"
	Channels    []string `parquet:"channels,list"` // involved channels
	AmplitudeUV float64  `parquet:"amplitude_uv"`
	State       string   `parquet:"state,dict"` // vigilance state from annotations, or "unknown"

	// c1 spiky morphology
	C1DurationMS float64 `parquet:"c1_duration_ms"`
	C1Sharpness  float64 `parquet:"c1_sharpness"`
	C1Phases     int32   `parquet:"c1_phases"`
	// c2 duration unlike the background
	C2DurationLogRatio float64 `parquet:"c2_duration_log_ratio"`
	C2BackgroundMS     float64 `parquet:"c2_background_period_ms"`
	// c3 asymmetry
	C3Asymmetry float64 `parquet:"c3_asymmetry"`
	C3RiseMS    float64 `parquet:"c3_rise_ms"`
	C3FallMS    float64 `parquet:"c3_fall_ms"`
	// c4 after-going slow wave
	C4SlowWaveRatio float64 `parquet:"c4_slow_wave_ratio"`
	// c5 background disruption
	C5Disruption float64 `parquet:"c5_disruption"`
	// c6 cerebral field
	C6DipoleGOF   float64 `parquet:"c6_dipole_gof"`
	C6DipoleX     float64 `parquet:"c6_dipole_x"`
	C6DipoleY     float64 `parquet:"c6_dipole_y"`
	C6DipoleZ     float64 `parquet:"c6_dipole_z"`
	C6Orientation string  `parquet:"c6_orientation,dict"` // radial, tangential, oblique, or "" when not fitted
	C6FieldExtent int32   `parquet:"c6_field_extent"`

	C1Met     bool    `parquet:"c1_met"`
	C2Met     bool    `parquet:"c2_met"`
	C3Met     bool    `parquet:"c3_met"`
	C4Met     bool    `parquet:"c4_met"`
	C5Met     bool    `parquet:"c5_met"`
	C6Met     bool    `parquet:"c6_met"`
	AutoCount int32   `parquet:"auto_count"`
	Score     float64 `parquet:"score"`        // the built-in ranking score
	Imported  float64 `parquet:"import_score"` // an imported detector's score, NaN for built-in rows
}

// Met returns the six criterion decisions in order c1…c6.
func (r *Row) Met() [6]bool {
	return [6]bool{r.C1Met, r.C2Met, r.C3Met, r.C4Met, r.C5Met, r.C6Met}
}

// SetMet stores the six decisions and their count.
func (r *Row) SetMet(m [6]bool) {
	r.C1Met, r.C2Met, r.C3Met, r.C4Met, r.C5Met, r.C6Met = m[0], m[1], m[2], m[3], m[4], m[5]
	r.AutoCount = 0
	for _, v := range m {
		if v {
			r.AutoCount++
		}
	}
}

// Features returns the one headline feature per criterion, in order c1…c6, that the
// tuner sweeps: sharpness, duration log ratio, asymmetry, slow-wave ratio, disruption,
// dipole goodness of fit.
func (r *Row) Features() [6]float64 {
	return [6]float64{r.C1Sharpness, r.C2DurationLogRatio, r.C3Asymmetry, r.C4SlowWaveRatio, r.C5Disruption, r.C6DipoleGOF}
}

// FeatureNames are the column names of Features, in order.
var FeatureNames = [6]string{"c1_sharpness", "c2_duration_log_ratio", "c3_asymmetry", "c4_slow_wave_ratio", "c5_disruption", "c6_dipole_gof"}

// EventID names an event by where it is, so that the same event found again (a resumed
// run, another shard layout) gets the same id: the recording, the source and the peak
// sample.
func EventID(recordingID, source string, peakSample int64) string {
	h := sha256.Sum256([]byte(fmt.Sprintf("%s\x00%s\x00%d", recordingID, source, peakSample)))
	return "ev-" + hex.EncodeToString(h[:8])
}
