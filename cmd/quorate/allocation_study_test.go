package main

import (
	"bytes"
	"context"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/quorate-eeg/quorate/cmd/quorate/internal/study"
	"github.com/quorate-eeg/quorate/sampling/candidate"
	"github.com/quorate-eeg/quorate/sampling/draw"
	"github.com/quorate-eeg/quorate/sampling/synth"
)

// TestAllocationStudy counts the generator's true IEDs that each design puts
// before the panel on the demo's archive at its default size and budget (8
// recordings of 10 min, 200 events, study.yaml's subject cap and floor), one
// archive per seed, and, over QUORATE_ALLOCATION_REPS repeated draws of each
// archive, the spread of the Horvitz–Thompson (ratio) estimate of the
// sensitivity of the fixed rule auto_count ≥ 4 against the truth and Kish's
// design effect of the weights of the IEDs drawn, deff = n Σw²/(Σw)² (Kish
// 1965, Survey Sampling, §11.7). It measures, it does not judge: run
//
//	QUORATE_ALLOCATION_STUDY=10 go test ./cmd/quorate -run TestAllocationStudy -v
//
// QUORATE_ALLOCATION_FROM sets the first seed (default 1; allocations are
// designed on seeds 101–110 and reported on 1–25); QUORATE_ALLOCATION_DESIGNS
// lists designs as method@strata separated by ";" (default: equal,
// proportional and accuracy on study.yaml's strata); QUORATE_ALLOCATION_DIR
// keeps each seed's archive and candidates and reuses them.
func TestAllocationStudy(t *testing.T) {
	seeds, _ := strconv.Atoi(os.Getenv("QUORATE_ALLOCATION_STUDY"))
	if seeds < 1 {
		t.Skip("set QUORATE_ALLOCATION_STUDY=<seeds> to run the allocation study")
	}
	from := 1
	if v, err := strconv.Atoi(os.Getenv("QUORATE_ALLOCATION_FROM")); err == nil {
		from = v
	}
	reps, _ := strconv.Atoi(os.Getenv("QUORATE_ALLOCATION_REPS"))
	keep := os.Getenv("QUORATE_ALLOCATION_DIR")
	type design struct {
		name   string
		method draw.Method
		strata string
	}
	var designs []design
	if v := os.Getenv("QUORATE_ALLOCATION_DESIGNS"); v != "" {
		for _, d := range strings.Split(v, ";") {
			m, st, _ := strings.Cut(strings.TrimSpace(d), "@")
			meth, err := draw.ParseMethod(m)
			if err != nil {
				t.Fatal(err)
			}
			designs = append(designs, design{strings.TrimSpace(d), meth, st})
		}
	}
	type tally struct {
		ied, deff, sd float64
		n             int
	}
	var tot []tally
	for seed := uint64(from); seed < uint64(from+seeds); seed++ {
		dir := t.TempDir()
		if keep != "" {
			dir = filepath.Join(keep, "seed"+strconv.FormatUint(seed, 10))
		}
		sd := filepath.Join(dir, "study")
		arch, truthDir := filepath.Join(dir, "archive"), filepath.Join(dir, "truth")
		if _, err := os.Stat(filepath.Join(sd, "candidates")); err != nil {
			os.RemoveAll(dir)
			subjects := synth.Archive(synth.ArchiveConfig{Seed: seed, Subjects: 8, Recordings: 1, Duration: 600, Forward: synth.HeadForward()})
			if _, err := synth.WriteArchive(arch, truthDir, subjects); err != nil {
				t.Fatal(err)
			}
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
		}
		s, err := study.Open(sd)
		if err != nil {
			t.Fatal(err)
		}
		cands, err := candidate.ReadDir(s.Path(study.CandidatesDir))
		if err != nil {
			t.Fatal(err)
		}
		recs, err := readIndex(s)
		if err != nil {
			t.Fatal(err)
		}
		truthByPath := map[string][]synth.Event{}
		for _, r := range recs {
			evs, err := readTruth(filepath.Join(truthDir, strings.TrimSuffix(filepath.Base(r.Path), ".edf")+"_truth.csv"))
			if err != nil {
				t.Fatal(err)
			}
			truthByPath[r.Path] = evs
		}
		truth := demoTruth(recs, cands, truthByPath)
		hit := map[string]bool{}
		ied := 0
		for _, c := range cands {
			hit[c.EventID] = c.AutoCount >= 4
			if truth[c.EventID].IsIED {
				ied++
			}
		}
		if designs == nil {
			for _, m := range []draw.Method{draw.Equal, draw.Proportional, draw.Accuracy} {
				designs = append(designs, design{m.String(), m, s.Config.Draw.Strata})
			}
		}
		if tot == nil {
			tot = make([]tally, len(designs))
		}
		line := fmt.Sprintf("seed %3d: %4d candidates, %3d IEDs;", seed, len(cands), ied)
		frame := draw.FrameOf(cands)
		for k, d := range designs {
			specs, err := draw.ParseStrata(d.strata)
			if err != nil {
				t.Fatal(err)
			}
			one := func(sd uint64) (n int, deff, sens float64) {
				res, err := draw.Draw(frame, draw.Design{Strata: specs, Cap: s.Config.Draw.SubjectCap, Seed: sd,
					Alloc: draw.Allocation{Method: d.method, N: min(200, len(cands)), Min: s.Config.Draw.MinPerStratum}})
				if err != nil {
					t.Fatal(err)
				}
				var sw, sw2, tp float64
				for _, u := range res.Drawn {
					if truth[u.EventID].IsIED {
						n++
						sw += u.Weight
						sw2 += u.Weight * u.Weight
						if hit[u.EventID] {
							tp += u.Weight
						}
					}
				}
				return n, float64(n) * sw2 / (sw * sw), tp / sw
			}
			n, deff, _ := one(seed)
			tot[k].ied += float64(n)
			tot[k].deff += deff
			line += fmt.Sprintf("  %s %d (deff %.2f)", d.name, n, deff)
			if reps > 1 {
				var m, m2 float64
				for r := range reps {
					_, _, x := one(seed*1000 + uint64(r))
					m += x
					m2 += x * x
				}
				m /= float64(reps)
				v := math.Sqrt(max(m2/float64(reps)-m*m, 0))
				tot[k].sd += v
				line += fmt.Sprintf(" sd %.3f", v)
			}
			tot[k].n++
		}
		t.Log(line)
	}
	for k, d := range designs {
		n := float64(tot[k].n)
		t.Logf("%-40s mean IEDs drawn %.1f of 200, deff of IED weights %.2f, sd of HT sensitivity (auto_count≥4) %.3f",
			d.name, tot[k].ied/n, tot[k].deff/n, tot[k].sd/n)
	}
}
