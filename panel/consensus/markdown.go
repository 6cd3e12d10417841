package consensus

import (
	"github.com/quorate-eeg/quorate/internal/caution"

	"fmt"

	"github.com/quorate-eeg/quorate/internal/jsonx"
	"io"
	"math"
	"strings"
)

// Caution is printed on every report.
const Caution = caution.Text

// WriteMarkdown writes the agreement report for people: one table of coefficients per
// question, then each rater against the others and against themself.
func (a *Agreement) WriteMarkdown(w io.Writer) error {
	var b strings.Builder
	f := func(v jsonx.Float) string {
		x := float64(v)
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return "–"
		}
		return fmt.Sprintf("%.2f", x)
	}
	est := func(e Estimate) string {
		return fmt.Sprintf("%s (%s to %s)", f(e.Value), f(e.Lo), f(e.Hi))
	}
	fmt.Fprintf(&b, "# Panel agreement\n\n> %s\n\n", Caution)
	fmt.Fprintf(&b, "%d events from %d subjects rated by %d raters (%s). Intervals are %.0f %% percentile bootstrap intervals over %d replicates that resample subjects, not events.\n\n",
		a.Events, a.Subjects, len(a.Raters), strings.Join(a.Raters, ", "), 100*float64(a.Level), a.Replicates)
	b.WriteString("Kappa words follow Landis & Koch (1977) as published: below 0.00 poor, 0.00–0.20 slight, 0.21–0.40 fair, 0.41–0.60 moderate, 0.61–0.80 substantial, 0.81–1.00 almost perfect (kappa placed as printed, to two decimals).\n\n")
	b.WriteString("| question | observed agreement | Fleiss' kappa | in words | Gwet's AC1 | Krippendorff's alpha |\n|---|---|---|---|---|---|\n")
	for _, q := range a.Questions {
		fmt.Fprintf(&b, "| %s | %s | %s | %s | %s | %s |\n", questionName(q.Question), est(q.Observed), est(q.Fleiss), q.FleissBand, est(q.AC1), est(q.Alpha))
	}
	for _, q := range a.Questions {
		fmt.Fprintf(&b, "\n## %s\n\n", questionName(q.Question))
		b.WriteString("| rater | sensitivity vs others | specificity vs others | items | Dawid–Skene sensitivity | Dawid–Skene specificity | self-agreement (duplicates) | self kappa | pairs |\n|---|---|---|---|---|---|---|---|---|\n")
		for i, r := range q.Raters {
			in := q.Intra[i]
			fmt.Fprintf(&b, "| %s | %s | %s | %d | %s | %s | %s | %s | %d |\n", r.Rater, f(r.Sens), f(r.Spec), r.N, f(r.DSSens), f(r.DSSpec), f(in.Observed), f(in.Kappa), in.Pairs)
		}
		b.WriteString("\nCohen's kappa per pair: ")
		parts := make([]string, len(q.Cohen))
		for i, p := range q.Cohen {
			parts[i] = fmt.Sprintf("%s–%s %s", p.A, p.B, f(p.Kappa))
		}
		b.WriteString(strings.Join(parts, "; ") + ".\n")
	}
	_, err := io.WriteString(w, b.String())
	return err
}

func questionName(q string) string {
	switch q {
	case "c1":
		return "c1 spiky morphology"
	case "c2":
		return "c2 duration unlike the background"
	case "c3":
		return "c3 asymmetry"
	case "c4":
		return "c4 after-going slow wave"
	case "c5":
		return "c5 background disruption"
	case "c6":
		return "c6 field suggesting a cerebral source"
	case "verdict":
		return "overall verdict (epileptiform)"
	}
	return q
}
