package report

import (
	"math"

	"github.com/quorate-eeg/quorate/tuning"
)

// expectTable is the first table of both reports: the headline figures of the
// chosen rule and, beside them, those of the rule the other fitting method
// chooses, with that rule's in-sample figures to show its optimism.
type expectTable struct {
	Head  []string
	Rows  [][]string
	Notes []string
}

func expect(res *tuning.Result) expectTable {
	f, a := res.Final, res.Alternative
	t := expectTable{Head: []string{"Figure", "Chosen rule (" + f.Method + "): to expect on new recordings"}}
	if a != nil {
		t.Head = append(t.Head, "Other method ("+a.Method+"): to expect on new recordings", "Other method: in sample (optimistic)")
	}
	h := f.Headline
	if h == nil {
		return t
	}
	t.Notes = h.Notes
	get := []struct {
		name string
		prop bool
		head func(*tuning.Headline) tuning.Estimate
		in   func(tuning.Metrics) tuning.Estimate
	}{
		{"Sensitivity", true, func(h *tuning.Headline) tuning.Estimate { return h.Sens }, func(m tuning.Metrics) tuning.Estimate { return m.Design.Sens }},
		{"Specificity", true, func(h *tuning.Headline) tuning.Estimate { return h.Spec }, func(m tuning.Metrics) tuning.Estimate { return m.Design.Spec }},
		{"PPV", true, func(h *tuning.Headline) tuning.Estimate { return h.PPV }, func(m tuning.Metrics) tuning.Estimate { return m.Design.PPV }},
		{"False detections per hour", false, func(h *tuning.Headline) tuning.Estimate { return h.FalsePerHour }, func(m tuning.Metrics) tuning.Estimate { return m.FalsePerHour }},
	}
	for _, g := range get {
		row := []string{g.name, headCI(g.head(h), g.prop)}
		if a != nil && a.Headline != nil {
			row = append(row, headCI(g.head(a.Headline), g.prop), headCI(g.in(a.InSample), g.prop))
		}
		t.Rows = append(t.Rows, row)
	}
	return t
}

// headCI prints a headline figure and its interval, saying so when the
// interval is withheld.
func headCI(e tuning.Estimate, prop bool) string {
	switch {
	case math.IsNaN(e.Value):
		return "undefined"
	case math.IsNaN(e.Lo) && prop:
		return pct(e.Value) + " (no interval)"
	case math.IsNaN(e.Lo):
		return num(e.Value) + " (no interval)"
	case prop:
		return pctCI(e)
	}
	return numCI(e)
}

// expectExplain says in plain words what the headline figure is.
const expectExplain = `These are the figures to expect when the chosen rule meets new recordings like these. ` +
	`Choosing cutoffs and k on the rated events flatters the rule on those same events, so the figures measured on them ("in sample") are optimistic. ` +
	`To measure by how much, the whole choice was repeated many times on subjects drawn again at random from the study, each time comparing how good the new choice looked on its own draw with how good it was on all the events; ` +
	`the headline is the in-sample figure minus that average flattery, and its interval is the range those repeats make plausible. ` +
	`Events keep their design weights, so the figures describe the archive, not the enriched sample.`
