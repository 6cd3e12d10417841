package main

import (
	"context"
	"crypto/sha256"
	"encoding/binary"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"sort"
	"strings"

	"github.com/spf13/cobra"

	"github.com/quorate-eeg/quorate/cmd/quorate/internal/study"
	"github.com/quorate-eeg/quorate/export/report"
	"github.com/quorate-eeg/quorate/internal/atomicfile"
	"github.com/quorate-eeg/quorate/panel/consensus"
	"github.com/quorate-eeg/quorate/panel/merge"
	"github.com/quorate-eeg/quorate/panel/packet"
	"github.com/quorate-eeg/quorate/panel/simulate"
	"github.com/quorate-eeg/quorate/sampling/archive"
	"github.com/quorate-eeg/quorate/sampling/candidate"
	"github.com/quorate-eeg/quorate/sampling/draw"
	"github.com/quorate-eeg/quorate/sampling/synth"
	"github.com/quorate-eeg/quorate/sampling/textbook"
	"github.com/quorate-eeg/quorate/tuning"
	"github.com/quorate-eeg/quorate/tuning/accuracy"
)

type demoFlags struct {
	out        string
	recordings int
	raters     int
	minutes    float64
	n          int
	seed       uint64
	generator  string
	allocation string // draw allocation; "" takes study.yaml's
	strata     string // draw strata; "" takes study.yaml's
}

// demoMarker marks a folder made by the demo, which a later demo may replace.
const demoMarker = ".quorate-demo"

func newDemoCmd(g *globals) *cobra.Command {
	f := &demoFlags{}
	cmd := &cobra.Command{
		Use:   "demo",
		Short: "Run the whole job on a fictional archive made on the spot",
		Long: `demo generates a fictional centre's EEG archive (synthetic EDF+ recordings with true
IEDs from dipolar sources and look-alikes built to fail particular criteria, each listed in
a truth table), creates a study, and runs every step: scan, detect, draw, packets,
returns from a simulated panel, merge, tune and export. It prints a summary and says where
the report is. Every patient, rater and centre in it is invented.`,
		Example: `  quorate demo
  quorate demo --out /tmp/quorate-demo --recordings 12 --raters 7 --seed 42`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			return runDemo(cmd.Context(), g, f)
		},
	}
	fl := cmd.Flags()
	fl.StringVar(&f.out, "out", "quorate-demo", "folder for the fictional archive, the study and the export")
	fl.IntVar(&f.recordings, "recordings", 8, "fictional recordings (one per fictional patient)")
	fl.IntVar(&f.raters, "raters", 5, "simulated raters on the panel")
	fl.Float64Var(&f.minutes, "minutes", 10, "length of each recording, minutes")
	fl.IntVar(&f.n, "n", 200, "events drawn for the panel")
	fl.Uint64Var(&f.seed, "seed", 1, "seed of everything the demo makes")
	fl.StringVar(&f.allocation, "allocation", "", "draw allocation, as draw --allocation (default: study.yaml draw.allocation)")
	fl.StringVar(&f.strata, "strata", "", "draw strata, as draw --strata (default: study.yaml draw.strata)")
	fl.StringVar(&f.generator, "generator", "first", "which synthetic generator writes the archive: first, second (independent waveform, background and head models) or both (half each)")
	return cmd
}

func runDemo(ctx context.Context, g *globals, f *demoFlags) error {
	if f.recordings < 2 || f.raters < 2 || f.minutes <= 0 || f.n < 10 {
		return usageError{errors.New("demo needs --recordings ≥ 2, --raters ≥ 2, --minutes > 0 and --n ≥ 10")}
	}
	if f.generator != "first" && f.generator != "second" && f.generator != "both" {
		return usageError{fmt.Errorf("--generator %q: want first, second or both", f.generator)}
	}
	if err := prepareDemoDir(f.out); err != nil {
		return err
	}
	out := g.stdout
	step := func(name string) { fmt.Fprintf(out, "» %s\n", name) }
	g.stdout = &indent{w: out, at: true}
	defer func() { g.stdout = out }()

	step("writing a fictional archive")
	archDir, truthDir := filepath.Join(f.out, "archive"), filepath.Join(f.out, "truth")
	truthByPath, err := demoArchive(f, archDir, truthDir)
	if err != nil {
		return err
	}
	if err := ctx.Err(); err != nil {
		return err
	}

	step("creating the study")
	studyDir := filepath.Join(f.out, "study")
	h := sha256.Sum256(binary.BigEndian.AppendUint64([]byte("quorate demo study secret"), f.seed))
	if err := study.InitWith(studyDir, []string{archDir}, f.seed, fmt.Sprintf("st-demo-%d", f.seed), h[:]); err != nil {
		return err
	}
	s, err := study.Open(studyDir)
	if err != nil {
		return err
	}
	s.Stages = pipeline
	profiles := simulate.Panel(f.raters)
	names := make([]string, len(profiles))
	for i, p := range profiles {
		names[i] = p.Name
	}
	s.Config.Panel.Raters = names
	g.study = studyDir

	step("scan")
	if err := runScan(ctx, g, s, nil); err != nil {
		return err
	}
	step("detect")
	if err := runDetect(ctx, g, s, 0, 1); err != nil {
		return err
	}
	cands, err := candidate.ReadDir(s.Path(study.CandidatesDir))
	if err != nil {
		return err
	}
	step("draw")
	c := s.Config
	df := &drawFlags{n: min(f.n, len(cands)), strata: c.Draw.Strata, allocation: c.Draw.Allocation, sdColumn: "score",
		min: c.Draw.MinPerStratum, capN: c.Draw.SubjectCap, controls: c.Draw.Controls, epochS: c.Draw.ControlEpochS,
		distS: c.Draw.ControlDistS, seed: f.seed}
	if f.allocation != "" {
		df.allocation = f.allocation
	}
	if f.strata != "" {
		df.strata = f.strata
	}
	if err := runDraw(ctx, g, s, df); err != nil && !isWarnings(err) {
		return err
	}
	step("packets")
	if err := runPackets(ctx, g, s, &packetsFlags{raters: strings.Join(names, ","), seed: f.seed,
		duplicate: c.Panel.DuplicateShare, window: c.Panel.WindowS}); err != nil && !isWarnings(err) {
		return err
	}

	step("the simulated panel rates its packets")
	recs, err := readIndex(s)
	if err != nil {
		return err
	}
	truthOf := demoTruth(recs, cands, truthByPath)
	m, err := packet.ReadManifest(s.Path(study.PacketsDir, packet.ManifestFile))
	if err != nil {
		return err
	}
	key, err := packet.ReadKey(s.Path(study.PacketsDir, packet.KeyFile))
	if err != nil {
		return err
	}
	files, err := simulate.Returns(m, key, profiles, func(id string) (simulate.Truth, bool) {
		e, ok := truthOf[id]
		return simulate.Truth{Meets: e.Meets, IED: e.IsIED}, ok
	}, f.seed)
	if err != nil {
		return err
	}
	inbox := filepath.Join(f.out, "inbox")
	var paths []string
	for name, b := range files {
		p := filepath.Join(inbox, name)
		if err := os.MkdirAll(inbox, 0o755); err != nil {
			return err
		}
		if err := atomicfile.WriteBytes(p, b, 0o644); err != nil {
			return err
		}
		paths = append(paths, p)
	}
	sort.Strings(paths)
	step("merge")
	if err := runMerge(ctx, g, s, paths, f.seed); err != nil {
		return err
	}
	step("tune")
	if err := runTune(ctx, g, s, &tuneFlags{reference: "panel", policy: c.Tuning.Policy, folds: c.Tuning.Folds,
		bootstrap: c.Tuning.Bootstrap, seed: f.seed}); err != nil && !isWarnings(err) {
		return err
	}
	step("export")
	if err := runExport(ctx, g, s, &exportFlags{to: filepath.Join(f.out, "export"), format: "parquet", montage: "common-average", window: 10}); err != nil {
		return err
	}
	g.stdout = out
	return demoSummary(out, s, recs, cands, truthOf)
}

func isWarnings(err error) bool {
	var w warningsError
	return errors.As(err, &w)
}

// prepareDemoDir makes dir, replacing an earlier demo's folder but nothing else.
func prepareDemoDir(dir string) error {
	ents, err := os.ReadDir(dir)
	switch {
	case os.IsNotExist(err):
	case err != nil:
		return err
	case len(ents) == 0:
	default:
		if _, err := os.Stat(filepath.Join(dir, demoMarker)); err != nil {
			return fmt.Errorf("%s exists and was not made by quorate demo; choose another --out", dir)
		}
		if err := os.RemoveAll(dir); err != nil {
			return err
		}
	}
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return err
	}
	return atomicfile.WriteBytes(filepath.Join(dir, demoMarker), []byte("made by quorate demo; a later demo may replace this folder\n"), 0o644)
}

// demoTruth matches each candidate to the generator's event within 50 ms of its peak.
func demoTruth(recs []archive.Recording, cands []candidate.Row, truthByPath map[string][]synth.Event) map[string]synth.Event {
	byRec := map[string][]synth.Event{}
	for _, r := range recs {
		byRec[r.RecordingID] = truthByPath[r.Path]
	}
	out := map[string]synth.Event{}
	for _, c := range cands {
		if e, ok := synth.Nearest(byRec[c.RecordingID], c.OnsetS, 0.05); ok {
			out[c.EventID] = e
		}
	}
	return out
}

func demoSummary(w io.Writer, s *study.Study, recs []archive.Recording, cands []candidate.Row, truth map[string]synth.Event) error {
	hours := 0.0
	for _, r := range recs {
		hours += r.DurationS / 3600
	}
	rows, err := draw.ReadRows(s.Path(study.DrawDir, draw.DrawFile))
	if err != nil {
		return err
	}
	nc := 0
	for _, r := range rows {
		if r.Kind == draw.KindControl {
			nc++
		}
	}
	ied := 0
	for _, e := range truth {
		if e.IsIED {
			ied++
		}
	}
	fmt.Fprintf(w, "\nquorate demo — a fictional centre, %s\n\n", synth.DefaultCentre)
	fmt.Fprintf(w, "Scanned     %d recordings, %.1f hours of EEG\n", len(recs), hours)
	fmt.Fprintf(w, "Detected    %d candidate events (%d of them true IEDs by the generator's truth table)\n", len(cands), ied)
	fmt.Fprintf(w, "Drew        %d events and %d background controls for the panel\n", len(rows)-nc, nc)
	var agr consensus.Agreement
	if b, err := os.ReadFile(s.Path(study.ConsensusDir, merge.AgreementJSON)); err == nil && json.Unmarshal(b, &agr) == nil {
		fmt.Fprintf(w, "Panel       %d simulated raters; Fleiss' kappa with 95 %% intervals resampling subjects:\n", len(agr.Raters))
		for _, q := range agr.Questions {
			fmt.Fprintf(w, "              %-8s %s\n", q.Question, kappaText(q.Fleiss, q.FleissBand))
		}
	}
	op, err := report.ReadOperatingPoint(s.Path(study.TuningDir, report.PointFile))
	if err != nil {
		return err
	}
	fmt.Fprintf(w, "Operating   %s\n            chosen by %s against the %s\n", op.Rule, op.Policy, op.ReferenceStandard)
	if h := op.Headline; h != nil {
		fmt.Fprintf(w, "            to expect on new recordings:  sensitivity %s, specificity %s\n            (%s)\n",
			interval(h.Sensitivity), interval(h.Specificity), h.Method)
	}
	d := op.InSample.DesignWeighted
	fmt.Fprintf(w, "            in sample (design-weighted):  sensitivity %s, specificity %s: optimistic, the rule was chosen on these events\n",
		interval(d.Sensitivity), interval(d.Specificity))
	ts := TruthCheck(op, cands, truth)
	fmt.Fprintf(w, "            the generator's truth on all %d candidates:  sensitivity %.2f (%.2f–%.2f), specificity %.2f (%.2f–%.2f)\n",
		ts.N, ts.Sens, ts.SensLo, ts.SensHi, ts.Spec, ts.SpecLo, ts.SpecHi)
	fmt.Fprintf(w, "\nReport      %s\nExport      %s\nStudy       %s\n\n%s\n", s.Path(study.TuningDir, report.HTMLFile),
		filepath.Join(filepath.Dir(s.Dir), "export"), s.Dir, caution)
	return nil
}

// interval prints a reported figure with its interval, or says there is none.
func interval(v report.Interval) string {
	return estimate(tuning.Estimate{Value: float64(v.Value), Lo: float64(v.Lo), Hi: float64(v.Hi)})
}

// TruthStats is an operating point scored against the generator's truth.
type TruthStats struct {
	N                                          int
	Sens, SensLo, SensHi, Spec, SpecLo, SpecHi float64
}

// TruthCheck applies the operating point to every candidate and scores it against the
// truth table, with Wilson intervals (Newcombe 1998).
func TruthCheck(op *report.OperatingPoint, cands []candidate.Row, truth map[string]synth.Event) TruthStats {
	var pred, ref []bool
	for _, c := range cands {
		v, ok := op.Decide(c.Features(), c.Score)
		if !ok {
			continue
		}
		pred = append(pred, v)
		ref = append(ref, truth[c.EventID].IsIED)
	}
	cf := accuracy.Tally(pred, ref, nil)
	ts := TruthStats{N: len(pred), Sens: cf.Sensitivity(), Spec: cf.Specificity()}
	ts.SensLo, ts.SensHi = accuracy.Wilson(cf.TP, cf.TP+cf.FN, 0.95)
	ts.SpecLo, ts.SpecHi = accuracy.Wilson(cf.TN, cf.TN+cf.FP, 0.95)
	return ts
}

// indent writes each line it is given with two spaces in front, so the output of each
// step sits under the step's name.
type indent struct {
	w  io.Writer
	at bool // at the start of a line
}

func (p *indent) Write(b []byte) (int, error) {
	for _, c := range b {
		if p.at {
			if _, err := io.WriteString(p.w, "    "); err != nil {
				return 0, err
			}
		}
		if _, err := p.w.Write([]byte{c}); err != nil {
			return 0, err
		}
		p.at = c == '\n'
	}
	return len(b), nil
}

// demoArchive writes the fictional archive with the generator(s) --generator
// names — with both, the second generator's recordings go under "second/" —
// and returns each recording's truth by its path relative to archDir.
func demoArchive(f *demoFlags, archDir, truthDir string) (map[string][]synth.Event, error) {
	nFirst := f.recordings
	switch f.generator {
	case "second":
		nFirst = 0
	case "both":
		nFirst = (f.recordings + 1) / 2
	}
	truth := map[string][]synth.Event{}
	add := func(path string, evs []synth.Event) {
		rel, _ := filepath.Rel(archDir, path)
		truth[filepath.ToSlash(rel)] = evs
	}
	if nFirst > 0 {
		subjects := synth.Archive(synth.ArchiveConfig{Seed: f.seed, Subjects: nFirst, Recordings: 1,
			Duration: f.minutes * 60, Forward: synth.HeadForward()})
		written, err := synth.WriteArchive(archDir, truthDir, subjects)
		if err != nil {
			return nil, err
		}
		for _, w := range written {
			add(w.Path, w.Truth)
		}
	}
	if n := f.recordings - nFirst; n > 0 {
		a, t := archDir, truthDir
		if nFirst > 0 {
			a, t = filepath.Join(archDir, "second"), filepath.Join(truthDir, "second")
		}
		subjects := textbook.Archive(textbook.ArchiveConfig{Seed: f.seed, Subjects: n, Duration: f.minutes * 60})
		written, err := textbook.WriteArchive(a, t, subjects)
		if err != nil {
			return nil, err
		}
		for _, w := range written {
			add(w.Path, w.Truth)
		}
	}
	return truth, nil
}
