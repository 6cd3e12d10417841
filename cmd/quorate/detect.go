package main

import (
	"context"
	"fmt"
	"sort"
	"strconv"
	"strings"

	"github.com/spf13/cobra"

	"github.com/quorate-eeg/quorate/cmd/quorate/internal/study"
	"github.com/quorate-eeg/quorate/sampling/archive"
	"github.com/quorate-eeg/quorate/sampling/detect"
)

type detectFlags struct {
	shard string
}

func newDetectCmd(g *globals) *cobra.Command {
	f := &detectFlags{}
	cmd := &cobra.Command{
		Use:   "detect",
		Short: "Find candidate sharp transients and measure one feature per IFCN criterion",
		Long: `detect conditions each indexed recording (montage, zero-phase band-pass and notch, in
bounded windows), finds candidate sharp transients liberally (peaks beyond a multiple of a
robust background scale, main phase 20–200 ms, merged across channels), and measures for
each one feature per IFCN criterion (Kane et al. 2017): c1 spiky morphology, c2 duration
unlike the background, c3 asymmetry, c4 after-going slow wave, c5 background disruption,
c6 a dipolar field. Each criterion's yes/no at its cutoff, the count met (auto_count) and a
ranking score are stored too. FEATURES.md beside the code documents every feature.

One Parquet file per recording goes to candidates/shard=I/, so an interrupted run resumes
where it stopped and a cluster job array can run shards independently (--shard I/N); any
Parquet engine reads candidates/ as one dataset.`,
		Example: `  quorate --study /studies/ied-2027 --workers 8 detect
  quorate --study /studies/ied-2027 detect --shard 3/16   # one task of a 16-task job array`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			s, err := g.openStudy()
			if err != nil {
				return err
			}
			i, n, err := parseShard(f.shard)
			if err != nil {
				return usageError{err}
			}
			return runDetect(cmd.Context(), g, s, i, n)
		},
	}
	cmd.Flags().StringVar(&f.shard, "shard", "", "process only shard I of N (I counted from 0), e.g. 3/16")
	return cmd
}

// parseShard reads "I/N"; "" means the whole archive.
func parseShard(s string) (int, int, error) {
	if s == "" {
		return 0, 1, nil
	}
	a, b, ok := strings.Cut(s, "/")
	i, err1 := strconv.Atoi(a)
	n, err2 := strconv.Atoi(b)
	if !ok || err1 != nil || err2 != nil || n < 1 || i < 0 || i >= n {
		return 0, 0, fmt.Errorf("--shard: got %q, want I/N with 0 ≤ I < N, e.g. 3/16", s)
	}
	return i, n, nil
}

func runDetect(ctx context.Context, g *globals, s *study.Study, shard, shards int) error {
	indexPath := s.Path(study.IndexDir, archive.IndexFile)
	recs, err := readIndex(s)
	if err != nil {
		return fmt.Errorf("no archive index yet (run quorate scan first): %w", err)
	}
	c := s.Config
	cut := map[string]float64{}
	for k, v := range c.Criteria {
		if v != 0 {
			cut[k] = v
		}
	}
	notch := c.Signal.NotchHz
	if notch == 0 {
		notch = -1 // study.yaml: 0 means no notch
	}
	res, err := detect.Run(ctx, detect.Options{Recordings: recs, Roots: c.Archive.Roots, OutDir: s.Path(study.CandidatesDir),
		Workers: g.workers, Shard: shard, Shards: shards, Montage: c.Signal.Montage, Bandpass: c.Signal.Bandpass,
		NotchHz: notch, ThresholdMAD: c.Detect.ThresholdMAD, BackgroundS: c.Detect.BackgroundS, MergeMS: c.Detect.MergeWindowMS,
		Cutoffs: cut, Progress: g.progress})
	if err != nil {
		return err
	}
	nWarn := 0
	ids := make([]string, 0, len(res.Warnings))
	for id := range res.Warnings {
		ids = append(ids, id)
	}
	sort.Strings(ids)
	for _, id := range ids {
		for _, w := range res.Warnings[id] {
			g.warn("detect", "recording %s: %s", id, w)
			nWarn++
		}
	}
	if err := s.Record(study.Entry{Version: Version, Command: "detect", Argv: g.argv, Inputs: s.Hash(indexPath),
		Outputs: s.Hash(s.Path(study.CandidatesDir)),
		Notes: map[string]any{"shard": fmt.Sprintf("%d/%d", shard, shards), "processed": res.Processed, "resumed": res.Skipped, "redone": res.Redone,
			"failed": res.Failed, "candidates": res.Events}}); err != nil {
		return err
	}
	fmt.Fprintf(g.stdout, "Detected %d candidates in %d recordings (%d already done, %d detected again with changed settings, %d failed); see %s.\n",
		res.Events, res.Processed, res.Skipped, res.Redone, res.Failed, s.Path(study.CandidatesDir))
	return g.finish(nWarn)
}
