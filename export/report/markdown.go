package report

import (
	"fmt"
	"io"
	"strings"

	"github.com/quorate-eeg/quorate/panel/consensus"
	"github.com/quorate-eeg/quorate/tuning"
)

func mdTable(w io.Writer, head []string, rows [][]string) {
	esc := func(s string) string { return strings.ReplaceAll(s, "|", `\|`) }
	fmt.Fprintf(w, "| %s |\n|%s\n", strings.Join(head, " | "), strings.Repeat(" --- |", len(head)))
	for _, r := range rows {
		cells := make([]string, len(r))
		for i, c := range r {
			cells[i] = esc(c)
		}
		fmt.Fprintf(w, "| %s |\n", strings.Join(cells, " | "))
	}
	fmt.Fprintln(w)
}

func writeMarkdown(w io.Writer, res *tuning.Result, agr *consensus.Agreement, meta Meta) {
	v := newView(res, agr, meta)
	fmt.Fprintf(w, "# Detector tuning report\n\nStudy %s · quorate %s · generated %s\n\n", meta.StudyID, meta.Version, v.Generated)
	fmt.Fprintf(w, "> **%s**\n\n", Caution)
	if len(res.Warnings) > 0 {
		// Warnings come before the figures: they say where the reference standard or
		// the sample is weaker than the figures look.
		fmt.Fprintln(w, "## Warnings")
		fmt.Fprintln(w)
		for _, s := range res.Warnings {
			fmt.Fprintf(w, "- %s\n", s)
		}
		fmt.Fprintln(w)
	}
	fmt.Fprintf(w, "## The chosen operating point\n\nAn event is marked when %s.\n\n", res.Final.Rule)
	fmt.Fprintf(w, "Chosen by the policy `%s` on the design-weighted figures. Reference standard: %s. %d events from %d subjects (%d IEDs); %d left out without a reference. Intervals at %.0f%%.\n\n",
		v.Policy, res.Final.Reference, res.Events, res.Subjects, res.Positives, res.Excluded, 100*res.Level)
	for _, c := range v.Cutoffs {
		fmt.Fprintf(w, "- %s\n", c)
	}
	fmt.Fprintln(w)
	if h := res.Final.Headline; h != nil {
		fmt.Fprintf(w, "Method: %s; %d replicates.\n\n", h.Method, h.Replicates)
	}
	mdTable(w, v.Expect.Head, v.Expect.Rows)
	for _, n := range v.Expect.Notes {
		fmt.Fprintf(w, "**No interval:** %s\n\n", n)
	}
	fmt.Fprintf(w, "%s\n\n### The chosen rule on the rated events (in sample: optimistic)\n\n", v.ExpectWhy)
	var rows [][]string
	for _, h := range v.Headline {
		rows = append(rows, []string{h.Name, h.Plain, h.Design, h.CV, h.Boot, h.Explain})
	}
	mdTable(w, []string{"Figure", "In sample, unweighted", "In sample, design-weighted", "Cross-validated", "Subject bootstrap", "What it means"}, rows)
	fmt.Fprintln(w, "Design-weighted figures count each event 1/π and so describe the archive; cross-validated figures repeat the whole choice with each group of subjects held out (pessimistic: each fold learns from fewer subjects); the subject bootstrap does not repeat the choice and is centred on the optimistic in-sample figure.")
	fmt.Fprintln(w)
	c := v.Confusion
	mdTable(w, []string{"", "Reference: IED", "Reference: not IED"}, [][]string{
		{"Marked", c[0][0] + " (" + c[1][0] + " weighted)", c[0][1] + " (" + c[1][1] + " weighted)"},
		{"Not marked", c[0][2] + " (" + c[1][2] + " weighted)", c[0][3] + " (" + c[1][3] + " weighted)"},
	})
	fmt.Fprintf(w, "## How many criteria? (panel majority)\n\nROC AUC through the k points: %s (design-weighted %s).\n\n", num(res.KSweep.AUC), num(res.KSweep.WeightedAUC))
	mdTable(w, []string{"k", "Sens.", "Spec.", "PPV", "Sens. (w)", "Spec. (w)", "PPV (w)", "LR+", "LR−", "Youden's J", ""}, v.KRows)
	fmt.Fprintln(w, "## Automatic features: cutoffs per criterion")
	fmt.Fprintln(w)
	mdTable(w, []string{"Criterion", "Feature", "Events", "AUC (DeLong)", "Cutoff", "Sens. at cutoff", "Spec. at cutoff", "Note"}, v.Criteria)
	fmt.Fprintf(w, "### At least k cutoffs met automatically\n\n%s\n\n", v.AutoHow)
	mdTable(w, []string{"k", "Rule", "Sens.", "Spec.", "PPV", "False/h", ""}, v.AutoByK)
	fmt.Fprintln(w, "## Detector score")
	fmt.Fprintln(w)
	for _, s := range v.Score {
		fmt.Fprintf(w, "%s\n\n", s)
	}
	fmt.Fprintf(w, "## Which criteria? (subset rules)\n\n%s\n\n", res.Subsets.Warning)
	mdTable(w, []string{"Rule", "Sens. (w)", "Spec. (w)", "Youden's J", "Picked by training folds"}, v.Subsets)
	if v.Agreement != nil {
		fmt.Fprintln(w, "## Panel agreement")
		fmt.Fprintln(w)
		mdTable(w, []string{"Question", "Events", "Observed agreement", "Fleiss' kappa", "Gwet's AC1", "Krippendorff's alpha"}, v.Agreement)
	}
}
