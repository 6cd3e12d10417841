package textbook

import (
	"errors"
	"fmt"
	"math"

	"github.com/quorate-eeg/quorate/sampling/synth"
)

// Config describes one recording. Zero values take the defaults beside each
// field.
type Config struct {
	Seed       uint64
	Rate       float64  // samples per second; 256
	Duration   float64  // seconds; 240
	Electrodes []string // synth.DefaultElectrodes (19 of the 10-20 system)

	IEDRate       float64 // IEDs per minute; 0 means none (a control)
	LookalikeRate float64 // benign variants and artefacts per minute; 0 means none

	AlphaFreq float64 // posterior dominant rhythm, Hz; drawn from 8.5–11.5 if 0
	// Focus is the direction of the subject's irritative zone (need not be
	// normalised); drawn from the seed if zero, temporal with probability ½.
	Focus [3]float64
}

// ConfigError reports an invalid Config field.
type ConfigError struct {
	Field  string
	Value  any
	Reason string
}

func (e *ConfigError) Error() string {
	return fmt.Sprintf("textbook: config %s=%v: %s", e.Field, e.Value, e.Reason)
}

// ErrConfig is matched by errors.Is on a ConfigError.
var ErrConfig = errors.New("textbook: unusable configuration")

// Unwrap gives ErrConfig.
func (e *ConfigError) Unwrap() error { return ErrConfig }

func (c Config) withDefaults() (Config, error) {
	if c.Rate == 0 {
		c.Rate = 256
	}
	if c.Duration == 0 {
		c.Duration = 240
	}
	if c.Electrodes == nil {
		c.Electrodes = synth.DefaultElectrodes
	}
	for _, f := range []struct {
		name string
		v    float64
		ok   bool
		why  string
	}{
		{"Rate", c.Rate, c.Rate >= 128, "must be at least 128 Hz"},
		{"Duration", c.Duration, c.Duration >= 30, "must be at least 30 s"},
		{"IEDRate", c.IEDRate, c.IEDRate >= 0, "must be non-negative"},
		{"LookalikeRate", c.LookalikeRate, c.LookalikeRate >= 0, "must be non-negative"},
		{"AlphaFreq", c.AlphaFreq, c.AlphaFreq == 0 || (c.AlphaFreq >= 7 && c.AlphaFreq <= 13), "must lie in 7–13 Hz"},
	} {
		if !f.ok || math.IsNaN(f.v) || math.IsInf(f.v, 0) {
			return c, &ConfigError{Field: f.name, Value: f.v, Reason: f.why}
		}
	}
	if len(c.Electrodes) < 8 {
		return c, &ConfigError{Field: "Electrodes", Value: len(c.Electrodes), Reason: "need at least 8 EEG electrodes"}
	}
	return c, nil
}
