package main

import (
	"context"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/quorate-eeg/quorate/cmd/quorate/internal/study"
	"github.com/quorate-eeg/quorate/panel/merge"
	"github.com/quorate-eeg/quorate/sampling/archive"
	"github.com/quorate-eeg/quorate/sampling/candidate"
	"github.com/quorate-eeg/quorate/sampling/draw"
	"github.com/quorate-eeg/quorate/tuning"
	"github.com/quorate-eeg/quorate/tuning/accuracy"
)

// TestCoverageDesign re-tunes demo folders kept by the coverage study
// (QUORATE_COVERAGE_DIR) and compares, per seed and in total, the headline
// with the other selection-aware estimators computed from the same
// replicates (tuning.Headline.Variants: Harrell's optimism correction, the
// leave-one-out bootstrap, .632, .632+, leave-one-subject-out) against the
// chosen rule's truth on every candidate. It also measures how far the
// panel majority, the reference the tuner is scored against, differs from
// the generator's truth: on the drawn candidates, the rule's design-weighted
// sensitivity against the panel minus against the generator, and the panel
// majority's own sensitivity and specificity against the generator. The
// estimators can only be unbiased for what the panel labels.
//
//	QUORATE_DESIGN_DIR=/tmp/cov QUORATE_DESIGN_SEEDS=101-110 QUORATE_DESIGN_METHOD=joint-search \
//	  go test ./cmd/quorate -run TestCoverageDesign -v
//
// "mix" is the mean of "harrell" and "632", printed only to show where the
// truth lies between them.
func TestCoverageDesign(t *testing.T) {
	dir := os.Getenv("QUORATE_DESIGN_DIR")
	if dir == "" {
		t.Skip("set QUORATE_DESIGN_DIR to a folder of kept coverage-study demos (seedN/)")
	}
	var seeds []int
	for _, f := range strings.Split(os.Getenv("QUORATE_DESIGN_SEEDS"), ",") {
		if a, b, ok := strings.Cut(f, "-"); ok {
			x, _ := strconv.Atoi(a)
			y, _ := strconv.Atoi(b)
			for i := x; i <= y; i++ {
				seeds = append(seeds, i)
			}
		} else if x, err := strconv.Atoi(f); err == nil {
			seeds = append(seeds, x)
		}
	}
	method := os.Getenv("QUORATE_DESIGN_METHOD")
	type acc struct {
		n, held, nw [2]int
		bias        [2]float64
		width       [2]float64
	}
	stats := map[string]*acc{}
	var meanSens, panelBias [2]float64
	var ns int
	for _, seed := range seeds {
		out := filepath.Join(dir, "seed"+strconv.Itoa(seed))
		s, err := study.Open(filepath.Join(out, "study"))
		if err != nil {
			t.Logf("seed %d: %v", seed, err)
			continue
		}
		evs, err := merge.ReadConsensus(s.Path(study.ConsensusDir, merge.ConsensusFile))
		if err != nil {
			t.Fatal(err)
		}
		rows, _ := draw.ReadRows(s.Path(study.DrawDir, draw.DrawFile))
		cands, _ := candidate.ReadDir(s.Path(study.CandidatesDir))
		recs, _ := archive.ReadIndex(s.Path(study.IndexDir, archive.IndexFile))
		events := tuning.Join(rows, evs, cands, tuning.ReferencePanel, nil)
		hours := 0.0
		for _, r := range recs {
			hours += r.DurationS / 3600
		}
		pol, _ := accuracy.ParsePolicy("min-specificity=0.95")
		res, err := tuning.Run(context.Background(), tuning.Options{Events: events, RecordingHours: hours, Policy: pol,
			Bootstrap: -1, Method: method, Seed: 1, ReferenceName: "panel", HeadlineVariants: true})
		if err != nil {
			t.Logf("seed %d: %v", seed, err)
			continue
		}
		_, _, truth := demoOutcome(t, out)
		fp := res.Final
		decide := func(f [6]float64) bool {
			n := 0
			for _, c := range fp.Cutoffs {
				v := f[c.Criterion-1]
				if (c.Direction == 1 && v >= c.Value) || (c.Direction == -1 && v <= c.Value) {
					n++
				}
			}
			return n >= fp.K
		}
		var pred, ref []bool
		for _, c := range cands {
			pred = append(pred, decide(c.Features()))
			ref = append(ref, truth[c.EventID].IsIED)
		}
		cf := accuracy.Tally(pred, ref, nil)
		tr := [2]float64{cf.Sensitivity(), cf.Specificity()}
		// On the drawn candidates: the panel majority against the generator,
		// and the rule against either.
		var hp, hg, panelRef, gen []bool
		var w []float64
		for _, e := range events {
			if e.Kind == "control" || e.Reference < 0 {
				continue
			}
			hp = append(hp, decide(e.Features))
			hg = append(hg, e.Reference == 1)
			gen = append(gen, truth[e.EventID].IsIED)
			panelRef = append(panelRef, e.Reference == 1)
			w = append(w, e.Weight)
		}
		vsPanel := accuracy.Tally(hp, panelRef, w)
		vsGen := accuracy.Tally(hp, gen, w)
		panelVsGen := accuracy.Tally(hg, gen, w)
		line := fmt.Sprintf("seed %d k=%d true %.3f/%.3f | in-sample vs panel %.3f/%.3f vs gen %.3f/%.3f | panel-vs-gen %.3f/%.3f |",
			seed, fp.K, tr[0], tr[1], vsPanel.Sensitivity(), vsPanel.Specificity(), vsGen.Sensitivity(), vsGen.Specificity(),
			panelVsGen.Sensitivity(), panelVsGen.Specificity())
		ns++
		for m := range 2 {
			meanSens[m] += tr[m]
			panelBias[m] += [2]float64{vsPanel.Sensitivity() - vsGen.Sensitivity(), vsPanel.Specificity() - vsGen.Specificity()}[m]
		}
		if fp.Headline == nil {
			t.Log(line)
			continue
		}
		vars := fp.Headline.Variants()
		{
			h, c := vars["harrell"], vars["632"]
			var mx [4]tuning.Estimate
			for m := range 2 {
				mx[m] = tuning.Estimate{Value: (h[m].Value + c[m].Value) / 2, Lo: (h[m].Lo + c[m].Lo) / 2, Hi: (h[m].Hi + c[m].Hi) / 2}
			}
			vars["mix"] = mx
		}
		vars["reported"] = [4]tuning.Estimate{fp.Headline.Sens, fp.Headline.Spec}
		for _, name := range []string{"reported", "harrell", "632", "632+", "loo", "loso", "mix"} {
			v := vars[name]
			a := stats[name]
			if a == nil {
				a = &acc{}
				stats[name] = a
			}
			line += fmt.Sprintf(" %s %.2f(%.2f–%.2f)/%.3f(%.3f–%.3f)", name, v[0].Value, v[0].Lo, v[0].Hi, v[1].Value, v[1].Lo, v[1].Hi)
			for m := range 2 {
				if math.IsNaN(v[m].Value) {
					continue
				}
				a.n[m]++
				a.bias[m] += v[m].Value - tr[m]
				if v[m].Lo <= tr[m] && tr[m] <= v[m].Hi {
					a.held[m]++
				}
				if w := v[m].Hi - v[m].Lo; !math.IsNaN(w) {
					a.width[m] += w
					a.nw[m]++
				}
			}
		}
		t.Log(line)
	}
	t.Logf("method %q, %d seeds: mean true sens %.3f spec %.3f; mean (in-sample vs panel − vs generator) sens %+.3f spec %+.3f",
		method, ns, meanSens[0]/float64(ns), meanSens[1]/float64(ns), panelBias[0]/float64(ns), panelBias[1]/float64(ns))
	for _, name := range []string{"reported", "harrell", "632", "632+", "loo", "loso", "mix"} {
		a := stats[name]
		if a == nil {
			continue
		}
		t.Logf("%-9s sens held %d/%d bias %+.3f mean width %.2f | spec held %d/%d bias %+.3f mean width %.3f", name,
			a.held[0], a.n[0], a.bias[0]/float64(a.n[0]), a.width[0]/float64(max(a.nw[0], 1)), a.held[1], a.n[1], a.bias[1]/float64(a.n[1]), a.width[1]/float64(max(a.nw[1], 1)))
	}
}
