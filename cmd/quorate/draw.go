package main

import (
	"context"
	"encoding/csv"
	"fmt"
	"os"
	"strconv"
	"strings"

	"github.com/spf13/cobra"

	"github.com/quorate-eeg/quorate/cmd/quorate/internal/study"
	"github.com/quorate-eeg/quorate/panel/consensus"
	"github.com/quorate-eeg/quorate/panel/merge"
	"github.com/quorate-eeg/quorate/sampling/archive"
	"github.com/quorate-eeg/quorate/sampling/candidate"
	"github.com/quorate-eeg/quorate/sampling/draw"
)

type drawFlags struct {
	n, min, capN, controls, topUp int
	strata, allocation, sdColumn  string
	epochS, distS                 float64
	seed                          uint64
	replace, adaptive             bool
}

func newDrawCmd(g *globals) *cobra.Command {
	f := &drawFlags{}
	cmd := &cobra.Command{
		Use:   "draw",
		Short: "Draw a stratified sample of candidates (and background controls) for the panel",
		Long: `draw selects the events the panel will rate: a stratified sample of the candidates with
known inclusion probabilities, plus background control epochs away from any candidate, and
writes draw/draw.parquet (event, stratum, inclusion probability, design weight, phase, draw
order), draw/design.json and draw/strata.csv. Every later estimate is weighted by these
probabilities. Defaults come from study.yaml (draw:); flags override them.

Allocation: accuracy (study.yaml's default, on score octiles: oversamples strata likely to
hold IEDs, judged by the share of candidates with auto_count ≥ 4, for precise sensitivity and
specificity; every stratum keeps at least 2), equal, proportional, neyman (with --sd-column, a
pilot standard deviation column), or table:FILE (a CSV with columns stratum,n). An existing draw is never replaced
silently: --top-up N adds N events as a new phase; with --adaptive the new phase is allocated
from the panel's merged returns (consensus/consensus.parquet: per stratum, the share judged
epileptiform and the share the raters split on), with design weights that stay unbiased;
--replace starts over and keeps the old files beside the new ones.`,
		Example: `  quorate --study /studies/ied-2027 draw --n 300 --strata score:q5,region --subject-cap 25
  quorate --study /studies/ied-2027 draw --allocation neyman --sd-column score --n 400
  quorate --study /studies/ied-2027 draw --allocation accuracy --n 200
  quorate --study /studies/ied-2027 draw --top-up 100 --adaptive`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			s, err := g.openStudy()
			if err != nil {
				return err
			}
			if cmd.Flags().Changed("top-up") && f.topUp < 1 {
				return usageError{fmt.Errorf("--top-up: got %d, want the number of events to add (at least 1)", f.topUp)}
			}
			applyDrawDefaults(cmd, f, s.Config)
			return runDraw(cmd.Context(), g, s, f)
		},
	}
	fl := cmd.Flags()
	fl.IntVar(&f.n, "n", 0, "events to draw (default: study.yaml draw.n)")
	fl.StringVar(&f.strata, "strata", "", "stratifying columns, e.g. score:q5,region or score:edges=0,2,4")
	fl.StringVar(&f.allocation, "allocation", "", "accuracy | equal | proportional | neyman | table:FILE (default: study.yaml draw.allocation)")
	fl.StringVar(&f.sdColumn, "sd-column", "score", "numeric column whose within-stratum SD pilots a Neyman allocation")
	fl.IntVar(&f.min, "min-per-stratum", 0, "fewest events per stratum")
	fl.IntVar(&f.capN, "subject-cap", 0, "most events per subject and stratum (0: no cap)")
	fl.IntVar(&f.controls, "controls", 0, "background control epochs")
	fl.Float64Var(&f.epochS, "control-epoch", 0, "control epoch length, s")
	fl.Float64Var(&f.distS, "control-distance", 0, "least distance of a control from any candidate, s")
	fl.Uint64Var(&f.seed, "seed", 0, "random seed (default: study.yaml seed)")
	fl.IntVar(&f.topUp, "top-up", 0, "add this many events to the existing draw as a new phase")
	fl.BoolVar(&f.replace, "replace", false, "replace the existing draw, keeping the old files beside the new")
	fl.BoolVar(&f.adaptive, "adaptive", false, "with --top-up: allocate the new phase from the panel's merged returns")
	return cmd
}

func applyDrawDefaults(cmd *cobra.Command, f *drawFlags, c *study.Config) {
	set := cmd.Flags().Changed
	if !set("n") {
		f.n = c.Draw.N
	}
	if !set("strata") {
		f.strata = c.Draw.Strata
	}
	if !set("allocation") {
		f.allocation = c.Draw.Allocation
	}
	if !set("min-per-stratum") {
		f.min = c.Draw.MinPerStratum
	}
	if !set("subject-cap") {
		f.capN = c.Draw.SubjectCap
	}
	if !set("controls") {
		f.controls = c.Draw.Controls
	}
	if !set("control-epoch") {
		f.epochS = c.Draw.ControlEpochS
	}
	if !set("control-distance") {
		f.distS = c.Draw.ControlDistS
	}
	if !set("seed") {
		f.seed = c.Seed
	}
}

func runDraw(ctx context.Context, g *globals, s *study.Study, f *drawFlags) error {
	if f.topUp < 0 {
		return usageError{fmt.Errorf("--top-up: got %d, want a number of events ≥ 1", f.topUp)}
	}
	if f.adaptive && f.topUp == 0 {
		return usageError{fmt.Errorf("--adaptive needs --top-up N")}
	}
	specs, err := draw.ParseStrata(f.strata)
	if err != nil {
		return usageError{fmt.Errorf("--strata: %w", err)}
	}
	alloc := draw.Allocation{N: f.n, Min: f.min, SDColumn: f.sdColumn}
	if file, ok := strings.CutPrefix(f.allocation, "table:"); ok {
		alloc.Method = draw.Table
		if alloc.Table, err = readAllocationTable(file); err != nil {
			return err
		}
	} else if alloc.Method, err = draw.ParseMethod(f.allocation); err != nil {
		return usageError{fmt.Errorf("--allocation: %w (or table:FILE)", err)}
	}
	cands, err := candidate.ReadDir(s.Path(study.CandidatesDir))
	if err != nil {
		return err
	}
	recs, err := archive.ReadIndex(s.Path(study.IndexDir, archive.IndexFile))
	if err != nil {
		return fmt.Errorf("reading the archive index (run quorate scan first): %w", err)
	}
	var est map[string]draw.PhaseEstimate
	if f.adaptive {
		if est, err = phaseEstimates(s); err != nil {
			return err
		}
	}
	res, err := draw.Run(ctx, draw.Options{
		Candidates: cands, Recordings: recs, OutDir: s.Path(study.DrawDir),
		Design:   draw.Design{Strata: specs, Alloc: alloc, Cap: f.capN, Seed: f.seed},
		Controls: f.controls, ControlEpochS: f.epochS, ControlDistS: f.distS,
		TopUp: f.topUp, Replace: f.replace, Adaptive: est,
	})
	if err != nil {
		return err
	}
	for _, w := range res.Warnings {
		g.warn("draw", "%s", w)
	}
	seed := f.seed
	inputs := append(s.Hash(s.Path(study.CandidatesDir)), s.Hash(s.Path(study.IndexDir, archive.IndexFile))...)
	if f.adaptive {
		inputs = append(inputs, s.Hash(s.Path(study.ConsensusDir, merge.ConsensusFile))...)
	}
	if err := s.Record(study.Entry{Version: Version, Command: "draw", Argv: g.argv, Seed: &seed, Inputs: inputs,
		Outputs: s.Hash(s.Path(study.DrawDir, draw.DrawFile), s.Path(study.DrawDir, draw.DesignFile), s.Path(study.DrawDir, draw.StrataFile)),
		Notes: map[string]any{"rows": len(res.Rows), "strata": len(res.Strata), "top_up": f.topUp, "adaptive": f.adaptive, "replaced": res.Replaced,
			"phase": res.Phase.Phase, "phase_allocation": res.Phase.Allocation}}); err != nil {
		return err
	}
	nc := 0
	for _, r := range res.Rows {
		if r.Kind == draw.KindControl {
			nc++
		}
	}
	if f.topUp > 0 {
		added := 0
		for _, r := range res.Rows {
			if r.Kind == draw.KindCandidate && int(r.Phase) == res.Phase.Phase {
				added++
			}
		}
		// A top-up draws no controls: the earlier phases' controls stay as they were.
		fmt.Fprintf(g.stdout, "Phase %d: drew %d more events (%d in all, in %d strata) from %d candidates; the %d background controls are unchanged; see %s.\n",
			res.Phase.Phase, added, len(res.Rows)-nc, len(res.Strata), len(cands), nc, s.Path(study.DrawDir, draw.StrataFile))
	} else {
		fmt.Fprintf(g.stdout, "Drew %d events in %d strata and %d background controls (of %d eligible epochs) from %d candidates; see %s.\n",
			len(res.Rows)-nc, len(res.Strata), nc, res.Eligible, len(cands), s.Path(study.DrawDir, draw.StrataFile))
	}
	return g.finish(len(res.Warnings))
}

// phaseEstimates reads the merged returns and the draw and gives, per
// stratum, the share of rated events judged epileptiform and the share on
// which the raters split (both verdict votes present).
func phaseEstimates(s *study.Study) (map[string]draw.PhaseEstimate, error) {
	path := s.Path(study.ConsensusDir, merge.ConsensusFile)
	cons, err := merge.ReadConsensus(path)
	if err != nil {
		return nil, fmt.Errorf("--adaptive needs the merged returns (run quorate merge first): %w", err)
	}
	rows, err := draw.ReadRows(s.Path(study.DrawDir, draw.DrawFile))
	if err != nil {
		return nil, err
	}
	stratum := make(map[string]string, len(rows))
	for _, r := range rows {
		if r.Kind == draw.KindCandidate {
			stratum[r.EventID] = r.Stratum
		}
	}
	type acc struct{ n, yes, split int }
	by := map[string]*acc{}
	for _, e := range cons {
		h, ok := stratum[e.EventID]
		v, decided := consensus.ParseVerdict(e.Verdict)
		if !ok || !decided || (v != consensus.Present && v != consensus.Absent) {
			continue
		}
		a := by[h]
		if a == nil {
			a = &acc{}
			by[h] = a
		}
		a.n++
		if v == consensus.Present {
			a.yes++
		}
		if e.VerdictYes > 0 && e.VerdictNo > 0 {
			a.split++
		}
	}
	if len(by) == 0 {
		return nil, fmt.Errorf("%s: no rated event of the draw has a verdict; --adaptive needs phase-1 returns", path)
	}
	est := make(map[string]draw.PhaseEstimate, len(by))
	for h, a := range by {
		est[h] = draw.PhaseEstimate{Prevalence: float64(a.yes) / float64(a.n), Disagreement: float64(a.split) / float64(a.n), Rated: a.n}
	}
	return est, nil
}

// readAllocationTable reads a CSV with a header "stratum,n".
func readAllocationTable(path string) (map[string]int, error) {
	fh, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer fh.Close()
	rows, err := csv.NewReader(fh).ReadAll()
	if err != nil {
		return nil, fmt.Errorf("%s: %w", path, err)
	}
	if len(rows) == 0 || len(rows[0]) != 2 || rows[0][0] != "stratum" || rows[0][1] != "n" {
		// Spreadsheets in many locales save "CSV" with semicolons: say so
		// rather than leave a one-column header unexplained.
		if len(rows) > 0 && len(rows[0]) == 1 && strings.ContainsAny(rows[0][0], ";\t") {
			return nil, fmt.Errorf("%s: row 1: the table is separated by semicolons or tabs; save it as comma-separated CSV with the header stratum,n", path)
		}
		return nil, fmt.Errorf("%s: row 1: want the header stratum,n", path)
	}
	t := map[string]int{}
	for i, r := range rows[1:] {
		n, err := strconv.Atoi(strings.TrimSpace(r[1]))
		if err != nil || n < 0 {
			return nil, fmt.Errorf("%s: row %d, field n: got %q, want a whole number ≥ 0", path, i+2, r[1])
		}
		t[r[0]] = n
	}
	return t, nil
}
