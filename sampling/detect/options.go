package detect

import (
	"math"

	"github.com/quorate-eeg/quorate/internal/progress"
	"github.com/quorate-eeg/quorate/sampling/archive"
	"github.com/quorate-eeg/quorate/sampling/montage"
)

// Options configures Run, Detect and MeasureAt. Zero values select the
// defaults given beside each field.
type Options struct {
	Recordings []archive.Recording
	Roots      []string // Recording.Root indexes Roots; Recording.Path is relative to it
	OutDir     string   // the study's candidates/ folder
	Workers    int      // recordings processed at once; 1 if < 1
	// Shard and Shards select the recordings whose FNV-1a hash of
	// RecordingID is Shard mod Shards (shard i of n); Shards ≤ 1 takes all.
	Shard, Shards int

	Montage      string     // a montage.ParseKind name; "common-average"
	Bandpass     [2]float64 // Hz; {0.5, 70}, the upper edge capped at 0.45×rate
	NotchHz      float64    // mains notch, Hz; 50; negative for none
	ThresholdMAD float64    // detection threshold on the matched (hat) response, in its robust background scales; 4.5
	BackgroundS  float64    // span of the robust background scale, s; 10
	MergeMS      float64    // cross-channel merge tolerance, ms; 50
	// Cutoffs overrides the criterion cutoffs of DefaultCutoffs, by their
	// candidate column names.
	Cutoffs map[string]float64
	// Progress makes a progress bar; nil shows none.
	Progress func(total int, desc string) progress.Bar
	// Source is the Row.Source of rows made by MeasureAt; "import".
	Source string
	// WindowS is the processing window, s; 120. Memory per recording is
	// proportional to it, never to the recording's length.
	WindowS float64
}

// DefaultCutoffs are the criterion cutoffs, keyed by candidate column name. A
// criterion is met when its feature is at or beyond the cutoff in the direction
// documented in FEATURES.md. The values are common practice or, where no
// convention exists, a documented first guess that the tuner replaces.
var DefaultCutoffs = map[string]float64{
	"c1_duration_ms":        200,  // Kane et al. (2017): spike < 70 ms, sharp wave 70–200 ms
	"c1_sharpness":          1.1,  // FEATURES.md (default cutoffs): chosen with the others for auto_count ≥ 4
	"c2_duration_log_ratio": 0.8,  // |ln| ≥ 0.8: beyond ln 2, half or twice the background half-period, with a margin; FEATURES.md
	"c3_asymmetry":          1.7,  // FEATURES.md (default cutoffs; c3)
	"c4_slow_wave_ratio":    1.0,  // background standard deviations; FEATURES.md (c4)
	"c5_disruption":         0.35, // −½ ln of the post-event ratio of Δx power above the floor (50 % lower); FEATURES.md (c5, default cutoffs)
	"c6_dipole_gof":         0.9,  // FEATURES.md (default cutoffs)
	"c6_field_extent":       2,    // channels at ≥ 50 % of the peak
}

// settings are Options with defaults filled in and the montage parsed.
type settings struct {
	kind    montage.Kind
	band    [2]float64
	notch   float64
	thr     float64
	backS   float64
	mergeS  float64
	windowS float64
	cut     map[string]float64
	workers int
	shard   int
	shards  int
}

func (o *Options) settings() (*settings, error) {
	s := &settings{
		band:    [2]float64{0.5, 70},
		notch:   50,
		thr:     4.5,
		backS:   10,
		mergeS:  0.05,
		windowS: 120,
		workers: max(o.Workers, 1),
		shard:   o.Shard,
		shards:  max(o.Shards, 1),
	}
	s.kind = montage.CommonAverage
	if o.Montage != "" {
		k, err := montage.ParseKind(o.Montage)
		if err != nil {
			return nil, &OptionError{"Montage", o.Montage, err.Error()}
		}
		s.kind = k
	}
	if o.Bandpass != [2]float64{} {
		if !(o.Bandpass[0] > 0 && o.Bandpass[1] > o.Bandpass[0]) {
			return nil, &OptionError{"Bandpass", o.Bandpass, "want 0 < low < high"}
		}
		s.band = o.Bandpass
	}
	switch {
	case o.NotchHz < 0:
		s.notch = 0
	case o.NotchHz > 0:
		s.notch = o.NotchHz
	}
	pos := func(name string, v float64, dst *float64, scale float64) error {
		if v == 0 {
			return nil
		}
		if !(v > 0) || math.IsInf(v, 0) {
			return &OptionError{name, v, "want a positive number"}
		}
		*dst = v * scale
		return nil
	}
	for _, e := range []error{
		pos("ThresholdMAD", o.ThresholdMAD, &s.thr, 1),
		pos("BackgroundS", o.BackgroundS, &s.backS, 1),
		pos("MergeMS", o.MergeMS, &s.mergeS, 1e-3),
		pos("WindowS", o.WindowS, &s.windowS, 1),
	} {
		if e != nil {
			return nil, e
		}
	}
	if s.shards > 1 && (s.shard < 0 || s.shard >= s.shards) {
		return nil, &OptionError{"Shard", s.shard, "want 0 ≤ shard < shards"}
	}
	s.cut = make(map[string]float64, len(DefaultCutoffs))
	for k, v := range DefaultCutoffs {
		s.cut[k] = v
	}
	for k, v := range o.Cutoffs {
		if _, ok := DefaultCutoffs[k]; !ok {
			return nil, &OptionError{"Cutoffs[" + k + "]", v, "unknown cutoff name"}
		}
		if math.IsNaN(v) {
			return nil, &OptionError{"Cutoffs[" + k + "]", v, "NaN"}
		}
		s.cut[k] = v
	}
	return s, nil
}
