package export

import (
	"math"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"
	"time"

	"github.com/quorate-eeg/quorate/panel/consensus"
	"github.com/quorate-eeg/quorate/sampling/archive"
	"github.com/quorate-eeg/quorate/sampling/candidate"
	"github.com/quorate-eeg/quorate/sampling/edf"
)

// epochFixture keeps three candidates at known onsets: 0.5 s (the window starts before
// the recording), 59.7 s (it ends after the 60 s recording) and 30 s (inside).
func epochFixture(t *testing.T) *fixture {
	f := newFixture(t, 3)
	for i, on := range []float64{0.5, 59.7, 30} {
		f.opts.Candidates[i].OnsetS = on
	}
	f.opts.Draw = f.opts.Draw[:3]
	f.opts.EpochWindowS = 2
	return f
}

// TestEpochsReferential checks the samples against the signal written into the EDF
// file, sample by sample, and the NaN padding against the closed-form counts: a window
// of n = 2 s × 256 Hz = 512 samples starting at sample g0 = round((onset − 1)·256) is
// padded max(0, −g0) before and max(0, g0 + n − 60·256) after.
func TestEpochsReferential(t *testing.T) {
	f := epochFixture(t)
	f.opts.EpochMontage = "referential"
	dir, res := runExport(t, f.opts, "parquet", true)
	rows := readParquet[EpochRow](t, filepath.Join(dir, EpochsFile))
	// 19 scalp electrodes: the mastoids are reference sites, not scalp electrodes, and
	// the montage leaves them out (10-20 system, ACNS Guideline 2).
	if len(rows) != 3*19 || res.Epochs != len(rows) || res.Padded != 2 {
		t.Fatalf("%d rows (res %d), %d padded; want 57 and 2", len(rows), res.Epochs, res.Padded)
	}
	onset := map[string]float64{}
	for _, c := range f.opts.Candidates[:3] {
		onset[c.EventID] = c.OnsetS
	}
	for _, r := range rows {
		on := onset[r.EventID]
		g0 := int64(math.Round((on - 1) * 256))
		wantBefore, wantAfter := max(0, -g0), max(0, g0+512-60*256)
		if int64(r.PadBefore) != wantBefore || int64(r.PadAfter) != wantAfter || r.Padded != (wantBefore+wantAfter > 0) {
			t.Fatalf("%s: padding %d/%d, want %d/%d", r.EventID, r.PadBefore, r.PadAfter, wantBefore, wantAfter)
		}
		if r.WindowOnsetS != float64(g0)/256 || math.Abs(r.EventOffsetS-(on-float64(g0)/256)) > 1e-12 || r.SampleRateHz != 256 {
			t.Errorf("%s: window onset %v, offset %v", r.EventID, r.WindowOnsetS, r.EventOffsetS)
		}
		c := slices.Index(tenTwenty, strings.TrimSuffix(r.Channel, "-Ref"))
		if c < 0 || len(r.Samples) != 512 {
			t.Fatalf("channel %q, %d samples", r.Channel, len(r.Samples))
		}
		for i, v := range r.Samples {
			g := g0 + int64(i)
			if g < 0 || g >= 60*256 {
				if !math.IsNaN(float64(v)) {
					t.Fatalf("%s %s sample %d = %v, want NaN padding", r.EventID, r.Channel, i, v)
				}
				continue
			}
			if want := sampleValue(c, g); v != want {
				t.Fatalf("%s %s sample %d = %v, want %v", r.EventID, r.Channel, i, v, want)
			}
		}
	}
}

// TestEpochsCommonAverage checks the default montage against its definition: each
// electrode minus the mean of all electrodes (Offner 1950), so the derivations sum to
// zero at every sample.
func TestEpochsCommonAverage(t *testing.T) {
	f := epochFixture(t)
	dir, _ := runExport(t, f.opts, "csv", true)
	rows := readParquet[EpochRow](t, filepath.Join(dir, EpochsFile))
	byEvent := map[string][]EpochRow{}
	for _, r := range rows {
		if r.Montage != "common-average" || !strings.HasSuffix(r.Channel, "-Avg") {
			t.Fatalf("montage %s channel %s", r.Montage, r.Channel)
		}
		byEvent[r.EventID] = append(byEvent[r.EventID], r)
	}
	for id, rs := range byEvent {
		g0 := int64(math.Round(rs[0].WindowOnsetS * 256))
		for i := range rs[0].Samples {
			g := g0 + int64(i)
			if g < 0 || g >= 60*256 {
				continue
			}
			var mean float64
			for _, r := range rs {
				mean += float64(sampleValue(slices.Index(tenTwenty, strings.TrimSuffix(r.Channel, "-Avg")), g))
			}
			mean /= float64(len(rs))
			var sum float64
			for _, r := range rs {
				c := slices.Index(tenTwenty, strings.TrimSuffix(r.Channel, "-Avg"))
				want := float64(sampleValue(c, g)) - mean
				if math.Abs(float64(r.Samples[i])-want) > 1e-3 {
					t.Fatalf("%s %s sample %d = %v, want %v", id, r.Channel, i, r.Samples[i], want)
				}
				sum += float64(r.Samples[i])
			}
			if math.Abs(sum) > 1e-2 {
				t.Fatalf("%s sample %d: derivations sum to %v, want 0", id, i, sum)
			}
		}
	}
}

// TestEpochsBipolarRecording checks epochs cut from recordings stored only as
// a longitudinal bipolar chain over the 19 scalp electrodes (the double banana
// linked by C3-Cz and Cz-C4): the electrodes recovered from the derivations
// (edf.Header.Recovered) are the potentials less their mean, so the common
// average montage gives each electrode minus the mean of all (Offner 1950), as
// from the referential recording.
func TestEpochsBipolarRecording(t *testing.T) {
	var chain []string
	for _, p := range [][2]string{
		{"Fp1", "F7"}, {"F7", "T7"}, {"T7", "P7"}, {"P7", "O1"}, {"Fp1", "F3"}, {"F3", "C3"}, {"C3", "P3"}, {"P3", "O1"},
		{"Fp2", "F8"}, {"F8", "T8"}, {"T8", "P8"}, {"P8", "O2"}, {"Fp2", "F4"}, {"F4", "C4"}, {"C4", "P4"}, {"P4", "O2"},
		{"Fz", "Cz"}, {"Cz", "Pz"}, {"C3", "Cz"}, {"Cz", "C4"},
	} {
		chain = append(chain, p[0]+"-"+p[1])
	}
	f := newFixtureOf(t, 3, chain)
	f.opts.Draw = f.opts.Draw[:3]
	f.opts.EpochWindowS = 2
	dir, res := runExport(t, f.opts, "parquet", true)
	rows := readParquet[EpochRow](t, filepath.Join(dir, EpochsFile))
	if len(rows) != 3*19 || res.Epochs != len(rows) {
		t.Fatalf("%d rows (res %d), want 57", len(rows), res.Epochs)
	}
	var mean float64
	for _, e := range tenTwenty[:19] {
		mean += float64((slices.Index(tenTwenty, e) + 1) * 100)
	}
	mean /= 19
	for _, r := range rows {
		c := slices.Index(tenTwenty, strings.TrimSuffix(r.Channel, "-Avg"))
		if c < 0 || c >= 19 {
			t.Fatalf("channel %q", r.Channel)
		}
		want := float64((c+1)*100) - mean // the g % 97 part is common to every electrode and cancels
		for i, v := range r.Samples {
			if !math.IsNaN(float64(v)) && math.Abs(float64(v)-want) > 0.01 {
				t.Fatalf("%s %s sample %d = %v, want %v", r.EventID, r.Channel, i, v, want)
			}
		}
	}
}

// TestEpochsDiscontinuous: in an EDF+D file a window stays inside the segment holding
// its event (Kemp & Olivan 2003, section 2.2.4: records of a segment follow without a
// gap). Segments are records 0–9 at 0–10 s and records 10–19 at 20–30 s; an event at
// 21 s with a 4 s window [19, 23) s is padded for the 1 s before 20 s (256 samples) and
// then holds records 10, 11 and 12 from their first sample.
func TestEpochsDiscontinuous(t *testing.T) {
	root := t.TempDir()
	path := filepath.Join(root, "d.edf")
	fh, err := os.Create(path)
	if err != nil {
		t.Fatal(err)
	}
	var sigs []edf.Signal
	for _, n := range tenTwenty[:19] {
		sigs = append(sigs, edf.Signal{Label: "EEG " + n, PhysDim: "uV", PhysMin: -32768, PhysMax: 32767,
			DigMin: -32768, DigMax: 32767, SamplesPerRecord: 256})
	}
	start := time.Date(2021, 5, 1, 12, 0, 0, 0, time.UTC)
	w, err := edf.NewWriter(fh, edf.WriterHeader{Format: edf.EDFPlusD, Start: start, RecordDuration: 1, NumRecords: 20, Signals: sigs})
	if err != nil {
		t.Fatal(err)
	}
	rec := make([][]float32, len(sigs))
	for i := range rec {
		rec[i] = make([]float32, 256)
	}
	for r := range 20 {
		for c := range rec {
			for k := range rec[c] {
				rec[c][k] = sampleValue(c, int64(r*256+k))
			}
		}
		onset := float64(r)
		if r >= 10 {
			onset += 10
		}
		if err := w.WriteRecordAt(onset, rec); err != nil {
			t.Fatal(err)
		}
	}
	if err := w.Close(); err != nil {
		t.Fatal(err)
	}
	fh.Close()
	o := Options{ArchiveRoots: []string{root}, EpochMontage: "referential", EpochWindowS: 4,
		Recordings: []archive.Recording{{RecordingID: "rec-d", SubjectKey: "sub-d", Path: "d.edf", Format: "EDF+D", StartTime: start}},
		Candidates: []candidate.Row{{EventID: "ev-d", RecordingID: "rec-d", SubjectKey: "sub-d", OnsetS: 21}},
		Draw:       []DrawInfo{{EventID: "ev-d", Kind: "candidate", Stratum: "s", Pi: 1, Weight: 1, Phase: 1}},
		Consensus:  []consensus.Event{{EventID: "ev-d", Verdict: "epileptiform"}}}
	dir, _ := runExport(t, o, "parquet", true)
	rows := readParquet[EpochRow](t, filepath.Join(dir, EpochsFile))
	if len(rows) != 19 {
		t.Fatalf("%d rows", len(rows))
	}
	for _, r := range rows {
		c := slices.Index(tenTwenty, strings.TrimSuffix(r.Channel, "-Ref"))
		if r.PadBefore != 256 || r.PadAfter != 0 || r.WindowOnsetS != 19 || r.EventOffsetS != 2 {
			t.Fatalf("%s: pad %d/%d onset %v offset %v", r.Channel, r.PadBefore, r.PadAfter, r.WindowOnsetS, r.EventOffsetS)
		}
		for i, v := range r.Samples {
			if i < 256 {
				if !math.IsNaN(float64(v)) {
					t.Fatalf("sample %d = %v, want NaN", i, v)
				}
			} else if want := sampleValue(c, int64(10*256+i-256)); v != want {
				t.Fatalf("%s sample %d = %v, want %v", r.Channel, i, v, want)
			}
		}
	}
}
