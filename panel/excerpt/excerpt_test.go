package excerpt

import (
	"context"
	"errors"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"
	"time"

	"github.com/quorate-eeg/quorate/internal/progress"
	"github.com/quorate-eeg/quorate/sampling/archive"
	"github.com/quorate-eeg/quorate/sampling/draw"
	"github.com/quorate-eeg/quorate/sampling/edf"
	"github.com/quorate-eeg/quorate/sampling/headmodel"
	"github.com/quorate-eeg/quorate/sampling/headmodel/spline"
	"github.com/quorate-eeg/quorate/sampling/synth"
)

func fixture(t *testing.T) (string, []archive.Recording, []synth.Written) {
	arch := t.TempDir()
	subs := synth.Archive(synth.ArchiveConfig{Seed: 3, Subjects: 2, Recordings: 1, Duration: 30, Forward: synth.HeadForward()})
	ws, err := synth.WriteArchive(arch, t.TempDir(), subs)
	if err != nil {
		t.Fatal(err)
	}
	res, err := archive.Run(context.Background(), archive.Options{Roots: []string{arch}, Secret: make([]byte, 32), IndexDir: t.TempDir(), Workers: 1})
	if err != nil {
		t.Fatal(err)
	}
	return arch, res.Recordings, ws
}

func TestCutWindowsAndMaps(t *testing.T) {
	arch, recs, _ := fixture(t)
	rows := []draw.Row{
		{EventID: "ev-a", RecordingID: recs[0].RecordingID, SubjectKey: recs[0].SubjectKey, OnsetS: 12.5, Kind: "candidate"},
		{EventID: "ev-b", RecordingID: recs[1].RecordingID, SubjectKey: recs[1].SubjectKey, OnsetS: 2, Kind: "control"}, // near the start: padded
	}
	items, warns, err := Cut(context.Background(), Options{Rows: rows, Recordings: recs, Roots: []string{arch}, Bandpass: [2]float64{0.5, 70}, NotchHz: 50})
	if err != nil {
		t.Fatal(err)
	}
	if len(warns) != 0 || len(items) != 2 {
		t.Fatalf("%d items, warnings %v", len(items), warns)
	}
	it := items[0]
	// 256 Hz kept; 10 s rated and 3 s of context either side, the event in the middle.
	if it.Rate != 256 || len(it.Samples) != 19 || len(it.Samples[0]) != 16*256 || it.EventAt != 8 || it.RatedFrom != 3 || it.RatedTo != 13 || len(it.Electrodes) != 19 {
		t.Fatalf("item: rate %v, %d traces of %d samples, event at %v, rated %v–%v", it.Rate, len(it.Samples), len(it.Samples[0]), it.EventAt, it.RatedFrom, it.RatedTo)
	}
	if !strings.Contains(it.Conditioning, "256 Hz") {
		t.Errorf("conditioning %q does not state the rate", it.Conditioning)
	}
	if it.EventID != "ev-a" || it.Source["recording"] != recs[0].RecordingID {
		t.Errorf("key fields: %q %v", it.EventID, it.Source)
	}
	// Before the recording's start the window is padded with a flat line (zeros), not
	// shifted.
	if v := items[1].Samples[0][0]; v != 0 {
		t.Errorf("padding before the start: %v", v)
	}
	m := it.Map
	if m.Size != 40 || len(m.Values) != 1600 || !math.IsNaN(float64(m.Values[0])) {
		t.Fatalf("map size %d, %d values, corner %v (want NaN outside the head)", m.Size, len(m.Values), m.Values[0])
	}
	// Each electrode marker sits where the spline grid draws that electrode's direction
	// (azimuthal equidistant projection; Perrin et al. 1989 maps are drawn this way).
	for _, e := range m.Electrodes {
		p, _ := headmodel.Position(e.Name)
		col := int(math.Floor((e.X + 1) / 2 * float64(m.Size)))
		row := int(math.Floor((1 - e.Y) / 2 * float64(m.Size)))
		d, ok := spline.PixelDirection(row, col, m.Size, spline.DefaultEdge)
		if !ok || d.Angle(p) > 5*math.Pi/180 {
			t.Errorf("%s drawn at pixel (%d,%d), %.1f° from its position", e.Name, row, col, d.Angle(p)*180/math.Pi)
		}
	}
}

// Above MaxRate the traces are decimated by a whole factor after a low-pass, and the
// item says so.
func TestCutDecimatesAboveMaxRate(t *testing.T) {
	arch, recs, _ := fixture(t)
	rows := []draw.Row{{EventID: "ev-a", RecordingID: recs[0].RecordingID, OnsetS: 12.5}}
	items, _, err := Cut(context.Background(), Options{Rows: rows, Recordings: recs, Roots: []string{arch}, MaxRate: 128})
	if err != nil {
		t.Fatal(err)
	}
	it := items[0]
	if it.Rate != 128 || len(it.Samples[0]) != 16*128 || !strings.Contains(it.Conditioning, "decimated to 128 Hz") {
		t.Errorf("rate %v, %d samples, conditioning %q", it.Rate, len(it.Samples[0]), it.Conditioning)
	}
}

func TestCutNamesMissingRecordings(t *testing.T) {
	arch, recs, ws := fixture(t)
	os.Remove(ws[0].Path)
	rows := []draw.Row{{EventID: "ev-a", RecordingID: recs[0].RecordingID, OnsetS: 5}, {EventID: "ev-b", RecordingID: recs[1].RecordingID, OnsetS: 5}}
	_, _, err := Cut(context.Background(), Options{Rows: rows, Recordings: recs, Roots: []string{arch}})
	var me *MissingError
	if !errors.As(err, &me) || len(me.Paths) != 1 || filepath.Base(me.Paths[0]) != filepath.Base(ws[0].Path) {
		t.Fatalf("err = %v, want a MissingError naming %s", err, ws[0].Path)
	}
}

// cancelBar cancels its context when the first item is done.
type cancelBar struct{ cancel context.CancelFunc }

func (b cancelBar) Add(int) { b.cancel() }
func (b cancelBar) Finish() {}

// Cut returns the context's error, before it reads anything when the context
// is already cancelled, and between events when it is cancelled while
// cutting: it does not go on to cut the rest.
func TestCutHonoursCancel(t *testing.T) {
	arch, recs, _ := fixture(t)
	rows := []draw.Row{
		{EventID: "ev-a", RecordingID: recs[0].RecordingID, OnsetS: 5},
		{EventID: "ev-b", RecordingID: recs[0].RecordingID, OnsetS: 12},
		{EventID: "ev-c", RecordingID: recs[1].RecordingID, OnsetS: 5},
	}
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if _, _, err := Cut(ctx, Options{Rows: rows, Recordings: recs, Roots: []string{arch}}); !errors.Is(err, context.Canceled) {
		t.Fatalf("cancelled before: %v, want context.Canceled", err)
	}
	ctx, cancel = context.WithCancel(context.Background())
	defer cancel()
	added := 0
	o := Options{Rows: rows, Recordings: recs, Roots: []string{arch}, Progress: func(total int, desc string) progress.Bar {
		return countBar{cancelBar{cancel}, &added}
	}}
	items, _, err := Cut(ctx, o)
	if !errors.Is(err, context.Canceled) || items != nil {
		t.Fatalf("cancelled while cutting: %d items, %v; want context.Canceled", len(items), err)
	}
	if added != 1 {
		t.Errorf("%d events cut after the cancel, want 1 (the one in progress)", added)
	}
}

// countBar counts Add calls and passes them on.
type countBar struct {
	cancelBar
	n *int
}

func (b countBar) Add(k int) { *b.n += k; b.cancelBar.Add(k) }

// TestCutReadsTheFileUnit checks that a recording stored in mV is shown in
// µV like the same recording stored in µV (SI prefixes, BIPM 2019, Table 7):
// the page's calipers and scale bars are in µV.
func TestCutReadsTheFileUnit(t *testing.T) {
	dir := t.TempDir()
	electrodes := []string{"Fp1", "Fp2", "C3", "C4", "O1", "O2"}
	const seconds = 30
	var recs []archive.Recording
	for _, u := range []struct {
		dim string
		per float64 // units per µV
	}{{"uV", 1}, {"mV", 1e-3}} {
		writeRecording(t, filepath.Join(dir, u.dim+".edf"), electrodes, u.dim, u.per, seconds, func(c int, tt float64) float64 {
			return 40 * math.Sin(2*math.Pi*(9+float64(c))*tt)
		})
		recs = append(recs, archive.Recording{RecordingID: u.dim, Path: u.dim + ".edf", EEGChannels: electrodes})
	}
	rows := []draw.Row{{EventID: "a", RecordingID: "uV", OnsetS: 15}, {EventID: "b", RecordingID: "mV", OnsetS: 15}}
	items, _, err := Cut(context.Background(), Options{Rows: rows, Recordings: recs, Roots: []string{dir}, Bandpass: [2]float64{0.5, 70}, NotchHz: 50})
	if err != nil {
		t.Fatal(err)
	}
	peak := 0.0
	for c := range items[0].Samples {
		for i, v := range items[0].Samples[c] {
			peak = max(peak, math.Abs(float64(v)))
			if d := math.Abs(float64(items[1].Samples[c][i] - v)); d > 0.05 {
				t.Fatalf("channel %d sample %d: %g µV from the mV file, %g from the µV file", c, i, items[1].Samples[c][i], v)
			}
		}
	}
	if peak < 30 || peak > 50 {
		t.Errorf("largest value %g µV, want about 40", peak)
	}
}

// TestCutBipolarRecording checks that a recording stored only as a bipolar
// chain is cut from the electrodes recovered from its derivations
// (edf.Header.Recovered): each is the electrode's potential less the mean
// over the chain's electrodes, the common average (common practice), so
// it matches the referential recording of the same potentials, less that
// mean, to the files' quantisation.
func TestCutBipolarRecording(t *testing.T) {
	dir := t.TempDir()
	electrodes := []string{"C3", "F3", "Fp1", "O1", "P3"} // sorted, as recovered
	chain := [][2]string{{"Fp1", "F3"}, {"F3", "C3"}, {"C3", "P3"}, {"P3", "O1"}}
	const seconds = 30
	v := func(c int, tt float64) float64 {
		return 40*math.Sin(2*math.Pi*(9+float64(c))*tt) + 100*math.Sin(2*math.Pi*3*tt) // the second term: a reference's own activity
	}
	writeRecording(t, filepath.Join(dir, "ref.edf"), electrodes, "uV", 1, seconds, v)
	var labels []string
	for _, p := range chain {
		labels = append(labels, "EEG "+p[0]+"-"+p[1])
	}
	writeRecording(t, filepath.Join(dir, "bip.edf"), labels, "uV", 1, seconds, func(j int, tt float64) float64 {
		return v(slices.Index(electrodes, chain[j][0]), tt) - v(slices.Index(electrodes, chain[j][1]), tt)
	})
	recs := []archive.Recording{{RecordingID: "ref", Path: "ref.edf", EEGChannels: electrodes}, {RecordingID: "bip", Path: "bip.edf", EEGChannels: electrodes}}
	rows := []draw.Row{{EventID: "a", RecordingID: "ref", OnsetS: 15}, {EventID: "b", RecordingID: "bip", OnsetS: 15}}
	items, _, err := Cut(context.Background(), Options{Rows: rows, Recordings: recs, Roots: []string{dir}, Bandpass: [2]float64{0.5, 70}, NotchHz: 50})
	if err != nil {
		t.Fatal(err)
	}
	ref, bip := items[0].Samples, items[1].Samples
	if len(bip) != len(electrodes) {
		t.Fatalf("%d channels from the bipolar file, want %d", len(bip), len(electrodes))
	}
	for i := range ref[0] {
		var mean float64
		for c := range ref {
			mean += float64(ref[c][i]) / float64(len(ref))
		}
		for c := range ref {
			if d := math.Abs(float64(ref[c][i]) - mean - float64(bip[c][i])); d > 0.1 {
				t.Fatalf("%s sample %d: %g µV from the bipolar file, %g less the mean from the referential one", electrodes[c], i, bip[c][i], float64(ref[c][i])-mean)
			}
		}
	}
}

// writeRecording writes an EDF+C file of seconds one-second records at 256
// Hz, one signal per label, in unit dim (per units per µV, range ±500 µV),
// signal c at time tt holding value(c, tt) µV.
func writeRecording(t *testing.T, path string, labels []string, dim string, per float64, seconds int, value func(c int, tt float64) float64) {
	t.Helper()
	const rate = 256
	sigs := make([]edf.Signal, len(labels))
	for i, l := range labels {
		sigs[i] = edf.Signal{Label: l, PhysDim: dim, PhysMin: -500 * per, PhysMax: 500 * per, DigMin: -32768, DigMax: 32767, SamplesPerRecord: rate}
	}
	f, err := os.Create(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	w, err := edf.NewWriter(f, edf.WriterHeader{Format: edf.EDFPlusC, Start: time.Date(2022, 3, 2, 9, 0, 0, 0, time.UTC), RecordDuration: 1, NumRecords: int64(seconds), Signals: sigs})
	if err != nil {
		t.Fatal(err)
	}
	rec := make([][]float32, len(labels))
	for r := range seconds {
		for c := range labels {
			rec[c] = make([]float32, rate)
			for i := range rate {
				rec[c][i] = float32(value(c, float64(r)+float64(i)/rate) * per)
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
