package export

import "time"

// EventRow is one row of the events table: one drawn event. Pointer fields are
// nullable: null where a value is missing (a control has no features; a feature that
// could not be measured; a label the panel left undetermined).
type EventRow struct {
	EventID     string  `parquet:"event_id"`
	SubjectKey  string  `parquet:"subject_key,dict"`
	RecordingID string  `parquet:"recording_id,dict"`
	OnsetS      float64 `parquet:"onset_s"`
	Kind        string  `parquet:"kind,dict"`
	Stratum     string  `parquet:"stratum,dict"`
	Pi          float64 `parquet:"inclusion_probability"`
	Weight      float64 `parquet:"design_weight"`
	Phase       int32   `parquet:"phase"`

	Source      *string  `parquet:"source,optional,dict"`
	Region      *string  `parquet:"region,optional,dict"`
	Lobe        *string  `parquet:"lobe,optional,dict"`
	Side        *string  `parquet:"side,optional,dict"`
	PeakChannel *string  `parquet:"peak_channel,optional,dict"`
	Polarity    *string  `parquet:"polarity,optional,dict"`
	State       *string  `parquet:"state,optional,dict"`
	Channels    []string `parquet:"channels,list"`
	AmplitudeUV *float64 `parquet:"amplitude_uv,optional"`

	C1DurationMS       *float64 `parquet:"c1_duration_ms,optional"`
	C1Sharpness        *float64 `parquet:"c1_sharpness,optional"`
	C1Phases           *int32   `parquet:"c1_phases,optional"`
	C2DurationLogRatio *float64 `parquet:"c2_duration_log_ratio,optional"`
	C2BackgroundMS     *float64 `parquet:"c2_background_period_ms,optional"`
	C3Asymmetry        *float64 `parquet:"c3_asymmetry,optional"`
	C3RiseMS           *float64 `parquet:"c3_rise_ms,optional"`
	C3FallMS           *float64 `parquet:"c3_fall_ms,optional"`
	C4SlowWaveRatio    *float64 `parquet:"c4_slow_wave_ratio,optional"`
	C5Disruption       *float64 `parquet:"c5_disruption,optional"`
	C6DipoleGOF        *float64 `parquet:"c6_dipole_gof,optional"`
	C6DipoleX          *float64 `parquet:"c6_dipole_x,optional"`
	C6DipoleY          *float64 `parquet:"c6_dipole_y,optional"`
	C6DipoleZ          *float64 `parquet:"c6_dipole_z,optional"`
	C6Orientation      *string  `parquet:"c6_orientation,optional,dict"`
	C6FieldExtent      *int32   `parquet:"c6_field_extent,optional"`

	C1Met     *bool    `parquet:"c1_met,optional"`
	C2Met     *bool    `parquet:"c2_met,optional"`
	C3Met     *bool    `parquet:"c3_met,optional"`
	C4Met     *bool    `parquet:"c4_met,optional"`
	C5Met     *bool    `parquet:"c5_met,optional"`
	C6Met     *bool    `parquet:"c6_met,optional"`
	AutoCount *int32   `parquet:"auto_count,optional"`
	Score     *float64 `parquet:"score,optional"`
	Imported  *float64 `parquet:"import_score,optional"`

	Raters          *int32  `parquet:"raters,optional"`
	C1Present       *int32  `parquet:"c1_present_votes,optional"`
	C1Absent        *int32  `parquet:"c1_absent_votes,optional"`
	C1Majority      *string `parquet:"c1_majority,optional,dict"`
	C2Present       *int32  `parquet:"c2_present_votes,optional"`
	C2Absent        *int32  `parquet:"c2_absent_votes,optional"`
	C2Majority      *string `parquet:"c2_majority,optional,dict"`
	C3Present       *int32  `parquet:"c3_present_votes,optional"`
	C3Absent        *int32  `parquet:"c3_absent_votes,optional"`
	C3Majority      *string `parquet:"c3_majority,optional,dict"`
	C4Present       *int32  `parquet:"c4_present_votes,optional"`
	C4Absent        *int32  `parquet:"c4_absent_votes,optional"`
	C4Majority      *string `parquet:"c4_majority,optional,dict"`
	C5Present       *int32  `parquet:"c5_present_votes,optional"`
	C5Absent        *int32  `parquet:"c5_absent_votes,optional"`
	C5Majority      *string `parquet:"c5_majority,optional,dict"`
	C6Present       *int32  `parquet:"c6_present_votes,optional"`
	C6Absent        *int32  `parquet:"c6_absent_votes,optional"`
	C6Majority      *string `parquet:"c6_majority,optional,dict"`
	CriteriaPresent *int32  `parquet:"criteria_present,optional"`
	VerdictYes      *int32  `parquet:"epileptiform_votes,optional"`
	VerdictNo       *int32  `parquet:"not_epileptiform_votes,optional"`
	Verdict         *string `parquet:"verdict,optional,dict"`

	DSProbability *float64 `parquet:"ds_probability,optional"`
	RefPanel      *bool    `parquet:"ref_panel,optional"`
	RefDS         *bool    `parquet:"ref_dawid_skene,optional"`
	RefExternal   *bool    `parquet:"ref_external,optional"`
	OPDecision    *bool    `parquet:"op_decision,optional"`
}

// RatingRow is one row of the ratings table: one rater's answers on one item.
type RatingRow struct {
	EventID      string  `parquet:"event_id"`
	Rater        string  `parquet:"rater,dict"`
	Packet       string  `parquet:"packet,dict"`
	ItemCode     string  `parquet:"item_code"`
	C1           *bool   `parquet:"c1,optional"`
	C2           *bool   `parquet:"c2,optional"`
	C3           *bool   `parquet:"c3,optional"`
	C4           *bool   `parquet:"c4,optional"`
	C5           *bool   `parquet:"c5,optional"`
	C6           *bool   `parquet:"c6,optional"`
	Epileptiform *bool   `parquet:"epileptiform,optional"`
	Confidence   *int32  `parquet:"confidence,optional"`
	Duplicate    bool    `parquet:"duplicate"`
	Comment      *string `parquet:"comment,optional"`
}

// RecordingRow is one row of the recordings table, de-identified: no file name, no
// folder, and no calendar date unless shifted.
type RecordingRow struct {
	RecordingID     string     `parquet:"recording_id,dict"`
	SubjectKey      string     `parquet:"subject_key,dict"`
	Format          string     `parquet:"format,dict"`
	StartDate       *time.Time `parquet:"start_date,optional,date"`
	StartYear       *int32     `parquet:"start_year,optional"`
	StartTimeOfDayS float64    `parquet:"start_time_of_day_s"`
	DateShifted     bool       `parquet:"date_shifted"`
	DurationS       float64    `parquet:"duration_s"`
	RecordCount     int64      `parquet:"record_count"`
	RecordDurationS float64    `parquet:"record_duration_s"`
	EEGChannelCount int32      `parquet:"eeg_channel_count"`
	EEGChannels     []string   `parquet:"eeg_channels,list"`
	SampleRatesHz   []float64  `parquet:"sample_rates_hz,list"`
	AnnotationCount int64      `parquet:"annotation_count"`
	Discontinuities int64      `parquet:"discontinuities"`
}

// EpochRow is one row of epochs.parquet: one channel of the window around one event.
// One row per event × channel (rather than a list of lists per event) because every
// analytic engine reads a flat list<float> column directly into arrays.
type EpochRow struct {
	EventID      string    `parquet:"event_id"`
	RecordingID  string    `parquet:"recording_id,dict"`
	Channel      string    `parquet:"channel,dict"`
	ChannelIndex int32     `parquet:"channel_index"`
	Montage      string    `parquet:"montage,dict"`
	SampleRateHz float64   `parquet:"sample_rate_hz"`
	WindowOnsetS float64   `parquet:"window_onset_s"`
	EventOffsetS float64   `parquet:"event_offset_s"`
	PadBefore    int32     `parquet:"pad_before"`
	PadAfter     int32     `parquet:"pad_after"`
	Padded       bool      `parquet:"padded"`
	Samples      []float32 `parquet:"samples,list"`
}
