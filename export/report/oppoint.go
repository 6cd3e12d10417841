package report

import (
	"fmt"
	"math"
	"strconv"
	"strings"
	"time"

	"github.com/quorate-eeg/quorate/internal/jsonx"
	"github.com/quorate-eeg/quorate/tuning"
)

// Interval is an estimate with its interval; undefined values are null.
type Interval struct {
	Value jsonx.Float `json:"value"`
	Lo    jsonx.Float `json:"ci_low"`
	Hi    jsonx.Float `json:"ci_high"`
}

func iv(e tuning.Estimate) Interval {
	return Interval{jsonx.Float(e.Value), jsonx.Float(e.Lo), jsonx.Float(e.Hi)}
}

// RatesJSON are the rates of one estimate family.
type RatesJSON struct {
	Sensitivity Interval `json:"sensitivity"`
	Specificity Interval `json:"specificity"`
	PPV         Interval `json:"ppv"`
	NPV         Interval `json:"npv"`
	Accuracy    Interval `json:"accuracy"`
	LRPos       Interval `json:"lr_positive"`
	LRNeg       Interval `json:"lr_negative"`
	YoudenJ     Interval `json:"youden_j"`
}

func rates(r tuning.Rates) RatesJSON {
	return RatesJSON{iv(r.Sens), iv(r.Spec), iv(r.PPV), iv(r.NPV), iv(r.Accuracy), iv(r.LRPos), iv(r.LRNeg), iv(r.Youden)}
}

// CountsJSON is a 2×2 table.
type CountsJSON struct {
	TP jsonx.Float `json:"tp"`
	FP jsonx.Float `json:"fp"`
	TN jsonx.Float `json:"tn"`
	FN jsonx.Float `json:"fn"`
}

// MetricsJSON is tuning.Metrics for the JSON file.
type MetricsJSON struct {
	Counts         CountsJSON `json:"counts"`
	WeightedCounts CountsJSON `json:"design_weighted_counts"`
	Unweighted     RatesJSON  `json:"unweighted_wilson"`
	DesignWeighted RatesJSON  `json:"design_weighted_linearised"`
	FalsePerHour   Interval   `json:"false_detections_per_hour"`
	Folds          int        `json:"folds,omitempty"`
	FoldRules      []string   `json:"fold_rules,omitempty"`
}

func metrics(m tuning.Metrics) MetricsJSON {
	c, w := m.Counts, m.Weighted
	return MetricsJSON{
		Counts:         CountsJSON{jsonx.Float(c.TP), jsonx.Float(c.FP), jsonx.Float(c.TN), jsonx.Float(c.FN)},
		WeightedCounts: CountsJSON{jsonx.Float(w.TP), jsonx.Float(w.FP), jsonx.Float(w.TN), jsonx.Float(w.FN)},
		Unweighted:     rates(m.Plain), DesignWeighted: rates(m.Design), FalsePerHour: iv(m.FalsePerHour),
	}
}

// BootstrapJSON holds the subject-bootstrap percentile intervals.
type BootstrapJSON struct {
	Replicates   int      `json:"replicates"`
	Undefined    int      `json:"replicates_with_undefined_rate"`
	Sensitivity  Interval `json:"sensitivity"`
	Specificity  Interval `json:"specificity"`
	PPV          Interval `json:"ppv"`
	FalsePerHour Interval `json:"false_detections_per_hour"`
}

// HeadlineJSON is the operating point's headline: the figures to expect on
// new recordings, corrected for the selection (tuning.Headline).
type HeadlineJSON struct {
	Method       string   `json:"method"`
	Replicates   int      `json:"replicates"`
	Sensitivity  Interval `json:"sensitivity"`
	Specificity  Interval `json:"specificity"`
	PPV          Interval `json:"ppv"`
	FalsePerHour Interval `json:"false_per_hour"`
	Notes        []string `json:"notes"`
}

func headlineJSON(h *tuning.Headline) *HeadlineJSON {
	if h == nil {
		return nil
	}
	n := h.Notes
	if n == nil {
		n = []string{}
	}
	return &HeadlineJSON{h.Method, h.Replicates, iv(h.Sens), iv(h.Spec), iv(h.PPV), iv(h.FalsePerHour), n}
}

// HeadlineWords is the headline in one line of words ("sensitivity 0.63
// (0.40–0.83), …"), or "" when there is none.
func (op *OperatingPoint) HeadlineWords() string {
	h := op.Headline
	if h == nil {
		return ""
	}
	f := func(name string, v Interval) string {
		switch {
		case math.IsNaN(float64(v.Value)):
			return name + " undefined"
		case math.IsNaN(float64(v.Lo)):
			return fmt.Sprintf("%s %.2f (no interval)", name, float64(v.Value))
		}
		return fmt.Sprintf("%s %.2f (%.2f–%.2f)", name, float64(v.Value), float64(v.Lo), float64(v.Hi))
	}
	return strings.Join([]string{f("sensitivity", h.Sensitivity), f("specificity", h.Specificity), f("PPV", h.PPV), f("false detections per hour", h.FalsePerHour)}, ", ")
}

// AlternativeJSON is the rule the other fitting method chooses, for comparison.
type AlternativeJSON struct {
	Method   string        `json:"fit_method"`
	Rule     string        `json:"rule"`
	K        int           `json:"k"`
	Cutoffs  []CutoffJSON  `json:"cutoffs"`
	Headline *HeadlineJSON `json:"headline"`
	InSample MetricsJSON   `json:"in_sample_optimistic"`
}

// ScoreFeature names the detector score's cutoff (criterion 0) in the cutoffs list.
const ScoreFeature = "score"

// cutoffsJSON lists the six criteria's cutoffs and, when the rule has one, the
// detector score's (criterion 0), which the rule counts as one more vote.
func cutoffsJSON(cs [6]tuning.Cutoff, score tuning.Cutoff) []CutoffJSON {
	all := cs[:]
	if score.Direction != 0 {
		all = append(all, score)
	}
	var out []CutoffJSON
	for _, c := range all {
		met := "left out"
		switch c.Direction {
		case 1:
			met = ">="
		case -1:
			met = "<="
		}
		out = append(out, CutoffJSON{c.Criterion, c.Feature, met, jsonx.Float(c.Value)})
	}
	return out
}

// CutoffJSON is one criterion's cutoff, or the detector score's (Criterion 0, Feature
// "score").
type CutoffJSON struct {
	Criterion int         `json:"criterion"`
	Feature   string      `json:"feature"`
	Met       string      `json:"met_when"` // ">=", "<=" or "left out"
	Value     jsonx.Float `json:"value"`
}

// OperatingPoint is the content of operating-point.json.
type OperatingPoint struct {
	StudyID           string            `json:"study_id"`
	Version           string            `json:"quorate_version"`
	Generated         string            `json:"generated"`
	ReferenceStandard string            `json:"reference_standard"`
	Policy            string            `json:"policy"`
	Analysis          string            `json:"analysis"`
	Method            string            `json:"fit_method"`
	Rule              string            `json:"rule"`
	K                 int               `json:"k"`
	Cutoffs           []CutoffJSON      `json:"cutoffs"`
	Events            int               `json:"events"`
	Subjects          int               `json:"subjects"`
	RecordingHours    jsonx.Float       `json:"recording_hours"`
	Level             jsonx.Float       `json:"confidence_level"`
	Seed              string            `json:"seed"`
	Headline          *HeadlineJSON     `json:"headline"`
	Alternative       *AlternativeJSON  `json:"alternative"`
	InSample          MetricsJSON       `json:"in_sample"`
	CrossValidated    *MetricsJSON      `json:"cross_validated"`
	Bootstrap         *BootstrapJSON    `json:"bootstrap"`
	Controls          ControlsJSON      `json:"background_controls"`
	InputHashes       map[string]string `json:"input_sha256"`
	Warnings          []string          `json:"warnings"`
}

// ControlsJSON is what the background controls say about IEDs the finder missed.
type ControlsJSON struct {
	Rated         int      `json:"rated"`
	IEDs          int      `json:"ieds"`
	MissedPerHour Interval `json:"missed_ieds_per_hour"`
	Warning       string   `json:"warning,omitempty"`
}

// NewOperatingPoint assembles operating-point.json from a result.
func NewOperatingPoint(res *tuning.Result, meta Meta) OperatingPoint {
	f := res.Final
	op := OperatingPoint{
		StudyID: meta.StudyID, Version: meta.Version, Generated: meta.Generated.UTC().Format(time.RFC3339),
		ReferenceStandard: f.Reference, Policy: f.Policy.String(), Analysis: f.Analysis, Rule: f.Rule, K: f.K,
		Events: res.Events, Subjects: res.Subjects, RecordingHours: jsonx.Float(res.RecordingHours),
		Level: jsonx.Float(res.Level), Seed: strconv.FormatUint(res.Seed, 10),
		InSample: metrics(f.InSample), InputHashes: meta.InputHashes, Warnings: res.Warnings,
		Controls: ControlsJSON{res.Controls.Rated, res.Controls.IEDs, iv(res.Controls.MissedPerHour), res.Controls.Warning},
	}
	if op.Warnings == nil {
		op.Warnings = []string{}
	}
	op.Method, op.Headline, op.Cutoffs = f.Method, headlineJSON(f.Headline), cutoffsJSON(f.Cutoffs, f.Score)
	if a := res.Alternative; a != nil {
		op.Alternative = &AlternativeJSON{a.Method, a.Rule, a.K, cutoffsJSON(a.Cutoffs, a.Score), headlineJSON(a.Headline), metrics(a.InSample)}
	}
	if f.CV != nil {
		m := metrics(f.CV.Metrics)
		m.Folds, m.FoldRules = f.CV.Folds, f.CV.FoldRules
		op.CrossValidated = &m
	}
	if b := f.Bootstrap; b != nil {
		op.Bootstrap = &BootstrapJSON{b.Replicates, b.Undefined, iv(b.Sens), iv(b.Spec), iv(b.PPV), iv(b.FalsePerHour)}
	}
	return op
}

func kRule(k int) string { return "at least " + strconv.Itoa(k) + " of 6 criteria (panel majority)" }
