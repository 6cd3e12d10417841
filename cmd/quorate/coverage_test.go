package main

import (
	"bytes"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"testing"

	"github.com/quorate-eeg/quorate/cmd/quorate/internal/study"
	"github.com/quorate-eeg/quorate/export/report"
	"github.com/quorate-eeg/quorate/panel/consensus"
	"github.com/quorate-eeg/quorate/panel/merge"
	"github.com/quorate-eeg/quorate/sampling/draw"
	"github.com/quorate-eeg/quorate/tuning"
)

// coverageRow is one demo seed of the coverage study: the chosen rule's true figures on
// every candidate and the intervals the study reported for it.
type coverageRow struct {
	seed               int
	rule               string
	k                  int
	sens, spec         float64 // truth on all candidates
	head, in, cv, boot [2]Interval
	drawn, panelIED    int // events drawn; of them, judged IED by the panel's majority
}

// The coverage study: the demo's whole pipeline over many seeds, the chosen rule scored
// against the generator's truth on every candidate (TruthCheck), and each interval the
// study reports checked for holding that truth. The nominal level is 95 %; with 25 seeds
// a sound interval holds the truth in 22 or more (binomial 2.5th percentile of
// Bin(25, 0.95), common practice).
//
//	QUORATE_COVERAGE=25 go test ./cmd/quorate -run TestCoverageStudy -v -timeout 60m
//
// QUORATE_COVERAGE_FROM sets the first seed (default 1); QUORATE_COVERAGE_METHOD the
// fitting method (criteria-and-score, criterion-majority, criterion-verdict or
// joint-search); QUORATE_COVERAGE_GENERATOR the archive's generator (as demo
// --generator: first, second or both); QUORATE_COVERAGE_RATERS the simulated panel's
// size (as demo --raters; with three, one of them hurried); QUORATE_COVERAGE_ALLOCATION and
// QUORATE_COVERAGE_STRATA the draw's allocation and strata (as demo --allocation and
// --strata; default study.yaml's), so that the study is run once per allocation, each
// in its own QUORATE_COVERAGE_DIR; QUORATE_COVERAGE_DIR keeps the demo folders and, when
// a seed's folder exists, re-runs only tune on it (QUORATE_COVERAGE_READ=1: reads its
// operating point as it is).
func TestCoverageStudy(t *testing.T) {
	n, _ := strconv.Atoi(os.Getenv("QUORATE_COVERAGE"))
	if n <= 0 {
		t.Skip("set QUORATE_COVERAGE=25 to run the coverage study (about 25 s per seed)")
	}
	from := 1
	if v, err := strconv.Atoi(os.Getenv("QUORATE_COVERAGE_FROM")); err == nil {
		from = v
	}
	dir := os.Getenv("QUORATE_COVERAGE_DIR")
	if dir == "" {
		dir = t.TempDir()
	}
	var rows []coverageRow
	for seed := from; seed < from+n; seed++ {
		rows = append(rows, coverageSeed(t, filepath.Join(dir, "seed"+strconv.Itoa(seed)), seed, nil, os.Getenv("QUORATE_COVERAGE_METHOD")))
	}
	t.Log("\n" + coverageTable(rows))
}

// TestCoverageSmall is the coverage study's reduced version: three seeds on small
// archives. The headline interval must hold the true sensitivity and specificity in at
// least two of the three (a 95 % interval misses twice in three with probability
// 3·0.05²·0.95 + 0.05³ ≈ 0.007).
func TestCoverageSmall(t *testing.T) {
	if testing.Short() {
		t.Skip("coverage check skipped in -short mode")
	}
	var rows []coverageRow
	for _, seed := range []int{31, 32, 33} {
		rows = append(rows, coverageSeed(t, filepath.Join(t.TempDir(), "demo"), seed,
			[]string{"--recordings", "6", "--minutes", "4", "--n", "120"}, ""))
	}
	t.Log("\n" + coverageTable(rows))
	var hs, hp int
	for _, r := range rows {
		hs += b2i(holds(r.head[0], r.sens))
		hp += b2i(holds(r.head[1], r.spec))
	}
	if hs < 2 || hp < 2 {
		t.Errorf("headline interval held the true sensitivity in %d / 3 seeds and the true specificity in %d / 3; want at least 2 each", hs, hp)
	}
}

func coverageSeed(t *testing.T, out string, seed int, sizes []string, method string) coverageRow {
	t.Helper()
	var buf bytes.Buffer
	g := &globals{argv: []string{"quorate"}, stdout: &buf}
	root := newRoot(g)
	if _, err := os.Stat(filepath.Join(out, "study")); err == nil && os.Getenv("QUORATE_COVERAGE_READ") == "1" {
		root.SetArgs([]string{"--version"})
	} else if err == nil {
		args := []string{"--quiet", "--study", filepath.Join(out, "study"), "tune"}
		if method != "" {
			args = append(args, "--method", method)
		}
		root.SetArgs(args)
	} else {
		if method != "" && method != tuning.MethodDefault {
			t.Fatalf("QUORATE_COVERAGE_METHOD=%s needs an existing QUORATE_COVERAGE_DIR: the demo tunes with the default", method)
		}
		args := append([]string{"--quiet", "--workers", "2", "demo", "--out", out, "--seed", strconv.Itoa(seed)}, sizes...)
		if r := os.Getenv("QUORATE_COVERAGE_RATERS"); r != "" {
			args = append(args, "--raters", r)
		}
		if g := os.Getenv("QUORATE_COVERAGE_GENERATOR"); g != "" {
			args = append(args, "--generator", g)
		}
		if a := os.Getenv("QUORATE_COVERAGE_ALLOCATION"); a != "" {
			args = append(args, "--allocation", a)
		}
		if v := os.Getenv("QUORATE_COVERAGE_STRATA"); v != "" {
			args = append(args, "--strata", v)
		}
		root.SetArgs(args)
	}
	if err := root.Execute(); err != nil && !isWarnings(err) {
		t.Fatalf("seed %d: %v\n%s", seed, err, buf.String())
	}
	op, cands, truth := demoOutcome(t, out)
	ts := TruthCheck(op, cands, truth)
	r := coverageRow{seed: seed, rule: op.Rule, k: op.K, sens: ts.Sens, spec: ts.Spec}
	r.drawn, r.panelIED = panelIEDs(t, out)
	if h := op.Headline; h != nil {
		r.head = [2]Interval{h.Sensitivity, h.Specificity}
	}
	d := op.InSample.DesignWeighted
	r.in = [2]Interval{d.Sensitivity, d.Specificity}
	if c := op.CrossValidated; c != nil {
		r.cv = [2]Interval{c.DesignWeighted.Sensitivity, c.DesignWeighted.Specificity}
	}
	if b := op.Bootstrap; b != nil {
		r.boot = [2]Interval{b.Sensitivity, b.Specificity}
	}
	return r
}

// panelIEDs counts the events of a demo's draw and, of them, those the panel's
// majority judged epileptiform (consensus verdict epileptiform).
func panelIEDs(t *testing.T, out string) (drawn, ied int) {
	t.Helper()
	s, err := study.Open(filepath.Join(out, "study"))
	if err != nil {
		t.Fatal(err)
	}
	rows, err := draw.ReadRows(s.Path(study.DrawDir, draw.DrawFile))
	if err != nil {
		t.Fatal(err)
	}
	for _, r := range rows {
		if r.Kind == draw.KindCandidate {
			drawn++
		}
	}
	cons, err := merge.ReadConsensus(s.Path(study.ConsensusDir, merge.ConsensusFile))
	if err != nil {
		t.Fatal(err)
	}
	for _, e := range cons {
		if e.Verdict == consensus.VerdictEpileptiform {
			ied++
		}
	}
	return drawn, ied
}

func holds(v Interval, truth float64) bool {
	return float64(v.Lo) <= truth && truth <= float64(v.Hi)
}

func b2i(b bool) int {
	if b {
		return 1
	}
	return 0
}

// coverageTable prints the rows and, per interval, how often it held the truth, the mean
// bias of its value against the truth and its median width.
func coverageTable(rows []coverageRow) string {
	var b strings.Builder
	mark := func(v Interval, truth float64) string {
		if math.IsNaN(float64(v.Lo)) {
			return fmt.Sprintf("%.2f (none)", float64(v.Value))
		}
		c := "✗"
		if holds(v, truth) {
			c = "✓"
		}
		return fmt.Sprintf("%.2f (%.2f–%.2f) %s", float64(v.Value), float64(v.Lo), float64(v.Hi), c)
	}
	fmt.Fprintf(&b, "| seed | panel IEDs / drawn | k | true sens | headline sens | true spec | headline spec | in-sample sens | cv sens | bootstrap sens |\n|---|---|---|---|---|---|---|---|---|---|\n")
	for _, r := range rows {
		fmt.Fprintf(&b, "| %d | %d / %d | %d | %.2f | %s | %.3f | %s | %s | %s | %s |\n", r.seed, r.panelIED, r.drawn, r.k, r.sens, mark(r.head[0], r.sens), r.spec, mark(r.head[1], r.spec),
			mark(r.in[0], r.sens), mark(r.cv[0], r.sens), mark(r.boot[0], r.sens))
	}
	fmt.Fprintf(&b, "\n| interval | figure | holds truth | mean bias | median width |\n|---|---|---|---|---|\n")
	for _, c := range []struct {
		name string
		get  func(coverageRow) [2]Interval
	}{{"headline", func(r coverageRow) [2]Interval { return r.head }}, {"in sample", func(r coverageRow) [2]Interval { return r.in }},
		{"cross-validated", func(r coverageRow) [2]Interval { return r.cv }}, {"bootstrap of the final rule", func(r coverageRow) [2]Interval { return r.boot }}} {
		for f, name := range []string{"sensitivity", "specificity"} {
			var held, n int
			var bias float64
			var widths []float64
			for _, r := range rows {
				v, truth := c.get(r)[f], [2]float64{r.sens, r.spec}[f]
				if math.IsNaN(float64(v.Value)) {
					continue
				}
				n++
				bias += float64(v.Value) - truth
				held += b2i(holds(v, truth))
				if w := float64(v.Hi - v.Lo); !math.IsNaN(w) {
					widths = append(widths, w)
				}
			}
			med := math.NaN()
			if len(widths) > 0 {
				slices.Sort(widths)
				med = widths[len(widths)/2]
				if len(widths)%2 == 0 {
					med = (widths[len(widths)/2-1] + widths[len(widths)/2]) / 2
				}
			}
			fmt.Fprintf(&b, "| %s | %s | %d / %d | %+.3f | %.2f |\n", c.name, name, held, n, bias/float64(max(n, 1)), med)
		}
	}
	var ms, pi float64
	for _, r := range rows {
		ms += r.sens
		pi += float64(r.panelIED)
	}
	fmt.Fprintf(&b, "\nmean true sensitivity of the chosen rule: %.3f over %d seeds\n", ms/float64(max(len(rows), 1)), len(rows))
	fmt.Fprintf(&b, "mean panel IEDs drawn (consensus epileptiform): %.1f over %d seeds\n", pi/float64(max(len(rows), 1)), len(rows))
	for _, r := range rows {
		fmt.Fprintf(&b, "seed %d: %s\n", r.seed, r.rule)
	}
	return b.String()
}

var _ = report.PointFile
