package report

import (
	"encoding/json"
	"fmt"
	"math"
	"os"
)

// ReadOperatingPoint reads operating-point.json.
func ReadOperatingPoint(path string) (*OperatingPoint, error) {
	b, err := os.ReadFile(path)
	if err != nil {
		return nil, err
	}
	var op OperatingPoint
	if err := json.Unmarshal(b, &op); err != nil {
		return nil, fmt.Errorf("%s: %w", path, err)
	}
	return &op, nil
}

// Decide applies the operating point's automatic rule to one event's six headline
// features and its detector score: the event is positive when at least K of the rule's
// cutoffs are met. The score counts only when the rule has a cutoff for it (feature
// "score", criterion 0). A value that was not measured (NaN) does not meet its cutoff.
// ok is false when the operating point has no cutoffs (a rule on the panel's answers
// cannot be applied to features).
func (op *OperatingPoint) Decide(features [6]float64, score float64) (positive, ok bool) {
	n, active := 0, 0
	for _, c := range op.Cutoffs {
		var f float64
		switch {
		case c.Criterion == 0 && c.Feature == ScoreFeature:
			f = score
		case c.Criterion >= 1 && c.Criterion <= 6:
			f = features[c.Criterion-1]
		default:
			continue
		}
		v := float64(c.Value)
		switch c.Met {
		case ">=":
			active++
			if !math.IsNaN(f) && f >= v {
				n++
			}
		case "<=":
			active++
			if !math.IsNaN(f) && f <= v {
				n++
			}
		}
	}
	if active == 0 {
		return false, false
	}
	return n >= op.K, true
}
