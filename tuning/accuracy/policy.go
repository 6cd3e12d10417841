package accuracy

import (
	"fmt"
	"math"
	"strconv"
	"strings"
)

// PolicyKind names the rule used to pick an operating point.
type PolicyKind int

const (
	// MinSpecificity keeps points with Spec ≥ Value and takes the highest
	// sensitivity; ties go to the higher specificity, then the higher
	// threshold. It is the default (Value 0.95).
	MinSpecificity PolicyKind = iota
	// MinSensitivity keeps points with Sens ≥ Value and takes the highest
	// specificity; ties go to the higher sensitivity, then the higher
	// threshold.
	MinSensitivity
	// MaxFalsePerHour keeps points with FalsePerHour ≤ Value and takes the
	// highest sensitivity; ties go to the fewer false detections per hour,
	// then the higher threshold.
	MaxFalsePerHour
	// Youden takes the point maximising Sens + Spec − 1 (Youden 1950,
	// Cancer 3:32–35); ties go to the higher specificity, then the higher
	// threshold. It has no Value.
	Youden
	// CostRatio takes the point minimising the expected cost per event
	// r·π·(1−Sens) + (1−π)·(1−Spec), that is (r·FN + FP)/N, where r = Value
	// is the cost of a missed IED relative to a false detection and π is the
	// point's Prevalence (Zweig & Campbell 1993, Clinical Chemistry
	// 39:561–577). Ties go to the higher sensitivity, then the higher
	// threshold.
	CostRatio
)

var policyNames = [...]string{
	MinSpecificity:  "min-specificity",
	MinSensitivity:  "min-sensitivity",
	MaxFalsePerHour: "max-false-per-hour",
	Youden:          "youden",
	CostRatio:       "cost-ratio",
}

func (k PolicyKind) String() string {
	if k < 0 || int(k) >= len(policyNames) {
		return "PolicyKind(" + strconv.Itoa(int(k)) + ")"
	}
	return policyNames[k]
}

// Policy is a rule for choosing an operating point, written on the command
// line as "youden", "min-specificity=0.95", "min-sensitivity=0.9",
// "max-false-per-hour=2" or "cost-ratio=3".
type Policy struct {
	Kind  PolicyKind
	Value float64
}

// DefaultPolicy is min-specificity=0.95, a conservative start for a
// detector whose false detections cost reviewer time (common practice).
var DefaultPolicy = Policy{Kind: MinSpecificity, Value: 0.95}

// String returns the policy in the form ParsePolicy accepts.
func (p Policy) String() string {
	if p.Kind == Youden {
		return p.Kind.String()
	}
	return p.Kind.String() + "=" + strconv.FormatFloat(p.Value, 'g', -1, 64)
}

// policyError reports a policy string that ParsePolicy cannot read.
type policyError struct {
	Input  string // the policy string as given
	Expect string // what was expected instead
}

func (e *policyError) Error() string {
	return fmt.Sprintf("accuracy: policy %q: expected %s", e.Input, e.Expect)
}

// Unwrap gives ErrPolicy, for errors.Is.
func (e *policyError) Unwrap() error { return ErrPolicy }

const policyForms = `one of "youden", "min-specificity=P", "min-sensitivity=P", "max-false-per-hour=R", "cost-ratio=R"`

// ParsePolicy reads a policy string. The empty string gives DefaultPolicy.
// Proportions P must lie in [0,1], a false-detection rate R in [0,∞) and a
// cost ratio R in (0,∞).
func ParsePolicy(s string) (Policy, error) {
	in := strings.TrimSpace(s)
	if in == "" {
		return DefaultPolicy, nil
	}
	name, val, hasVal := strings.Cut(in, "=")
	name = strings.ToLower(strings.TrimSpace(name))
	kind := -1
	for k, n := range policyNames {
		if n == name {
			kind = k
		}
	}
	if kind < 0 {
		return Policy{}, &policyError{Input: s, Expect: policyForms}
	}
	p := Policy{Kind: PolicyKind(kind)}
	if p.Kind == Youden {
		if hasVal {
			return Policy{}, &policyError{Input: s, Expect: `"youden" without a value`}
		}
		return p, nil
	}
	if !hasVal {
		return Policy{}, &policyError{Input: s, Expect: fmt.Sprintf("%s=<number>", name)}
	}
	v, err := strconv.ParseFloat(strings.TrimSpace(val), 64)
	if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
		return Policy{}, &policyError{Input: s, Expect: fmt.Sprintf("a finite number after %q", name+"=")}
	}
	switch p.Kind {
	case MinSpecificity, MinSensitivity:
		if v < 0 || v > 1 {
			return Policy{}, &policyError{Input: s, Expect: "a proportion between 0 and 1"}
		}
	case MaxFalsePerHour:
		if v < 0 {
			return Policy{}, &policyError{Input: s, Expect: "a non-negative rate per hour"}
		}
	case CostRatio:
		if v <= 0 {
			return Policy{}, &policyError{Input: s, Expect: "a positive cost ratio"}
		}
	}
	p.Value = v
	return p, nil
}
