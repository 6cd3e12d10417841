package accuracy

import (
	"errors"
	"fmt"
	"math"
	"slices"
	"strings"
)

// Point is one candidate operating point of a detector.
type Point struct {
	Threshold    float64
	Sens, Spec   float64
	PPV          float64
	FalsePerHour float64 // false detections per hour of recording
	Prevalence   float64 // weight of reference positives over all events, for CostRatio
}

// NewPoint summarises the (possibly weighted) confusion counts at a
// threshold. hours is the recording time the events were drawn from;
// FalsePerHour is FP/hours, NaN when hours ≤ 0.
func NewPoint(threshold float64, c Confusion, hours float64) Point {
	fph := math.NaN()
	if hours > 0 {
		fph = c.FP / hours
	}
	return Point{
		Threshold:    threshold,
		Sens:         c.Sensitivity(),
		Spec:         c.Specificity(),
		PPV:          c.PPV(),
		FalsePerHour: fph,
		Prevalence:   c.Prevalence(),
	}
}

// Cost returns the expected cost per event r·π·(1−Sens) + (1−π)·(1−Spec)
// used by the CostRatio policy.
func (pt Point) Cost(r float64) float64 {
	return r*pt.Prevalence*(1-pt.Sens) + (1-pt.Prevalence)*(1-pt.Spec)
}

// NoPointError reports that no operating point satisfies a policy. Closest
// holds up to three points that came nearest to the constraint, nearest
// first, and Index their positions in the slice given to Choose.
type NoPointError struct {
	Policy  Policy
	N       int // number of points offered
	Closest []Point
	Index   []int
}

func (e *NoPointError) Error() string {
	var b strings.Builder
	fmt.Fprintf(&b, "accuracy: no operating point of %d meets %s", e.N, e.Policy)
	if len(e.Closest) == 0 {
		b.WriteString(" (no point has the rates it needs)")
		return b.String()
	}
	b.WriteString("; closest:")
	for i, p := range e.Closest {
		if i > 0 {
			b.WriteString(";")
		}
		fmt.Fprintf(&b, " threshold %.4g (sens %.3f, spec %.3f, %.3g false/h)", p.Threshold, p.Sens, p.Spec, p.FalsePerHour)
	}
	return b.String()
}

// ErrNoPoint is matched by errors.Is on a NoPointError.
var ErrNoPoint = errors.New("accuracy: no operating point meets the policy")

// Unwrap gives ErrNoPoint.
func (e *NoPointError) Unwrap() error { return ErrNoPoint }

// Choose returns the index of the operating point that policy p selects,
// with the eligibility and tie-breaking rules documented on each
// PolicyKind. Ties are exact float equality. Points lacking a rate the
// policy needs (NaN) are never chosen. When nothing qualifies Choose
// returns -1 and a *NoPointError listing the closest points.
func Choose(points []Point, p Policy) (int, error) {
	best := -1
	for i, pt := range points {
		if !eligible(pt, p) {
			continue
		}
		if best < 0 || better(pt, points[best], p) {
			best = i
		}
	}
	if best >= 0 {
		return best, nil
	}
	return -1, closest(points, p)
}

func eligible(pt Point, p Policy) bool {
	switch p.Kind {
	case MinSpecificity:
		return pt.Spec >= p.Value && !math.IsNaN(pt.Sens)
	case MinSensitivity:
		return pt.Sens >= p.Value && !math.IsNaN(pt.Spec)
	case MaxFalsePerHour:
		return pt.FalsePerHour <= p.Value && !math.IsNaN(pt.Sens)
	case Youden:
		return !math.IsNaN(pt.Sens + pt.Spec)
	case CostRatio:
		return !math.IsNaN(pt.Cost(p.Value))
	}
	return false
}

// better reports whether a beats b under p; both are eligible.
func better(a, b Point, p Policy) bool {
	// keys in priority order; larger is better.
	var ka, kb [3]float64
	switch p.Kind {
	case MinSpecificity:
		ka, kb = [3]float64{a.Sens, a.Spec, a.Threshold}, [3]float64{b.Sens, b.Spec, b.Threshold}
	case MinSensitivity:
		ka, kb = [3]float64{a.Spec, a.Sens, a.Threshold}, [3]float64{b.Spec, b.Sens, b.Threshold}
	case MaxFalsePerHour:
		ka, kb = [3]float64{a.Sens, -a.FalsePerHour, a.Threshold}, [3]float64{b.Sens, -b.FalsePerHour, b.Threshold}
	case Youden:
		ka, kb = [3]float64{a.Sens + a.Spec, a.Spec, a.Threshold}, [3]float64{b.Sens + b.Spec, b.Spec, b.Threshold}
	case CostRatio:
		ka, kb = [3]float64{-a.Cost(p.Value), a.Sens, a.Threshold}, [3]float64{-b.Cost(p.Value), b.Sens, b.Threshold}
	}
	for i := range ka {
		if ka[i] != kb[i] {
			return ka[i] > kb[i]
		}
	}
	return false
}

// closest builds the NoPointError with the points nearest to meeting a
// constrained policy.
func closest(points []Point, p Policy) *NoPointError {
	e := &NoPointError{Policy: p, N: len(points)}
	shortfall := func(pt Point) float64 {
		switch p.Kind {
		case MinSpecificity:
			return p.Value - pt.Spec
		case MinSensitivity:
			return p.Value - pt.Sens
		case MaxFalsePerHour:
			return pt.FalsePerHour - p.Value
		}
		return math.NaN()
	}
	var idx []int
	for i, pt := range points {
		if !math.IsNaN(shortfall(pt)) {
			idx = append(idx, i)
		}
	}
	slices.SortStableFunc(idx, func(a, b int) int {
		sa, sb := shortfall(points[a]), shortfall(points[b])
		switch {
		case sa < sb:
			return -1
		case sa > sb:
			return 1
		}
		return 0
	})
	for _, i := range idx[:min(3, len(idx))] {
		e.Closest = append(e.Closest, points[i])
		e.Index = append(e.Index, i)
	}
	return e
}
