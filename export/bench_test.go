package export

import (
	"context"
	"fmt"
	"math/rand/v2"
	"path/filepath"
	"testing"
	"time"

	"github.com/quorate-eeg/quorate/panel/consensus"
	"github.com/quorate-eeg/quorate/sampling/archive"
	"github.com/quorate-eeg/quorate/sampling/candidate"
)

// bigOptions makes n drawn candidates with every feature, three ratings each and their
// consensus, over 100 recordings, without files (no epochs).
func bigOptions(n int) Options {
	rng := rand.New(rand.NewPCG(1, 2))
	var o Options
	for r := range 100 {
		o.Recordings = append(o.Recordings, archive.Recording{RecordingID: fmt.Sprintf("rec-%016x", r),
			SubjectKey: fmt.Sprintf("sub-%016x", r/3), Format: "EDF+C", StartTime: time.Date(2021, 1, 1+r%28, 10, 0, 0, 0, time.UTC),
			DurationS: 3600, RecordCount: 3600, RecordDurationS: 1, EEGChannels: tenTwenty, SampleRatesHz: []float64{256}})
	}
	o.Candidates = make([]candidate.Row, n)
	o.Draw = make([]DrawInfo, n)
	for i := range n {
		rec := &o.Recordings[i%100]
		c := &o.Candidates[i]
		*c = candidate.Row{EventID: candidate.EventID(rec.RecordingID, "builtin", int64(i)), RecordingID: rec.RecordingID,
			SubjectKey: rec.SubjectKey, Source: "builtin", OnsetS: rng.Float64() * 3600, PeakChannel: tenTwenty[i%19],
			Polarity: "negative", Lobe: "temporal", Side: "left", Region: "temporal-left", Channels: []string{"T7", "P7", "C3"},
			AmplitudeUV: rng.Float64() * 200, State: "awake", C1DurationMS: rng.Float64() * 100, C1Sharpness: rng.NormFloat64(),
			C1Phases: 2, C2DurationLogRatio: rng.NormFloat64(), C2BackgroundMS: 120, C3Asymmetry: rng.Float64(),
			C3RiseMS: 12, C3FallMS: 30, C4SlowWaveRatio: rng.Float64(), C5Disruption: rng.Float64(), C6DipoleGOF: rng.Float64(),
			C6DipoleX: 0.01, C6DipoleY: 0.02, C6DipoleZ: 0.06, C6Orientation: "radial", C6FieldExtent: 6, Score: rng.Float64(),
			Imported: rng.Float64()}
		c.SetMet([6]bool{rng.IntN(2) == 0, rng.IntN(2) == 0, true, false, rng.IntN(2) == 0, true})
		o.Draw[i] = DrawInfo{EventID: c.EventID, Stratum: "s", Kind: "candidate", Pi: 0.01, Weight: 100, Phase: 1}
		for r := range 3 {
			yes := rng.IntN(2) == 0
			o.Ratings = append(o.Ratings, consensus.Rating{EventID: c.EventID, Rater: fmt.Sprint("r", r), Packet: "p1",
				ItemCode: "i", C1: &yes, C2: &yes, C3: &yes, C4: &yes, C5: &yes, C6: &yes, Epileptiform: &yes, Confidence: 3})
		}
	}
	o.Consensus = consensus.Build(o.Ratings, 2, consensus.TieAbsent)
	return o
}

func benchExport(b *testing.B, format string) {
	o := bigOptions(100_000)
	o.Format, o.Replace = format, true
	o.To = filepath.Join(b.TempDir(), "out")
	b.ResetTimer()
	for range b.N {
		if _, err := Run(context.Background(), o); err != nil {
			b.Fatal(err)
		}
	}
}

// Target: 100,000 events with all features in under 5 s per export.
func BenchmarkExportParquet100k(b *testing.B) { benchExport(b, "parquet") }
func BenchmarkExportCSV100k(b *testing.B)     { benchExport(b, "csv") }
func BenchmarkExportBIDS100k(b *testing.B)    { benchExport(b, "bids") }

// BenchmarkEpochs2000 exports 2,000 events × 21 channels × 10 s at 256 Hz (target:
// under 10 s), read from two synthetic 30-minute EDF+ files written in setup.
func BenchmarkEpochs2000(b *testing.B) {
	chans := append(append([]string{}, tenTwenty[:19]...), "T9", "T10") // 21 scalp electrodes
	root := b.TempDir()
	var o Options
	o.ArchiveRoots = []string{root}
	rng := rand.New(rand.NewPCG(3, 4))
	for r := range 2 {
		name := fmt.Sprintf("r%d.edf", r)
		writeFixtureEDF(b, filepath.Join(root, name), "X", 1800, time.Date(2021, 1, 1, 0, 0, 0, 0, time.UTC), chans)
		rec := archive.Recording{RecordingID: fmt.Sprintf("rec-%d", r), SubjectKey: "sub-1", Path: name, Format: "EDF+C",
			StartTime: time.Date(2021, 1, 1, 0, 0, 0, 0, time.UTC), DurationS: 1800, EEGChannels: chans, SampleRatesHz: []float64{256}}
		o.Recordings = append(o.Recordings, rec)
		for i := range 1000 {
			c := candidate.Row{EventID: fmt.Sprintf("ev-%d-%d", r, i), RecordingID: rec.RecordingID, SubjectKey: rec.SubjectKey,
				OnsetS: rng.Float64() * 1800}
			o.Candidates = append(o.Candidates, c)
			o.Draw = append(o.Draw, DrawInfo{EventID: c.EventID, Kind: "candidate", Stratum: "s", Pi: 1, Weight: 1, Phase: 1})
			o.Consensus = append(o.Consensus, consensus.Event{EventID: c.EventID, Verdict: "epileptiform"})
		}
	}
	o.Format, o.Epochs, o.Replace = "parquet", true, true
	o.To = filepath.Join(b.TempDir(), "out")
	b.ResetTimer()
	for range b.N {
		res, err := Run(context.Background(), o)
		if err != nil {
			b.Fatal(err)
		}
		if res.Epochs != 2000*21 {
			b.Fatalf("%d epoch rows, want %d", res.Epochs, 2000*21)
		}
	}
}
