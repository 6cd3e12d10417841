package study

import (
	"bytes"
	"fmt"
	"os"
	"strings"

	"go.yaml.in/yaml/v3"
)

// Config is the study protocol read from study.yaml. Later commands read it; their
// flags override it for one run.
type Config struct {
	Study struct {
		ID     string `yaml:"id"`
		Name   string `yaml:"name"`
		Centre string `yaml:"centre"`
	} `yaml:"study"`
	Archive struct {
		Roots []string `yaml:"roots"`
	} `yaml:"archive"`
	Signal struct {
		Montage  string     `yaml:"montage"`
		Bandpass [2]float64 `yaml:"bandpass_hz"`
		NotchHz  float64    `yaml:"notch_hz"`
	} `yaml:"signal"`
	Detect struct {
		ThresholdMAD  float64 `yaml:"threshold_mad"`
		BackgroundS   float64 `yaml:"background_window_s"`
		MergeWindowMS float64 `yaml:"merge_window_ms"`
	} `yaml:"detect"`
	Criteria map[string]float64 `yaml:"criteria_cutoffs"`
	Draw     struct {
		N             int     `yaml:"n"`
		Strata        string  `yaml:"strata"`
		Allocation    string  `yaml:"allocation"`
		MinPerStratum int     `yaml:"min_per_stratum"`
		SubjectCap    int     `yaml:"subject_cap"`
		Controls      int     `yaml:"controls"`
		ControlEpochS float64 `yaml:"control_epoch_s"`
		ControlDistS  float64 `yaml:"control_min_distance_s"`
	} `yaml:"draw"`
	Panel struct {
		Raters         []string `yaml:"raters"`
		DuplicateShare float64  `yaml:"duplicate_share"`
		WindowS        float64  `yaml:"window_s"`
		Quorum         int      `yaml:"quorum"`
		Tie            string   `yaml:"tie"`
	} `yaml:"panel"`
	Tuning struct {
		Reference string `yaml:"reference"`
		Policy    string `yaml:"policy"`
		Folds     int    `yaml:"folds"`
		Bootstrap int    `yaml:"bootstrap"`
	} `yaml:"tuning"`
	Seed uint64 `yaml:"seed"`
}

// ConfigError reports a study.yaml that cannot be used, with the field at fault.
type ConfigError struct {
	File  string
	Field string
	Got   string
	Want  string
}

func (e *ConfigError) Error() string {
	return fmt.Sprintf("%s: field %q: got %q, want %s", e.File, e.Field, e.Got, e.Want)
}

// ReadConfig parses and checks study.yaml. Unknown fields are refused so that a typo
// does not silently fall back to a default.
func ReadConfig(path string) (*Config, error) {
	b, err := os.ReadFile(path)
	if err != nil {
		return nil, err
	}
	var c Config
	dec := yaml.NewDecoder(bytes.NewReader(b))
	dec.KnownFields(true)
	if err := dec.Decode(&c); err != nil {
		return nil, fmt.Errorf("%s: %w", path, err)
	}
	return &c, c.check(path)
}

func (c *Config) check(path string) error {
	bad := func(field, got, want string) error {
		return &ConfigError{File: path, Field: field, Got: got, Want: want}
	}
	if c.Study.ID == "" {
		return bad("study.id", "", "the study id written by quorate init")
	}
	switch c.Signal.Montage {
	case "referential", "common-average", "longitudinal-bipolar", "transverse-bipolar":
	default:
		return bad("signal.montage", c.Signal.Montage, "referential, common-average, longitudinal-bipolar or transverse-bipolar")
	}
	if lo, hi := c.Signal.Bandpass[0], c.Signal.Bandpass[1]; !(lo > 0 && hi > lo) {
		return bad("signal.bandpass_hz", fmt.Sprint(c.Signal.Bandpass), "two frequencies [low, high] with 0 < low < high")
	}
	if n := c.Signal.NotchHz; n != 0 && n != 50 && n != 60 {
		return bad("signal.notch_hz", fmt.Sprint(n), "50, 60, or 0 for none")
	}
	switch c.Panel.Tie {
	case "absent", "present", "undetermined":
	default:
		return bad("panel.tie", c.Panel.Tie, "absent, present or undetermined")
	}
	if s := c.Panel.DuplicateShare; s < 0 || s > 0.5 {
		return bad("panel.duplicate_share", fmt.Sprint(s), "a share between 0 and 0.5")
	}
	switch {
	case c.Tuning.Reference == "panel", c.Tuning.Reference == "dawid-skene",
		strings.HasPrefix(c.Tuning.Reference, "external:"):
	default:
		return bad("tuning.reference", c.Tuning.Reference, "panel, dawid-skene or external:PATH")
	}
	return nil
}
