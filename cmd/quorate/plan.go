package main

import (
	"context"
	"fmt"
	"strconv"
	"strings"
	"text/tabwriter"

	"github.com/spf13/cobra"

	"github.com/quorate-eeg/quorate/cmd/quorate/internal/study"
	"github.com/quorate-eeg/quorate/sampling/candidate"
	"github.com/quorate-eeg/quorate/sampling/draw"
	"github.com/quorate-eeg/quorate/sampling/plan"
)

type planFlags struct {
	sizes, strata, allocation, prevalence string
	sens, spec, deff, kappa, seconds      float64
	raters, controls, capN                int
}

func newPlanCmd(g *globals) *cobra.Command {
	f := &planFlags{}
	cmd := &cobra.Command{
		Use:   "plan",
		Short: "Forecast interval widths and rater-hours for several sample sizes before drawing",
		Long: `plan answers, before any rating: how many events must the panel rate, with how many
raters, to know sensitivity and specificity within ±X? From the candidates' strata, a
prevalence guess per stratum, the allocation, a design effect and an expected kappa it
prints, for each sample size, the expected IEDs drawn, the expected 95 % half-widths of the
design-weighted sensitivity and specificity, the share of events whose panel majority is
expected to be wrong, and the rater-hours. Nothing is written but the provenance line.

Prevalence per stratum: "auto" (default) takes the share of candidates with auto_count ≥ 4
in each stratum, a monotone stand-in; "returns" takes the panel's merged phase-1 verdicts
(consensus/consensus.parquet) where a stratum has them; a number uses it for every stratum.`,
		Example: `  quorate --study /studies/ied-2027 plan
  quorate --study /studies/ied-2027 plan --allocation accuracy --raters 5 --kappa 0.55
  quorate --study /studies/ied-2027 plan --prevalence returns --sizes 100,200,400`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			s, err := g.openStudy()
			if err != nil {
				return err
			}
			set := cmd.Flags().Changed
			if !set("strata") {
				f.strata = s.Config.Draw.Strata
			}
			if !set("allocation") {
				f.allocation = s.Config.Draw.Allocation
			}
			if !set("subject-cap") {
				f.capN = s.Config.Draw.SubjectCap
			}
			if !set("controls") {
				f.controls = s.Config.Draw.Controls
			}
			if !set("raters") && len(s.Config.Panel.Raters) > 0 {
				f.raters = len(s.Config.Panel.Raters)
			}
			return runPlan(cmd.Context(), g, s, f)
		},
	}
	fl := cmd.Flags()
	fl.StringVar(&f.sizes, "sizes", "100,200,300,500,800", "total events to consider, comma-separated")
	fl.StringVar(&f.strata, "strata", "", "stratifying columns (default: study.yaml draw.strata)")
	fl.StringVar(&f.allocation, "allocation", "", "equal | proportional | accuracy (default: study.yaml draw.allocation)")
	fl.StringVar(&f.prevalence, "prevalence", "auto", `prevalence per stratum: auto, returns, or a number in (0,1)`)
	fl.Float64Var(&f.sens, "sensitivity", 0.8, "expected sensitivity of the operating point")
	fl.Float64Var(&f.spec, "specificity", 0.9, "expected specificity of the operating point")
	fl.Float64Var(&f.deff, "design-effect", 1.5, "variance inflation for events clustered in subjects (≥ 1)")
	fl.Float64Var(&f.kappa, "kappa", 0.4, "expected Fleiss' kappa of the panel")
	fl.IntVar(&f.raters, "raters", 3, "raters per event (default: the study's panel)")
	fl.Float64Var(&f.seconds, "seconds-per-item", 30, "rating time per item and rater, s")
	fl.IntVar(&f.controls, "controls", 0, "background controls rated besides the events (default: study.yaml)")
	fl.IntVar(&f.capN, "subject-cap", 0, "most events per subject and stratum (default: study.yaml)")
	return cmd
}

func runPlan(ctx context.Context, g *globals, s *study.Study, f *planFlags) error {
	var sizes []int
	for _, t := range strings.Split(f.sizes, ",") {
		n, err := strconv.Atoi(strings.TrimSpace(t))
		if err != nil || n < 1 {
			return usageError{fmt.Errorf("--sizes: got %q, want whole numbers ≥ 1 separated by commas", t)}
		}
		sizes = append(sizes, n)
	}
	specs, err := draw.ParseStrata(f.strata)
	if err != nil {
		return usageError{fmt.Errorf("--strata: %w", err)}
	}
	method, err := draw.ParseMethod(f.allocation)
	if err != nil || method == draw.Neyman || method == draw.Table {
		return usageError{fmt.Errorf("--allocation: got %q, want equal, proportional or accuracy", f.allocation)}
	}
	alloc := draw.Allocation{Method: method}
	cands, err := candidate.ReadDir(s.Path(study.CandidatesDir))
	if err != nil {
		return err
	}
	if len(cands) == 0 {
		return fmt.Errorf("no candidates: run quorate detect or quorate import-events first")
	}
	frame := draw.FrameOf(cands)
	d := draw.Design{Strata: specs, Alloc: alloc, Cap: f.capN, Seed: s.Config.Seed}
	inputs := s.Hash(s.Path(study.CandidatesDir))
	switch f.prevalence {
	case "auto":
	case "returns":
		est, err := phaseEstimates(s)
		if err != nil {
			return err
		}
		d.Alloc.Prior = map[string]float64{}
		for h, e := range est {
			d.Alloc.Prior[h] = e.Prevalence
		}
		inputs = append(inputs, s.Hash(s.Path(study.ConsensusDir))...)
	default:
		p, err := strconv.ParseFloat(f.prevalence, 64)
		if err != nil || !(p > 0 && p < 1) {
			return usageError{fmt.Errorf("--prevalence: got %q, want auto, returns or a number in (0,1)", f.prevalence)}
		}
		st, err := draw.Stratify(frame, specs)
		if err != nil {
			return err
		}
		d.Alloc.Prior = map[string]float64{}
		for _, l := range st.Labels {
			d.Alloc.Prior[l] = p
		}
	}
	sp, err := draw.PlanStrata(frame, d)
	if err != nil {
		return err
	}
	rows, err := plan.Run(ctx, plan.Options{Strata: sp, Alloc: d.Alloc, Sizes: sizes, Sens: f.sens, Spec: f.spec,
		DesignEffect: f.deff, Kappa: f.kappa, Raters: f.raters, SecondsPerItem: f.seconds, Controls: f.controls})
	if err != nil {
		return err
	}
	fmt.Fprintf(g.stdout, "Plan for %d candidates in %d strata, %s allocation, %d raters, %.0f s per item, design effect %.2g, kappa %.2g:\n",
		len(cands), len(sp.Labels), method, f.raters, f.seconds, f.deff, f.kappa)
	tw := tabwriter.NewWriter(g.stdout, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "events\texpected IEDs\tsensitivity ±\tspecificity ±\tmajority wrong\trater-hours\t")
	for _, r := range rows {
		fmt.Fprintf(tw, "%d\t%.0f\t%.3f\t%.3f\t%.1f %%\t%.1f\t\n", r.N, r.Positives, r.SensHalfWidth, r.SpecHalfWidth, 100*r.ReferenceError, r.RaterHours)
	}
	if err := tw.Flush(); err != nil {
		return err
	}
	fmt.Fprintln(g.stdout, "Half-widths are 95 % forecasts under the stated guesses; a research and quality tool, not a diagnostic device.")
	notes := map[string]any{"sizes": sizes, "allocation": method.String(), "prevalence": f.prevalence, "raters": f.raters,
		"seconds_per_item": f.seconds, "design_effect": f.deff, "kappa": f.kappa}
	return s.Record(study.Entry{Version: Version, Command: "plan", Argv: g.argv, Inputs: inputs, Notes: notes})
}
