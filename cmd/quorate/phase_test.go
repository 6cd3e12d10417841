package main

import (
	"bytes"
	"errors"
	"io/fs"
	"os"
	"os/exec"
	"path/filepath"
	"reflect"
	"sort"
	"strings"
	"testing"

	"github.com/quorate-eeg/quorate/cmd/quorate/internal/study"
	"github.com/quorate-eeg/quorate/panel/merge"
	"github.com/quorate-eeg/quorate/panel/packet"
	"github.com/quorate-eeg/quorate/panel/simulate"
	"github.com/quorate-eeg/quorate/sampling/candidate"
	"github.com/quorate-eeg/quorate/sampling/draw"
	"github.com/quorate-eeg/quorate/sampling/synth"
	"github.com/quorate-eeg/quorate/tuning"
)

// The two-phase study of the README: after phase 1 is rated and merged, draw --top-up
// --adaptive adds a phase (a two-phase stratified design, Särndal, Swensson & Wretman
// 1992, ch. 9), packets builds packets for the new events only, their returns merge
// beside the phase-1 answers, and tune runs on the union with the union's design
// weights. Packets once refused here, and --replace orphaned every phase-1 answer.
func TestTwoPhaseStudy(t *testing.T) {
	st := demoStudy(t)
	demo := filepath.Dir(st)
	s, err := study.Open(st)
	if err != nil {
		t.Fatal(err)
	}
	pk := func(name string) string { return s.Path(study.PacketsDir, name) }
	key1, err := packet.ReadKey(pk(packet.KeyFile))
	if err != nil {
		t.Fatal(err)
	}
	m1, err := packet.ReadManifest(pk(packet.ManifestFile))
	if err != nil {
		t.Fatal(err)
	}
	ratings1, err := merge.ReadRatings(s.Path(study.ConsensusDir, merge.RatingsFile))
	if err != nil {
		t.Fatal(err)
	}
	rows1, err := draw.ReadRows(s.Path(study.DrawDir, draw.DrawFile))
	if err != nil {
		t.Fatal(err)
	}

	if _, err := run(t, "--study", st, "draw", "--top-up", "30", "--adaptive"); err != nil && !isWarnings(err) {
		t.Fatal("draw --top-up:", err)
	}
	rows, err := draw.ReadRows(s.Path(study.DrawDir, draw.DrawFile))
	if err != nil {
		t.Fatal(err)
	}
	phase2 := map[string]bool{}
	for _, r := range rows {
		if r.Phase == 2 {
			phase2[r.EventID] = true
		}
	}
	if len(phase2) != 30 || len(rows) != len(rows1)+30 {
		t.Fatalf("top-up: %d rows of which %d of phase 2, want %d + 30", len(rows), len(phase2), len(rows1))
	}

	// Before the new packets, the later stages are of an earlier draw; the refusal names
	// the command that adds packets without touching the old ones.
	_, err = run(t, "--study", st, "tune")
	var se *study.StaleError
	if !errors.As(err, &se) || se.Stage != "packets" || !strings.Contains(err.Error(), "quorate packets (after draw --top-up") {
		t.Fatalf("tune after a top-up: %v, want a refusal naming quorate packets", err)
	}
	// Another panel is refused and changes nothing.
	if _, err := run(t, "--study", st, "packets", "--raters", "2"); err == nil || !strings.Contains(err.Error(), "same panel") {
		t.Fatalf("packets --raters 2 for phase 2: %v, want a refusal naming the panel", err)
	}
	// A copy of the study at this point, to build the same phase-2 packets again.
	twin := filepath.Join(t.TempDir(), "study")
	if b, err := exec.Command("cp", "-a", st, twin).CombinedOutput(); err != nil {
		t.Fatalf("copy: %v %s", err, b)
	}
	// No --raters: the packets' own panel.
	out, err := run(t, "--study", st, "packets")
	if err != nil && !isWarnings(err) {
		t.Fatal("packets for phase 2:", err)
	}
	if !strings.Contains(out, "Added 3 packets for the 30 events of draw phase 2") {
		t.Errorf("packets printed:\n%s\nwant what was added", out)
	}
	if _, err := run(t, "--study", st, "packets"); err == nil || !strings.Contains(err.Error(), "show every event of the draw") {
		t.Errorf("packets again: %v, want a refusal saying every event is in a packet", err)
	}

	// Same inputs and seed, same bytes (the raters named, in another order).
	if _, err := run(t, "--study", twin, "packets", "--raters", "fictional-rater-c-hurried,fictional-rater-a,fictional-rater-b"); err != nil && !isWarnings(err) {
		t.Fatal("packets for phase 2 in the copy:", err)
	}
	var n int
	filepath.WalkDir(s.Path(study.PacketsDir), func(p string, d fs.DirEntry, err error) error {
		if err != nil || d.IsDir() {
			return err
		}
		rel, _ := filepath.Rel(st, p)
		a, _ := os.ReadFile(p)
		b, err := os.ReadFile(filepath.Join(twin, rel))
		if err != nil || !bytes.Equal(a, b) {
			t.Errorf("%s differs between two equal builds (%v)", rel, err)
		}
		n++
		return nil
	})
	if n != 2+4*3 {
		t.Errorf("%d files under packets/, want key, manifest and two files per packet (12)", n)
	}

	key, err := packet.ReadKey(pk(packet.KeyFile))
	if err != nil {
		t.Fatal(err)
	}
	m, err := packet.ReadManifest(pk(packet.ManifestFile))
	if err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(key[:len(key1)], key1) || !reflect.DeepEqual(m.Packets[:len(m1.Packets)], m1.Packets) {
		t.Fatal("the phase-1 key rows or manifest entries changed")
	}
	newM := &packet.Manifest{Format: m.Format, Version: m.Version, Study: m.Study, Packets: m.Packets[len(m1.Packets):]}
	codes := map[string]bool{}
	for i, k := range key {
		if codes[k.Item] {
			t.Errorf("code %s used twice", k.Item)
		}
		codes[k.Item] = true
		if i >= len(key1) && !phase2[k.EventID] {
			t.Errorf("phase-2 packet %s shows %s, not a phase-2 event", k.Packet, k.EventID)
		}
	}
	for _, p := range newM.Packets {
		if p.Phase != 2 {
			t.Errorf("new packet %s: phase %d, want 2", p.Packet, p.Phase)
		}
		if _, err := os.Stat(pk(filepath.Join(p.Rater, packet.PhaseDir(2), packet.PageFile))); err != nil {
			t.Error(err)
		}
	}

	// The simulated panel rates the phase-2 packets only.
	recs, err := readIndex(s)
	if err != nil {
		t.Fatal(err)
	}
	cands, err := candidate.ReadDir(s.Path(study.CandidatesDir))
	if err != nil {
		t.Fatal(err)
	}
	truthByPath := map[string][]synth.Event{}
	for _, r := range recs {
		evs, err := readTruth(filepath.Join(demo, "truth", strings.TrimSuffix(filepath.Base(r.Path), ".edf")+"_truth.csv"))
		if err != nil {
			t.Fatal(err)
		}
		truthByPath[r.Path] = evs
	}
	truth := demoTruth(recs, cands, truthByPath)
	files, err := simulate.Returns(newM, key, simulate.Panel(3), func(id string) (simulate.Truth, bool) {
		e, ok := truth[id]
		return simulate.Truth{Meets: e.Meets, IED: e.IsIED}, ok
	}, 6)
	if err != nil {
		t.Fatal(err)
	}
	inbox := t.TempDir()
	var paths []string
	for name, b := range files {
		p := filepath.Join(inbox, name)
		if err := os.WriteFile(p, b, 0o644); err != nil {
			t.Fatal(err)
		}
		paths = append(paths, p)
	}
	sort.Strings(paths)
	if _, err := run(t, append([]string{"--study", st, "merge"}, paths...)...); err != nil {
		t.Fatal("merge of the phase-2 returns:", err)
	}

	// Phase-1 answers still count beside the phase-2 ones.
	ratings, err := merge.ReadRatings(s.Path(study.ConsensusDir, merge.RatingsFile))
	if err != nil {
		t.Fatal(err)
	}
	if want := len(ratings1) + len(key) - len(key1); len(ratings) != want {
		t.Errorf("%d ratings after the phase-2 merge, want %d of phase 1 + %d of phase 2", len(ratings), len(ratings1), len(key)-len(key1))
	}
	ledger, err := merge.ReadLedger(s.Path(study.ReturnsDir, merge.LedgerFile))
	if err != nil {
		t.Fatal(err)
	}
	if len(ledger) != len(m.Packets) {
		t.Errorf("ledger: %d returns, want one per packet (%d)", len(ledger), len(m.Packets))
	}
	cons, err := merge.ReadConsensus(s.Path(study.ConsensusDir, merge.ConsensusFile))
	if err != nil {
		t.Fatal(err)
	}
	inCons := map[string]bool{}
	for _, e := range cons {
		inCons[e.EventID] = true
	}
	for _, r := range rows {
		if !inCons[r.EventID] {
			t.Errorf("event %s (phase %d) is not in the consensus", r.EventID, r.Phase)
		}
	}
	st2, err := studyStatus(s)
	if err != nil {
		t.Fatal(err)
	}
	if len(st2.Packets) != 6 || st2.Owed != 0 {
		t.Errorf("status: %d packets, %d items owed, want 6 and 0", len(st2.Packets), st2.Owed)
	}
	for i, p := range st2.Packets {
		if want := 1 + i/3; p.Phase != want || p.State != "returned" {
			t.Errorf("status of %s: phase %d, %s; want phase %d, returned", p.Packet, p.Phase, p.State, want)
		}
	}

	// tune runs on the union, each event weighted by the union's design weight.
	if _, err := run(t, "--study", st, "tune"); err != nil && !isWarnings(err) {
		t.Fatal("tune after the phase-2 merge:", err)
	}
	evs := tuning.Join(rows, cons, cands, tuning.ReferencePanel, nil)
	if len(evs) != len(rows) {
		t.Errorf("tune joins %d events, want the %d of both phases", len(evs), len(rows))
	}
	w := map[string]float64{}
	for _, r := range rows {
		w[r.EventID] = r.Weight
	}
	for _, e := range evs {
		if e.Weight != w[e.EventID] {
			t.Errorf("event %s weighted %g, want its union weight %g", e.EventID, e.Weight, w[e.EventID])
		}
	}
	if _, err := run(t, "--study", st, "export", "--to", filepath.Join(t.TempDir(), "x")); err != nil && !isWarnings(err) {
		t.Errorf("export after the phase-2 merge: %v", err)
	}

	// A replaced draw makes every packet stale again, and packets says why.
	if _, err := run(t, "--study", st, "draw", "--replace", "--n", "40", "--seed", "77"); err != nil && !isWarnings(err) {
		t.Fatal(err)
	}
	if _, err := run(t, "--study", st, "tune"); !errors.As(err, &se) || se.Stage != "packets" {
		t.Errorf("tune after draw --replace: %v, want a refusal naming packets", err)
	}
	if _, err := run(t, "--study", st, "packets"); err == nil || !strings.Contains(err.Error(), "--replace") {
		t.Errorf("packets after draw --replace: %v, want a refusal naming --replace", err)
	}
}
