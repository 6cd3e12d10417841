package main

import (
	"bytes"
	"context"
	"fmt"
	"os"
	"path/filepath"
	"strconv"
	"testing"

	"github.com/quorate-eeg/quorate/cmd/quorate/internal/study"
	"github.com/quorate-eeg/quorate/sampling/archive"
	"github.com/quorate-eeg/quorate/sampling/candidate"
	"github.com/quorate-eeg/quorate/sampling/draw"
	"github.com/quorate-eeg/quorate/sampling/synth"
)

// TestAllocationStudy counts the generator's true IEDs that each allocation
// puts before the panel on the demo's archive at its default size and
// budget (8 recordings of 10 min, 200 events, study.yaml's strata and
// subject cap), one archive per seed. It measures, it does not judge: run
//
//	QUORATE_ALLOCATION_STUDY=10 go test ./cmd/quorate -run TestAllocationStudy -v
func TestAllocationStudy(t *testing.T) {
	seeds, _ := strconv.Atoi(os.Getenv("QUORATE_ALLOCATION_STUDY"))
	if seeds < 1 {
		t.Skip("set QUORATE_ALLOCATION_STUDY=<seeds> to run the allocation study")
	}
	methods := []draw.Method{draw.Equal, draw.Proportional, draw.Accuracy}
	total := make([]int, len(methods))
	for seed := uint64(1); seed <= uint64(seeds); seed++ {
		dir := t.TempDir()
		arch, truthDir := filepath.Join(dir, "archive"), filepath.Join(dir, "truth")
		subjects := synth.Archive(synth.ArchiveConfig{Seed: seed, Subjects: 8, Recordings: 1, Duration: 600, Forward: synth.HeadForward()})
		written, err := synth.WriteArchive(arch, truthDir, subjects)
		if err != nil {
			t.Fatal(err)
		}
		truthByPath := map[string][]synth.Event{}
		for _, w := range written {
			rel, _ := filepath.Rel(arch, w.Path)
			truthByPath[filepath.ToSlash(rel)] = w.Truth
		}
		sd := filepath.Join(dir, "study")
		if err := study.InitWith(sd, []string{arch}, seed, fmt.Sprintf("st-alloc-%d", seed), bytes.Repeat([]byte{7}, 32)); err != nil {
			t.Fatal(err)
		}
		s, err := study.Open(sd)
		if err != nil {
			t.Fatal(err)
		}
		g := &globals{argv: []string{"quorate"}, stdout: &bytes.Buffer{}, quiet: true, study: sd}
		if err := runScan(context.Background(), g, s, nil); err != nil {
			t.Fatal(err)
		}
		if err := runDetect(context.Background(), g, s, 0, 1); err != nil {
			t.Fatal(err)
		}
		cands, err := candidate.ReadDir(s.Path(study.CandidatesDir))
		if err != nil {
			t.Fatal(err)
		}
		recs, err := archive.ReadIndex(s.Path(study.IndexDir, archive.IndexFile))
		if err != nil {
			t.Fatal(err)
		}
		truth := demoTruth(recs, cands, truthByPath)
		ied := 0
		for _, e := range truth {
			if e.IsIED {
				ied++
			}
		}
		specs, _ := draw.ParseStrata(s.Config.Draw.Strata)
		line := fmt.Sprintf("seed %2d: %4d candidates, %3d IEDs;", seed, len(cands), ied)
		for k, m := range methods {
			res, err := draw.Draw(draw.FrameOf(cands), draw.Design{Strata: specs, Cap: s.Config.Draw.SubjectCap, Seed: seed,
				Alloc: draw.Allocation{Method: m, N: min(200, len(cands)), Min: s.Config.Draw.MinPerStratum}})
			if err != nil {
				t.Fatal(err)
			}
			n := 0
			for _, u := range res.Drawn {
				if truth[u.EventID].IsIED {
					n++
				}
			}
			total[k] += n
			line += fmt.Sprintf("  %s %d", m, n)
		}
		t.Log(line)
	}
	line := "mean IEDs drawn of 200:"
	for k, m := range methods {
		line += fmt.Sprintf("  %s %.1f", m, float64(total[k])/float64(seeds))
	}
	t.Log(line)
}
