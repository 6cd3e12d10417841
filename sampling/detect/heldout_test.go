package detect

import (
	"context"
	"fmt"
	"maps"
	"math"
	"os"
	"path/filepath"
	"slices"
	"sort"
	"testing"
	"time"

	"github.com/quorate-eeg/quorate/sampling/archive"
	"github.com/quorate-eeg/quorate/sampling/candidate"
	"github.com/quorate-eeg/quorate/sampling/edf"
	"github.com/quorate-eeg/quorate/sampling/synth"
	"github.com/quorate-eeg/quorate/sampling/textbook"
)

// heldOutSeeds are the second generator's recordings the held-out figures
// are read on; nothing in this package was designed or tuned on them.
var heldOutSeeds = []uint64{101, 102, 103, 104, 105, 106, 107, 108}

// TestHeldOutGenerator runs the finder at default settings on recordings
// of the second, independent generator (sampling/textbook: resonator
// background, four-shell Berg & Scherg head, waveforms from the IFCN
// glossary and handbooks) and logs the figures FEATURES.md reports beside
// the first generator's. It asserts only what the detector promises
// whatever the data — that every file is processed and every IED row gets
// a state — plus floors well below the figures measured, so that a
// regression shows; the figures themselves are for reading, because the
// features must not be redesigned on this generator. Each recording is
// also generated without its events (the same background, checkTwin), so
// that extra rows the events caused can be told from background
// candidates that lie near an event by chance; and every event is measured
// at its own peak as well (featuresAtEvents).
func TestHeldOutGenerator(t *testing.T) {
	if os.Getenv("QUORATE_HELDOUT") == "" {
		t.Skip("set QUORATE_HELDOUT=1 (about 20 s: generates and scans an hour of EEG)")
	}
	dir := t.TempDir()
	twinDir := t.TempDir()
	var recs []archive.Recording
	var truth [][]synth.Event
	for _, seed := range heldOutSeeds {
		id := fmt.Sprintf("tb-%d", seed)
		// the twin: the same seed without events, the same background
		// sample for sample (the background is drawn before the events)
		var g [2]*synth.Recording
		for k, c := range []struct {
			dir        string
			ieds, look float64
		}{{dir, 6, 10}, {twinDir, 0, 0}} {
			var err error
			if g[k], err = textbook.Generate(textbook.Config{Seed: seed, Duration: 240, IEDRate: c.ieds, LookalikeRate: c.look}); err != nil {
				t.Fatal(err)
			}
			if err := textbook.WriteEDF(filepath.Join(c.dir, id+".edf"), "X X X X", "Startdate X X X X", time.Date(2024, 1, 1, 0, 0, 0, 0, time.UTC), g[k]); err != nil {
				t.Fatal(err)
			}
		}
		checkTwin(t, seed, g[0], g[1])
		truth = append(truth, g[0].Truth)
		recs = append(recs, archive.Recording{RecordingID: id, Path: id + ".edf"})
	}
	f := measureArchive(t, dir, recs, truth, 4*float64(len(heldOutSeeds)), twinDir)
	featuresAtEvents(t, dir, recs, truth)
	// Floors far below the measured figures (FEATURES.md, held-out), so the
	// test fails on a regression, not on the generator's honest difficulty.
	if f.recall < 0.8 {
		t.Errorf("held-out recall %.3f below 0.8", f.recall)
	}
	if f.scoreAUC < 0.6 {
		t.Errorf("held-out score AUC %.3f below 0.6", f.scoreAUC)
	}
	if f.caused > 0.08 {
		t.Errorf("held-out extra rows caused by the events %.3f of events, above 0.08", f.caused)
	}
}

// TestFirstGeneratorFigures measures the same figures on the first
// generator's acceptance seeds, for FEATURES.md's side-by-side table. Set
// QUORATE_FIRST_FIGURES=1 to run it (an hour of EEG).
func TestFirstGeneratorFigures(t *testing.T) {
	if os.Getenv("QUORATE_FIRST_FIGURES") == "" {
		t.Skip("set QUORATE_FIRST_FIGURES=1")
	}
	dir := t.TempDir()
	recs, truth, _ := firstGeneratorArchive(t, dir)
	twinDir := t.TempDir()
	for _, seed := range testSeeds {
		// the same seed without events is the same background sample for
		// sample (TestBackgroundOracle)
		g, err := synth.Generate(synth.Config{Seed: seed, Duration: 600, Forward: headForward})
		if err != nil {
			t.Fatal(err)
		}
		in := inputOf(g)
		writeEDF(t, twinDir, fmt.Sprintf("rec-%d.edf", seed), in.Labels, in.Src.(memSource), int(g.Rate), nil, stageAnnotations(g)...)
	}
	measureArchive(t, dir, recs, truth, 10*float64(len(testSeeds)), twinDir)
	featuresAtEvents(t, dir, recs, truth)
}

// firstGeneratorArchive writes the first generator's acceptance recordings
// (testSeeds, 10 min each) to dir as EDF+ with their stage annotations.
func firstGeneratorArchive(t *testing.T, dir string) ([]archive.Recording, [][]synth.Event, [][]synth.StateSpan) {
	var recs []archive.Recording
	var truth [][]synth.Event
	var states [][]synth.StateSpan
	for _, seed := range testSeeds {
		g := generated(t, seed, 10)
		in := inputOf(g)
		id := fmt.Sprintf("rec-%d", seed)
		writeEDF(t, dir, id+".edf", in.Labels, in.Src.(memSource), int(g.Rate), nil, stageAnnotations(g)...)
		recs = append(recs, archive.Recording{RecordingID: id, Path: id + ".edf"})
		truth = append(truth, g.Truth)
		states = append(states, g.States)
	}
	return recs, truth, states
}

// figures are what measureArchive reports.
type figures struct {
	recall, scoreAUC float64
	caused           float64 // extra rows the events caused, as a share of events
}

// measureArchive detects at default settings and logs: recall of IEDs (a
// row within 20 ms of the peak); extra rows within 500 ms of a generated
// event that match no event within 20 ms, as a share of events; each
// criterion's feature AUC, events built to meet it against events built
// to fail it (Unclear labels left out; Hanley & McNeil 1982); the score's
// AUC, IED rows against every other row; and, for auto_count ≥ k, k = 3…6,
// sensitivity (IED rows at or above k) and specificity (other rows below
// k). The published panel figure for ≥ 5 of 6 is specificity 0.957 at
// sensitivity 0.815 (Kural et al. 2020).
//
// twinDir holds the same recordings without their events (the same
// background sample for sample). A row of the twin is a candidate the
// background gives whatever events are added; an extra row within 20 ms of
// one is counted apart, as a background candidate that lies near an event
// by chance, from the extra rows the events themselves caused, which are
// what "one discharge, one candidate" is about. With a generated event
// every few seconds (here 12–16 a minute), ±500 ms around the events covers
// a fifth to a third of the recording, and as large a share of the
// background's own candidates falls there.
func measureArchive(t *testing.T, dir string, recs []archive.Recording, truth [][]synth.Event, minutes float64, twinDir string) figures {
	t.Helper()
	out := detectArchive(t, dir, recs)
	twinOut := detectArchive(t, twinDir, recs)
	var feats, iedFeats [6][]float64
	var meets, iedMeets [6][]bool
	var scores []float64
	var isIED []bool
	var counts []int32
	nIED, found, nEv, extra, extraIED, cands := 0, 0, 0, 0, 0, 0
	caused, causedIED := 0, 0      // extra rows the twin lacks
	perKind := map[string][4]int{} // matched, total, extra rows nearest it, of them caused
	kindFeat := map[string]*[6][]float64{}
	kindCount := map[string][]float64{}
	byOrient := map[string][2]int{} // IEDs found, total, by source orientation
	for k, r := range recs {
		rows, err := candidate.Read(OutputPath(out, 0, r.RecordingID))
		if err != nil {
			t.Fatal(err)
		}
		cands += len(rows)
		twin, err := candidate.Read(OutputPath(twinOut, 0, r.RecordingID))
		if err != nil {
			t.Fatal(err)
		}
		ev := truth[k]
		m := match(rows, ev, 0.020)
		owner := make([]int, len(rows)) // truth index a row matches, or −1
		for i := range owner {
			owner[i] = -1
		}
		for i, j := range m {
			if j >= 0 {
				owner[j] = i
			}
		}
		for i, e := range ev {
			nEv++
			if kindFeat[e.Kind] == nil {
				kindFeat[e.Kind] = &[6][]float64{}
			}
			pk := perKind[e.Kind]
			pk[1]++
			if e.IsIED {
				nIED++
				o := byOrient[e.Orientation]
				o[1]++
				if m[i] >= 0 {
					o[0]++
				}
				byOrient[e.Orientation] = o
			}
			if m[i] < 0 {
				perKind[e.Kind] = pk
				continue
			}
			pk[0]++
			perKind[e.Kind] = pk
			if e.IsIED {
				found++
			}
			f := rows[m[i]].Features()
			for j := range 6 {
				kindFeat[e.Kind][j] = append(kindFeat[e.Kind][j], f[j])
			}
			kindCount[e.Kind] = append(kindCount[e.Kind], float64(rows[m[i]].AutoCount))
			for j := range 6 {
				if !math.IsNaN(f[j]) && !e.Unclear[j] {
					feats[j] = append(feats[j], f[j])
					meets[j] = append(meets[j], e.Meets[j])
					if e.IsIED {
						iedFeats[j] = append(iedFeats[j], f[j])
						iedMeets[j] = append(iedMeets[j], e.Meets[j])
					}
				}
			}
		}
		for i, row := range rows {
			ied := owner[i] >= 0 && ev[owner[i]].IsIED
			scores = append(scores, row.Score)
			isIED = append(isIED, ied)
			counts = append(counts, row.AutoCount)
			if owner[i] >= 0 {
				continue
			}
			if j, ok := nearestEvent(ev, row.OnsetS, 0.5); ok {
				extra++
				pk := perKind[ev[j].Kind]
				pk[2]++
				background := hasRowNear(twin, row.OnsetS, 0.020)
				if !background {
					caused++
					pk[3]++
				}
				perKind[ev[j].Kind] = pk
				if ev[j].IsIED {
					extraIED++
					if !background {
						causedIED++
					}
				}
			}
		}
	}
	f := figures{recall: float64(found) / float64(nIED), scoreAUC: auc(scores, isIED), caused: float64(caused) / float64(nEv)}
	t.Logf("%d recordings, %.0f min; %d events (%d IEDs); %.1f candidates per minute", len(recs), minutes, nEv, nIED, float64(cands)/minutes)
	t.Logf("recall (peak within 20 ms) %d/%d = %.3f; radial %d/%d, tangential %d/%d, oblique %d/%d", found, nIED, f.recall,
		byOrient["radial"][0], byOrient["radial"][1], byOrient["tangential"][0], byOrient["tangential"][1], byOrient["oblique"][0], byOrient["oblique"][1])
	t.Logf("extra candidates within 500 ms of an event, matching none: %d = %.1f %% of %d events (%d beside IEDs)", extra, 100*float64(extra)/float64(nEv), nEv, extraIED)
	t.Logf("  of them caused by the events (no row within 20 ms without them): %d = %.1f %% of events (%d beside IEDs); background candidates near an event: %d",
		caused, 100*float64(caused)/float64(nEv), causedIED, extra-caused)
	for j := range 6 {
		t.Logf("c%d %s AUC %.3f (n = %d, %d built to meet); among IEDs alone %.3f (n = %d, %d built to meet)", j+1, candidate.FeatureNames[j],
			auc(feats[j], meets[j]), len(feats[j]), countTrue(meets[j]), auc(iedFeats[j], iedMeets[j]), len(iedFeats[j]), countTrue(iedMeets[j]))
	}
	t.Logf("score AUC, IED rows vs every other row: %.3f (%d IED rows of %d)", f.scoreAUC, countTrue(isIED), len(isIED))
	for k := int32(3); k <= 6; k++ {
		tp, fn, tn, fp := 0, 0, 0, 0
		for i, c := range counts {
			switch {
			case isIED[i] && c >= k:
				tp++
			case isIED[i]:
				fn++
			case c >= k:
				fp++
			default:
				tn++
			}
		}
		t.Logf("auto_count ≥ %d: sensitivity %.3f, specificity %.3f", k, float64(tp)/float64(tp+fn), float64(tn)/float64(tn+fp))
	}
	kinds := make([]string, 0, len(perKind))
	for k := range perKind {
		kinds = append(kinds, k)
	}
	sort.Strings(kinds)
	for _, k := range kinds {
		med := func(x []float64) float64 {
			y := slices.DeleteFunc(slices.Clone(x), math.IsNaN)
			if len(y) == 0 {
				return math.NaN()
			}
			slices.Sort(y)
			return y[len(y)/2]
		}
		kf := kindFeat[k]
		t.Logf("  %-20s found %3d/%3d, extra rows beside it %3d (caused %3d); medians c1–c6 %.2f %.2f %.2f %.2f %.2f %.2f, auto_count %.0f", k, perKind[k][0], perKind[k][1], perKind[k][2], perKind[k][3],
			med(kf[0]), med(kf[1]), med(kf[2]), med(kf[3]), med(kf[4]), med(kf[5]), med(kindCount[k]))
	}
	return f
}

// checkTwin asserts what the held-out test's split of extra rows rests
// on: without events, the second generator's recording is the same
// background sample for sample up to the first event.
func checkTwin(t *testing.T, seed uint64, with, without *synth.Recording) {
	t.Helper()
	first := len(with.Data[0])
	for _, e := range with.Truth {
		first = min(first, int(e.Start*with.Rate))
	}
	if first < int(with.Rate) {
		t.Fatalf("seed %d: first event at sample %d, too early to compare", seed, first)
	}
	for ch := range with.Data {
		if !slices.Equal(with.Data[ch][:first], without.Data[ch][:first]) {
			t.Fatalf("seed %d, channel %d: the recording without events differs before the first event", seed, ch)
		}
	}
}

// featuresAtEvents measures every generated event at its own peak, as an
// imported event is measured (MeasureAt, the peak searched within ±100 ms
// of the labelled one), and logs each criterion's AUC, events built to meet
// it against events built to fail it (Unclear labels left out). Unlike
// measureArchive's AUCs, these do not depend on which events the finder
// finds or where it anchors them: on the second generator no found event is
// built to fail c1 (blinks and eye movements are not found), so c1 can be
// read only here.
func featuresAtEvents(t *testing.T, dir string, recs []archive.Recording, truth [][]synth.Event) {
	t.Helper()
	var feats [6][]float64
	var meets [6][]bool
	kindC1 := map[string][]float64{} // c1 and main-phase duration per kind built to fail c1
	measured, total := 0, 0
	for k, r := range recs {
		rd, err := edf.Open(filepath.Join(dir, r.Path))
		if err != nil {
			t.Fatal(err)
		}
		onsets := make([]float64, len(truth[k]))
		for i, e := range truth[k] {
			onsets[i] = e.Onset
		}
		rows, _, err := MeasureAt(rd, onsets, Options{Recordings: []archive.Recording{r}})
		rd.Close()
		if err != nil {
			t.Fatal(err)
		}
		// rows come in onset order, one per onset that could be measured
		j := 0
		for _, e := range truth[k] {
			total++
			for j < len(rows) && rows[j].OnsetS < e.Onset-searchS-1e-9 {
				j++
			}
			if j == len(rows) || rows[j].OnsetS > e.Onset+searchS+1e-9 {
				continue
			}
			measured++
			f := rows[j].Features()
			if !e.Meets[0] && !e.Unclear[0] {
				kindC1[e.Kind] = append(kindC1[e.Kind], f[0], rows[j].C1DurationMS)
			}
			j++
			for c := range 6 {
				if !math.IsNaN(f[c]) && !e.Unclear[c] {
					feats[c] = append(feats[c], f[c])
					meets[c] = append(meets[c], e.Meets[c])
				}
			}
		}
	}
	t.Logf("at the generated events' own peaks (MeasureAt, %d of %d events measured):", measured, total)
	for c := range 6 {
		t.Logf("  c%d %s AUC %.3f (n = %d, %d built to meet)", c+1, candidate.FeatureNames[c], auc(feats[c], meets[c]), len(feats[c]), countTrue(meets[c]))
	}
	for _, k := range slices.Sorted(maps.Keys(kindC1)) {
		v := kindC1[k]
		var c1, dur []float64
		for i := 0; i < len(v); i += 2 {
			c1, dur = append(c1, v[i]), append(dur, v[i+1])
		}
		slices.Sort(c1)
		slices.Sort(dur)
		t.Logf("  built to fail c1: %-14s n = %3d, median c1 %.2f, median main phase %.0f ms", k, len(c1), c1[len(c1)/2], dur[len(dur)/2])
	}
}

// detectArchive runs the finder at default settings over recs in dir and
// returns the output folder.
func detectArchive(t *testing.T, dir string, recs []archive.Recording) string {
	t.Helper()
	out := t.TempDir()
	res, err := Run(context.Background(), Options{Recordings: recs, Roots: []string{dir}, OutDir: out, Workers: 2})
	if err != nil {
		t.Fatal(err)
	}
	if res.Processed != len(recs) || res.Failed != 0 {
		t.Fatalf("%s: processed %d failed %d: %v", dir, res.Processed, res.Failed, res.Warnings)
	}
	return out
}

// hasRowNear reports whether a row (onset order) lies within tol s of t.
func hasRowNear(rows []candidate.Row, t, tol float64) bool {
	i := sort.Search(len(rows), func(i int) bool { return rows[i].OnsetS >= t-tol })
	return i < len(rows) && rows[i].OnsetS <= t+tol
}

// nearestEvent is the index of the truth event whose peak is nearest t, within tol s.
func nearestEvent(evs []synth.Event, t, tol float64) (int, bool) {
	best, bestD := -1, tol
	for i, e := range evs {
		if d := math.Abs(e.Onset - t); d <= bestD {
			best, bestD = i, d
		}
	}
	return best, best >= 0
}

func countTrue(b []bool) int {
	n := 0
	for _, v := range b {
		if v {
			n++
		}
	}
	return n
}
