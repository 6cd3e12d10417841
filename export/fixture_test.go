package export

import (
	"context"
	"math"
	"math/rand/v2"
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

// tenTwenty are the 19 scalp electrodes of the 10-20 system in 10-10 names (ACNS
// Guideline 2, Acharya et al. 2016), plus the two mastoids: 21 EEG channels.
var tenTwenty = []string{"Fp1", "Fp2", "F7", "F3", "Fz", "F4", "F8", "T7", "C3", "Cz", "C4", "T8",
	"P7", "P3", "Pz", "P4", "P8", "O1", "O2", "M1", "M2"}

const fixtureRate = 256

// sampleValue is the known signal: channel c at global sample g. Integers within the
// digital range with gain 1 are stored exactly (Kemp et al. 1992: phys = dig·gain +
// offset).
func sampleValue(c int, g int64) float32 { return float32((c+1)*100 + int(g%97)) }

// writeFixtureEDF writes an EDF+C file of `seconds` one-second records with the EEG
// channels chans and an ECG channel, the patient field set to patient. A channel
// "A-B" is the derivation of tenTwenty electrodes A and B, sampleValue(A) −
// sampleValue(B).
func writeFixtureEDF(t testing.TB, path, patient string, seconds int, start time.Time, chans []string) {
	t.Helper()
	if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
		t.Fatal(err)
	}
	f, err := os.Create(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	var sigs []edf.Signal
	for _, n := range append(append([]string{}, chans...), "ECG") {
		label := "EEG " + n + "-REF"
		if n == "ECG" || strings.Contains(n, "-") {
			label = n
		}
		sigs = append(sigs, edf.Signal{Label: label, PhysDim: "uV", PhysMin: -32768, PhysMax: 32767,
			DigMin: -32768, DigMax: 32767, SamplesPerRecord: fixtureRate})
	}
	w, err := edf.NewWriter(f, edf.WriterHeader{Format: edf.EDFPlusC, PatientID: patient,
		RecordingID: "Startdate " + start.Format("02-Jan-2006") + " X X X", Start: start,
		RecordDuration: 1, NumRecords: int64(seconds), Signals: sigs})
	if err != nil {
		t.Fatal(err)
	}
	rec := make([][]float32, len(sigs))
	for i := range rec {
		rec[i] = make([]float32, fixtureRate)
	}
	for r := range seconds {
		for c := range rec {
			for k := range rec[c] {
				g := int64(r*fixtureRate + k)
				if a, b, ok := strings.Cut(sigs[c].Label, "-"); ok && !strings.HasPrefix(a, "EEG ") {
					rec[c][k] = sampleValue(slices.Index(tenTwenty, a), g) - sampleValue(slices.Index(tenTwenty, b), g)
				} else {
					rec[c][k] = sampleValue(c, g)
				}
			}
		}
		if err := w.WriteRecord(rec); err != nil {
			t.Fatal(err)
		}
	}
	if err := w.Close(); err != nil {
		t.Fatal(err)
	}
}

// Identifiers planted in the fixture; none may reach an export.
var (
	patientNames = []string{"MRN4471902 F 03-FEB-1961 Philippa_Quarterbridge", "MRN5582013 M 21-JUL-1975 Bartholomew_Xylander"}
	fileNames    = []string{"Quarterbridge_Philippa_ward7.edf", "Xylander_Bartholomew_icu.edf"}
	identifiers  = []string{"Quarterbridge", "Philippa", "Xylander", "Bartholomew", "MRN4471902", "MRN5582013",
		"ward7", "icu.edf", "03-FEB-1961", "21-JUL-1975", "patients-archive"}
)

type fixture struct {
	opts    Options
	archive string
}

// newFixture indexes two recordings with the archive scanner, makes candidates with
// seeded features, a draw with a control, three raters' answers and their consensus.
func newFixture(t testing.TB, nCand int) *fixture {
	t.Helper()
	return newFixtureOf(t, nCand, tenTwenty)
}

// newFixtureOf is newFixture with recordings of the EEG channels chans
// (see writeFixtureEDF).
func newFixtureOf(t testing.TB, nCand int, chans []string) *fixture {
	t.Helper()
	root := filepath.Join(t.TempDir(), "patients-archive")
	starts := []time.Time{time.Date(2019, 6, 15, 14, 23, 45, 0, time.UTC), time.Date(2020, 11, 2, 8, 5, 0, 0, time.UTC)}
	for i, n := range fileNames {
		writeFixtureEDF(t, filepath.Join(root, "ward", n), patientNames[i], 60, starts[i], chans)
	}
	idx, err := archive.Run(context.Background(), archive.Options{Roots: []string{root},
		Secret: []byte("0123456789abcdef0123456789abcdef"), IndexDir: t.TempDir()})
	if err != nil {
		t.Fatal(err)
	}
	if len(idx.Recordings) != 2 {
		t.Fatalf("indexed %d recordings, want 2: %+v", len(idx.Recordings), idx.Problems)
	}
	rng := rand.New(rand.NewPCG(7, 11))
	o := Options{Recordings: idx.Recordings, ArchiveRoots: []string{root},
		DateShiftDays: map[string]int{}, External: map[string]*bool{}}
	for _, r := range idx.Recordings {
		o.DateShiftDays[r.SubjectKey] = -1000 - rng.IntN(300)
	}
	nan := math.NaN()
	for i := range nCand {
		rec := idx.Recordings[i%2]
		onset := 0.5 + rng.Float64()*59 // some windows reach past the ends
		if i == 0 {
			onset = 1.0
		}
		c := candidate.Row{EventID: candidate.EventID(rec.RecordingID, "builtin", int64(i)), RecordingID: rec.RecordingID,
			SubjectKey: rec.SubjectKey, Source: "builtin", OnsetS: onset, PeakChannel: tenTwenty[i%19],
			Polarity: "negative", Lobe: "temporal", Side: "left", Region: "temporal-left", Channels: []string{"T7", "P7"},
			AmplitudeUV: 50 + 100*rng.Float64(), State: "unknown",
			C1DurationMS: 20 + 60*rng.Float64(), C1Sharpness: rng.NormFloat64(), C1Phases: int32(2 + rng.IntN(2)),
			C2DurationLogRatio: rng.NormFloat64(), C2BackgroundMS: 100 + 50*rng.Float64(),
			C3Asymmetry: rng.Float64(), C3RiseMS: 10 * rng.Float64(), C3FallMS: 20 * rng.Float64(),
			C4SlowWaveRatio: rng.Float64(), C5Disruption: rng.Float64(), C6DipoleGOF: rng.Float64(),
			C6DipoleX: 0.01, C6DipoleY: -0.02, C6DipoleZ: 0.05, C6Orientation: "radial", C6FieldExtent: 5,
			Score: rng.Float64(), Imported: nan}
		if i%5 == 0 {
			c.C6DipoleGOF, c.C6DipoleX, c.C6DipoleY, c.C6DipoleZ, c.C6Orientation = nan, nan, nan, nan, ""
		}
		var met [6]bool
		for k := range met {
			met[k] = rng.Float64() < 0.5
		}
		c.SetMet(met)
		o.Candidates = append(o.Candidates, c)
		o.Draw = append(o.Draw, DrawInfo{EventID: c.EventID, Stratum: "s" + string(rune('a'+i%3)), Kind: "candidate",
			Pi: 0.25, Weight: 4, Phase: 1})
	}
	ctl := DrawInfo{EventID: "ctl-" + idx.Recordings[0].RecordingID + "-3", Stratum: "control", Kind: "control",
		Pi: 0.1, Weight: 10, Phase: 1, RecordingID: idx.Recordings[0].RecordingID, SubjectKey: idx.Recordings[0].SubjectKey, OnsetS: 30}
	o.Draw = append(o.Draw, ctl)
	raters := []string{"r1", "r2", "r3", "r4"}
	for _, d := range o.Draw {
		for ri, r := range raters {
			if rng.Float64() < 0.1 {
				continue // not in this rater's packet
			}
			rt := consensus.Rating{EventID: d.EventID, Rater: r, Packet: "p" + string(rune('1'+ri)), ItemCode: "it-" + d.EventID[3:9],
				Confidence: int32(rng.IntN(6)), Comment: "looks like Quarterbridge's other one"}
			ans := func() *bool {
				if rng.Float64() < 0.05 {
					return nil
				}
				v := rng.Float64() < 0.5
				return &v
			}
			rt.C1, rt.C2, rt.C3, rt.C4, rt.C5, rt.C6, rt.Epileptiform = ans(), ans(), ans(), ans(), ans(), ans(), ans()
			o.Ratings = append(o.Ratings, rt)
		}
	}
	dup := o.Ratings[0] // a hidden duplicate, shown again and answered differently
	dup.Duplicate, dup.C1 = true, ptr(dup.C1 == nil || !*dup.C1)
	o.Ratings = append(o.Ratings, dup)
	o.Consensus = consensus.Build(o.Ratings, 2, consensus.TieUndetermined)
	for i := range o.Consensus {
		if i%4 != 3 {
			o.Consensus[i].DSProbability = rng.Float64()
		}
	}
	op := &OPDecision{Rule: "≥3 of 6", Decision: map[string]bool{}}
	for i, c := range o.Candidates {
		op.Decision[c.EventID] = c.AutoCount >= 3
		if i%3 == 0 {
			v := i%2 == 0
			o.External[c.EventID] = &v
		}
	}
	o.OperatingPoint = op
	return &fixture{opts: o, archive: root}
}
