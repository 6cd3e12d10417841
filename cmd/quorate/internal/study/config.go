package study

import (
	"bytes"
	"errors"
	"fmt"
	"io"
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

// MaxConfigBytes bounds study.yaml: the protocol is a page of settings.
const MaxConfigBytes = 1 << 20

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

// ErrConfig is matched by errors.Is on a ConfigError.
var ErrConfig = errors.New("unusable study configuration")

// Unwrap gives ErrConfig.
func (e *ConfigError) Unwrap() error { return ErrConfig }

// ReadConfig parses and checks study.yaml. Unknown fields are refused so that a typo
// does not silently fall back to a default.
func ReadConfig(path string) (*Config, error) {
	b, err := os.ReadFile(path)
	if err != nil {
		return nil, err
	}
	if len(b) > MaxConfigBytes {
		return nil, fmt.Errorf("%s: %d bytes, more than the %d a study protocol may have", path, len(b), MaxConfigBytes)
	}
	var c Config
	dec := yaml.NewDecoder(bytes.NewReader(b))
	dec.KnownFields(true)
	if err := dec.Decode(&c); err != nil {
		if errors.Is(err, io.EOF) {
			return nil, fmt.Errorf("%s is empty: it should hold the study protocol that quorate init writes (restore it from a backup, or start a new study)", path)
		}
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
	for _, f := range []struct {
		name string
		v    int
	}{
		{"draw.n", c.Draw.N}, {"draw.min_per_stratum", c.Draw.MinPerStratum}, {"draw.subject_cap", c.Draw.SubjectCap},
		{"draw.controls", c.Draw.Controls}, {"tuning.folds", c.Tuning.Folds}, {"tuning.bootstrap", c.Tuning.Bootstrap},
		{"panel.quorum", c.Panel.Quorum},
	} {
		if f.v < 0 {
			return bad(f.name, fmt.Sprint(f.v), "a whole number ≥ 0")
		}
	}
	if c.Tuning.Folds == 1 {
		return bad("tuning.folds", "1", "0 (the default, 5) or at least 2: cross-validation needs two folds")
	}
	if n := len(c.Panel.Raters); n > 0 && c.Panel.Quorum > n {
		return bad("panel.quorum", fmt.Sprint(c.Panel.Quorum), fmt.Sprintf("at most the %d raters of panel.raters", n))
	}
	for _, f := range []struct {
		name string
		v    float64
	}{{"draw.control_epoch_s", c.Draw.ControlEpochS}, {"draw.control_min_distance_s", c.Draw.ControlDistS}, {"panel.window_s", c.Panel.WindowS}} {
		if f.v < 0 || f.v != f.v {
			return bad(f.name, fmt.Sprint(f.v), "a number of seconds ≥ 0")
		}
	}
	switch {
	case c.Tuning.Reference == "panel", c.Tuning.Reference == "dawid-skene",
		strings.HasPrefix(c.Tuning.Reference, "external:"):
	default:
		return bad("tuning.reference", c.Tuning.Reference, "panel, dawid-skene or external:PATH")
	}
	return nil
}
