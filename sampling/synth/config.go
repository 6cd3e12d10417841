package synth

import (
	"errors"
	"fmt"
	"math"
)

// Forward returns the scalp potential (µV per unit moment, common reference)
// at each electrode for a dipole at pos (unit-sphere coordinates, x right,
// y nose, z up) with moment direction m.
type Forward func(electrodes []string, pos, moment [3]float64) []float64

// DefaultElectrodes are the 19 electrodes of the 10-20 system with their
// 10-10 names (T7/T8/P7/P8 for T3/T4/T5/T6).
var DefaultElectrodes = []string{
	"Fp1", "Fp2", "F7", "F3", "Fz", "F4", "F8",
	"T7", "C3", "Cz", "C4", "T8",
	"P7", "P3", "Pz", "P4", "P8", "O1", "O2",
}

// Config describes one synthetic recording. Zero values take the defaults
// given beside each field.
type Config struct {
	Seed       uint64
	Rate       float64  // samples per second; 256
	Duration   float64  // seconds; 60
	Electrodes []string // EEG electrodes; DefaultElectrodes
	OmitECG    bool     // leave out the ECG channel
	OmitEOG    bool     // leave out the EOG channel

	IEDRate       float64 // true IEDs per minute; 0 means none
	LookalikeRate float64 // look-alikes per minute; 0 means none

	// Forward projects dipoles onto the electrodes. Required.
	Forward Forward

	BackgroundRMS float64 // median channel RMS of the 1/f background, µV; 30
	AlphaRMS      float64 // awake alpha RMS at its maximal channel, µV; 25
	ThetaRMS      float64 // drowsy theta RMS at its maximal channel, µV; 20
	Exponent      float64 // background power ∝ 1/f^Exponent; 1.5
	AlphaFreq     float64 // posterior alpha frequency, Hz; drawn from 8.5–11 if 0

	// Focus is the direction of the subject's epileptogenic region (need not
	// be normalised); drawn from the seed if zero.
	Focus [3]float64
	// AwakeOnly keeps the whole recording awake; otherwise awake and drowsy
	// spans alternate, unless States is given explicitly.
	AwakeOnly bool
	States    []StateSpan
}

// ConfigError reports an invalid Config field.
type ConfigError struct {
	Field  string
	Value  any
	Reason string
}

func (e *ConfigError) Error() string {
	return fmt.Sprintf("synth: config %s=%v: %s", e.Field, e.Value, e.Reason)
}

// ErrConfig is matched by errors.Is on a ConfigError.
var ErrConfig = errors.New("synth: unusable configuration")

// Unwrap gives ErrConfig.
func (e *ConfigError) Unwrap() error { return ErrConfig }

// withDefaults returns cfg with defaults filled in, or the first invalid field.
func (cfg Config) withDefaults() (Config, error) {
	c := cfg
	def := func(p *float64, v float64) {
		if *p == 0 {
			*p = v
		}
	}
	def(&c.Rate, 256)
	def(&c.Duration, 60)
	def(&c.BackgroundRMS, 30)
	def(&c.AlphaRMS, 25)
	def(&c.ThetaRMS, 20)
	def(&c.Exponent, 1.5)
	if c.Electrodes == nil {
		c.Electrodes = DefaultElectrodes
	}
	for _, f := range []struct {
		name string
		v    float64
		ok   bool
		why  string
	}{
		{"Rate", c.Rate, c.Rate >= 64, "must be at least 64 Hz"},
		{"Duration", c.Duration, c.Duration >= 4, "must be at least 4 s"},
		{"IEDRate", c.IEDRate, c.IEDRate >= 0, "must be non-negative"},
		{"LookalikeRate", c.LookalikeRate, c.LookalikeRate >= 0, "must be non-negative"},
		{"BackgroundRMS", c.BackgroundRMS, c.BackgroundRMS > 0, "must be positive"},
		{"AlphaRMS", c.AlphaRMS, c.AlphaRMS >= 0, "must be non-negative"},
		{"ThetaRMS", c.ThetaRMS, c.ThetaRMS >= 0, "must be non-negative"},
		{"Exponent", c.Exponent, c.Exponent > 0 && c.Exponent < 2, "must lie in (0, 2)"},
		{"AlphaFreq", c.AlphaFreq, c.AlphaFreq == 0 || (c.AlphaFreq >= 7 && c.AlphaFreq <= 13), "must lie in 7–13 Hz"},
	} {
		if !f.ok || math.IsNaN(f.v) || math.IsInf(f.v, 0) {
			return c, &ConfigError{Field: f.name, Value: f.v, Reason: f.why}
		}
	}
	if c.Forward == nil {
		return c, &ConfigError{Field: "Forward", Value: nil, Reason: "a forward model is required"}
	}
	if len(c.Electrodes) < 3 {
		return c, &ConfigError{Field: "Electrodes", Value: len(c.Electrodes), Reason: "need at least 3 EEG electrodes"}
	}
	seen := map[string]bool{"ECG": !c.OmitECG, "EOG": !c.OmitEOG}
	for _, e := range c.Electrodes {
		if seen[e] {
			return c, &ConfigError{Field: "Electrodes", Value: e, Reason: "duplicate label"}
		}
		seen[e] = true
	}
	for i, s := range c.States {
		if s.End <= s.Start || (i > 0 && s.Start < c.States[i-1].End) {
			return c, &ConfigError{Field: fmt.Sprintf("States[%d]", i), Value: s, Reason: "spans must be ordered and non-empty"}
		}
	}
	return c, nil
}
