package main

import (
	"context"
	"fmt"
	"math"
	"slices"
	"strings"
	"time"

	"github.com/spf13/cobra"

	"github.com/quorate-eeg/quorate/cmd/quorate/internal/study"
	"github.com/quorate-eeg/quorate/export/report"
	"github.com/quorate-eeg/quorate/panel/merge"
	"github.com/quorate-eeg/quorate/sampling/archive"
	"github.com/quorate-eeg/quorate/sampling/candidate"
	"github.com/quorate-eeg/quorate/sampling/draw"
	"github.com/quorate-eeg/quorate/tuning"
	"github.com/quorate-eeg/quorate/tuning/accuracy"
)

type tuneFlags struct {
	reference, policy, method string
	folds, bootstrap          int
	seed                      uint64
}

func newTuneCmd(g *globals) *cobra.Command {
	f := &tuneFlags{}
	cmd := &cobra.Command{
		Use:   "tune",
		Short: "Sweep criteria, cutoffs and detector scores against the reference; report the operating point",
		Long: `tune reads the consensus, the candidates and the draw and answers what the centre came for:
how many IFCN criteria (and which) an event must meet, which cutoffs the automatic features
and the detector need on local data, and how good the result honestly is — with Wilson and
design-weighted intervals, subject-grouped cross-validation and a subject bootstrap.

The reference standard is the panel's verdict (panel), the Dawid–Skene probability ≥ 0.5
(dawid-skene), or an external table (external:FILE, columns event_id,reference or
subject_key,reference). Policies: youden, min-specificity=X, min-sensitivity=X,
max-false-per-hour=X, cost-ratio=X.

Writes tuning/sweep.parquet, tuning/operating-point.json, tuning/report.html and
tuning/report.md.`,
		Example: `  quorate --study /studies/ied-2027 tune
  quorate --study /studies/ied-2027 tune --policy max-false-per-hour=2 --reference external:video-eeg-diagnoses.csv`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			s, err := g.openStudy()
			if err != nil {
				return err
			}
			set := cmd.Flags().Changed
			c := s.Config
			if !set("reference") {
				f.reference = c.Tuning.Reference
			}
			if !set("policy") {
				f.policy = c.Tuning.Policy
			}
			if !set("folds") {
				f.folds = c.Tuning.Folds
			}
			if !set("bootstrap") {
				f.bootstrap = c.Tuning.Bootstrap
			}
			if !set("seed") {
				f.seed = c.Seed
			}
			return runTune(cmd.Context(), g, s, f)
		},
	}
	fl := cmd.Flags()
	fl.StringVar(&f.reference, "reference", "", "panel | dawid-skene | external:FILE (default: study.yaml)")
	fl.StringVar(&f.policy, "policy", "", "operating-point policy (default: study.yaml)")
	fl.IntVar(&f.folds, "folds", 0, "subject-grouped cross-validation folds")
	fl.IntVar(&f.bootstrap, "bootstrap", 0, "subject bootstrap replicates")
	fl.StringVar(&f.method, "method", tuning.MethodDefault, "how the automatic rule is fitted: "+tuning.MethodScoreVote+" (each criterion's cutoff against its panel majority and the detector score's against the panel's verdict, at one shared ROC point, then that point and k of the seven votes), "+tuning.MethodCriterion+" (the six criteria alone, k of 6), "+tuning.MethodVerdict+" (each cutoff against the panel's IED verdict, then that point and k) or "+tuning.MethodJoint+" (six cutoffs and k searched together)")
	fl.Uint64Var(&f.seed, "seed", 0, "random seed (default: study.yaml seed)")
	return cmd
}

func runTune(ctx context.Context, g *globals, s *study.Study, f *tuneFlags) error {
	pol, err := accuracy.ParsePolicy(f.policy)
	if err != nil {
		return usageError{fmt.Errorf("--policy: %w", err)}
	}
	if f.method != "" && !slices.Contains(tuning.Methods, f.method) { // "" is the default (the demo)
		return usageError{fmt.Errorf("--method: got %q, want one of %s", f.method, strings.Join(tuning.Methods, ", "))}
	}
	consPath := s.Path(study.ConsensusDir, merge.ConsensusFile)
	evs, err := merge.ReadConsensus(consPath)
	if err != nil {
		return fmt.Errorf("no consensus yet (run quorate merge first): %w", err)
	}
	drawPath := s.Path(study.DrawDir, draw.DrawFile)
	rows, err := draw.ReadRows(drawPath)
	if err != nil {
		return fmt.Errorf("no draw yet (run quorate draw first): %w", err)
	}
	cands, err := candidate.ReadDir(s.Path(study.CandidatesDir))
	if err != nil {
		return err
	}
	indexPath := s.Path(study.IndexDir, archive.IndexFile)
	recs, err := archive.ReadIndex(indexPath)
	if err != nil {
		return err
	}
	var external map[string]int8
	refName := "panel majority verdict"
	switch {
	case f.reference == "dawid-skene":
		refName = "Dawid–Skene probability ≥ 0.5"
	case strings.HasPrefix(f.reference, "external:"):
		path := strings.TrimPrefix(f.reference, "external:")
		ids := make([]string, len(rows))
		subj := make(map[string]string, len(rows))
		for i, r := range rows {
			ids[i] = r.EventID
			subj[r.EventID] = r.SubjectKey
		}
		if external, err = tuning.ReadExternalReference(path, ids, subj); err != nil {
			return err
		}
		refName = "external reference " + path
	case f.reference != "panel":
		return usageError{fmt.Errorf("--reference: got %q, want panel, dawid-skene or external:FILE", f.reference)}
	}
	kind := tuning.ReferencePanel
	switch {
	case external != nil:
		kind = tuning.ReferenceExternal
	case f.reference == "dawid-skene":
		kind = tuning.ReferenceDawidSkene
	}
	events := tuning.Join(rows, evs, cands, kind, external)
	hours := 0.0
	for _, r := range recs {
		hours += r.DurationS / 3600
	}
	agr, err := readAgreement(s.Path(study.ConsensusDir, merge.AgreementJSON))
	if err != nil {
		return err
	}
	ready := panelReadiness(s, evs, agr)
	// The panel's state is said before tuning, so that it is said also when
	// tuning then fails on a weak or incomplete panel.
	for _, w := range ready.Warnings() {
		g.warn("tune", "%s", w)
	}
	res, err := tuning.Run(ctx, tuning.Options{Events: events, RecordingHours: hours, Policy: pol,
		Folds: f.folds, Bootstrap: f.bootstrap, Method: f.method, Seed: f.seed, ReferenceName: refName, Progress: g.progress})
	if err != nil {
		if ready.NoEventReachedQuorum() && strings.HasPrefix(f.reference, "panel") {
			return fmt.Errorf("no event reached the panel's quorum of %d answers (%d of %d packets outstanding): merge more returns, then tune", ready.Quorum, ready.OutstandingPackets, ready.Packets)
		}
		return err
	}
	own := res.Warnings
	res.Warnings = append(ready.Warnings(), res.Warnings...)
	inputs := s.Hash(consPath, drawPath, indexPath, s.Path(study.CandidatesDir))
	hashes := map[string]string{}
	for _, h := range inputs {
		hashes[h.Path] = h.SHA256
	}
	meta := report.Meta{StudyID: s.Config.Study.ID, InputHashes: hashes, Version: Version, Generated: time.Now().UTC()}
	if err := report.Write(s.Path(study.TuningDir), res, agr, meta); err != nil {
		return err
	}
	for _, w := range own {
		g.warn("tune", "%s", w)
	}
	seed := f.seed
	if err := s.Record(study.Entry{Version: Version, Command: "tune", Argv: g.argv, Seed: &seed, Inputs: inputs,
		Outputs: s.Hash(s.Path(study.TuningDir)),
		Notes:   map[string]any{"events": len(events), "reference": refName, "policy": pol.String(), "rule": res.Final.Rule}}); err != nil {
		return err
	}
	fp := res.Final
	fmt.Fprintf(g.stdout, "Operating point (%s, chosen by %s against the %s):\n  %s\n", fp.Analysis, fp.Policy, refName, fp.Rule)
	if h := fp.Headline; h != nil {
		fmt.Fprintf(g.stdout, "  to expect on new recordings: sensitivity %s, specificity %s, PPV %s, false detections per hour %s\n  (%.0f %% intervals; %s)\n",
			estimate(h.Sens), estimate(h.Spec), estimate(h.PPV), estimate(h.FalsePerHour), 100*res.Level, h.Method)
	}
	m := fp.InSample
	fmt.Fprintf(g.stdout, "  in sample, optimistic (the rule was chosen on these events): sensitivity %s, specificity %s, PPV %s (design-weighted)\n",
		estimate(m.Design.Sens), estimate(m.Design.Spec), estimate(m.Design.PPV))
	fmt.Fprintf(g.stdout, "Report: %s\n", s.Path(study.TuningDir, report.HTMLFile))
	return g.finish(len(res.Warnings))
}

// estimate prints a figure with its interval, or says there is none.
func estimate(e tuning.Estimate) string {
	if math.IsNaN(e.Value) {
		return "undefined"
	}
	if math.IsNaN(e.Lo) || math.IsNaN(e.Hi) {
		return fmt.Sprintf("%.2f (no interval: see the notes)", e.Value)
	}
	return fmt.Sprintf("%.2f (%.2f–%.2f)", e.Value, e.Lo, e.Hi)
}
