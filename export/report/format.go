package report

import (
	"fmt"
	"math"

	"github.com/quorate-eeg/quorate/tuning"
)

// pct formats a proportion as a percentage, "–" when undefined.
func pct(v float64) string {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return "–"
	}
	return fmt.Sprintf("%.1f%%", 100*v)
}

// num formats a number with four significant digits, "–" when undefined.
func num(v float64) string {
	switch {
	case math.IsNaN(v):
		return "–"
	case math.IsInf(v, 1):
		return "∞"
	case math.IsInf(v, -1):
		return "−∞"
	}
	return fmt.Sprintf("%.4g", v)
}

// pctCI formats a proportion and its interval.
func pctCI(e tuning.Estimate) string {
	if math.IsNaN(e.Lo) {
		return pct(e.Value)
	}
	return fmt.Sprintf("%s (%s–%s)", pct(e.Value), pct(e.Lo), pct(e.Hi))
}

// numCI formats a number and its interval.
func numCI(e tuning.Estimate) string {
	if math.IsNaN(e.Lo) {
		return num(e.Value)
	}
	return fmt.Sprintf("%s (%s–%s)", num(e.Value), num(e.Lo), num(e.Hi))
}

// figureRow is one line of the headline table: a figure of the chosen point
// in each of the four ways it is estimated.
type figureRow struct {
	Name, Explain           string
	Plain, Design, CV, Boot string
}

func headline(res *tuning.Result) []figureRow {
	f := res.Final
	cv := func(g func(tuning.Rates) tuning.Estimate, prop bool) string {
		if f.CV == nil {
			return "–"
		}
		if prop {
			return pctCI(g(f.CV.Design))
		}
		return numCI(g(f.CV.Design))
	}
	boot := func(e *tuning.Estimate, prop bool) string {
		if f.Bootstrap == nil || e == nil {
			return "–"
		}
		if prop {
			return pctCI(*e)
		}
		return numCI(*e)
	}
	var b *tuning.BootstrapIntervals = f.Bootstrap
	sel := func(g func(*tuning.BootstrapIntervals) *tuning.Estimate) *tuning.Estimate {
		if b == nil {
			return nil
		}
		return g(b)
	}
	row := func(name, explain string, g func(tuning.Rates) tuning.Estimate, bs *tuning.Estimate) figureRow {
		return figureRow{name, explain, pctCI(g(f.InSample.Plain)), pctCI(g(f.InSample.Design)), cv(g, true), boot(bs, true)}
	}
	rows := []figureRow{
		row("Sensitivity", "Of the events the reference calls IEDs, the share the rule marks.", func(r tuning.Rates) tuning.Estimate { return r.Sens }, sel(func(b *tuning.BootstrapIntervals) *tuning.Estimate { return &b.Sens })),
		row("Specificity", "Of the events the reference calls not IEDs, the share the rule leaves unmarked.", func(r tuning.Rates) tuning.Estimate { return r.Spec }, sel(func(b *tuning.BootstrapIntervals) *tuning.Estimate { return &b.Spec })),
		row("PPV", "Of the events the rule marks, the share that are IEDs: how often a marked event is worth a look.", func(r tuning.Rates) tuning.Estimate { return r.PPV }, sel(func(b *tuning.BootstrapIntervals) *tuning.Estimate { return &b.PPV })),
		row("NPV", "Of the events the rule leaves unmarked, the share that are not IEDs.", func(r tuning.Rates) tuning.Estimate { return r.NPV }, nil),
		row("Accuracy", "Share of all events the rule gets right; depends on how common IEDs are.", func(r tuning.Rates) tuning.Estimate { return r.Accuracy }, nil),
	}
	fph := figureRow{Name: "False detections per hour", Explain: "Marked events that are not IEDs, per hour of recording, projected to the whole archive.",
		Plain: "–", Design: numCI(f.InSample.FalsePerHour), CV: "–", Boot: boot(sel(func(b *tuning.BootstrapIntervals) *tuning.Estimate { return &b.FalsePerHour }), false)}
	if f.CV != nil {
		fph.CV = numCI(f.CV.FalsePerHour)
	}
	j := figureRow{Name: "Youden's J", Explain: "Sensitivity + specificity − 1: 0 is guessing, 1 is perfect.",
		Plain: numCI(f.InSample.Plain.Youden), Design: num(f.InSample.Design.Youden.Value), CV: cv(func(r tuning.Rates) tuning.Estimate { return r.Youden }, false), Boot: "–"}
	lrp := figureRow{Name: "LR+", Explain: "How many times more often an IED is marked than a non-IED.",
		Plain: numCI(f.InSample.Plain.LRPos), Design: num(f.InSample.Design.LRPos.Value), CV: "–", Boot: "–"}
	lrn := figureRow{Name: "LR−", Explain: "How many times more often an IED is missed than a non-IED is left unmarked.",
		Plain: numCI(f.InSample.Plain.LRNeg), Design: num(f.InSample.Design.LRNeg.Value), CV: "–", Boot: "–"}
	return append(rows, fph, j, lrp, lrn)
}
