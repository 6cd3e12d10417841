package detect

import (
	"context"
	"math"
	"math/rand/v2"
	"os"
	"strings"
	"testing"

	"github.com/quorate-eeg/quorate/sampling/archive"
	"github.com/quorate-eeg/quorate/sampling/candidate"
	"github.com/quorate-eeg/quorate/sampling/edf"
)

func noise(seed uint64, n int, sd float64) []float32 {
	r := rand.New(rand.NewPCG(seed, 7))
	x := make([]float32, n)
	for i := range x {
		x[i] = float32(sd * r.NormFloat64())
	}
	return x
}

func hasWarning(ws []string, sub string) bool {
	for _, w := range ws {
		if strings.Contains(w, sub) {
			return true
		}
	}
	return false
}

// TestBadRecordings checks that bad input degrades with a warning instead of
// stopping the run: a recording without EEG channels, a flat and a saturated
// channel (montage.ChannelQuality), a header whose physical minimum equals its
// maximum (every sample reads the same value: Kemp et al. 1992 scaling with
// zero gain), and a missing file, all in one Run.
func TestBadRecordings(t *testing.T) {
	dir := t.TempDir()
	const fs, n = 256, 256 * 30
	// no EEG: ECG and EOG only
	writeEDF(t, dir, "noeeg.edf", []string{"ECG", "EOG"}, [][]float32{noise(1, n, 100), noise(2, n, 20)}, fs, nil)
	// flat and saturated channels among good ones
	labels := []string{"Fp1", "F3", "C3", "P3", "O1", "Fp2", "F4", "C4", "P4", "O2"}
	data := make([][]float32, len(labels))
	for i := range data {
		data[i] = noise(uint64(10+i), n, 30)
	}
	data[2] = make([]float32, n) // C3 flat
	for i := range data[7] {
		data[7][i] = 3200 // C4 at the physical maximum
	}
	writeEDF(t, dir, "quality.edf", labels, data, fs, nil)
	// zero-gain scaling
	patchPhysMax(t, writeEDF(t, dir, "scale.edf", labels[:5], data[:5], fs, &[2]float64{100, 200}), 5, "100")
	recs := []archive.Recording{
		{RecordingID: "noeeg", Path: "noeeg.edf"},
		{RecordingID: "quality", Path: "quality.edf"},
		{RecordingID: "scale", Path: "scale.edf"},
		{RecordingID: "missing", Path: "missing.edf"},
	}
	out := t.TempDir()
	res, err := Run(context.Background(), Options{Recordings: recs, Roots: []string{dir}, OutDir: out, Workers: 2})
	if err != nil {
		t.Fatal(err)
	}
	if res.Processed != 3 || res.Failed != 1 {
		t.Errorf("processed %d failed %d, want 3 and 1: %v", res.Processed, res.Failed, res.Warnings)
	}
	for id, want := range map[string]string{
		"noeeg":   "no scalp EEG channels",
		"quality": "channel C3: flat",
		"scale":   "unusable scaling",
		"missing": "open",
	} {
		if !hasWarning(res.Warnings[id], want) {
			t.Errorf("%s: warnings %q lack %q", id, res.Warnings[id], want)
		}
	}
	if !hasWarning(res.Warnings["quality"], "channel C4: saturated") {
		t.Errorf("quality: warnings %q lack the saturated channel", res.Warnings["quality"])
	}
	if rows, err := candidate.Read(OutputPath(out, 0, "noeeg")); err != nil || len(rows) != 0 {
		t.Errorf("noeeg: %d rows, %v; want an empty table so a resumed run skips it", len(rows), err)
	}
}

// TestFewChannels checks that a montage needing electrodes the recording
// lacks degrades and says so: three temporal-chain electrodes give two
// longitudinal bipolar derivations, with warnings for the rest, and c6 is
// not measured (a dipole fit needs four electrodes).
func TestFewChannels(t *testing.T) {
	labels := []string{"Fp1", "F7", "T7"}
	data := memSource{noise(1, 256*30, 30), noise(2, 256*30, 30), noise(3, 256*30, 30)}
	// a transient on F7 so that there is an event to measure
	for i, v := range triangle(256*30, 256*15, 4, 8, -400) {
		data[1][i] += v
	}
	in := Input{RecordingID: "few", Labels: labels, Rate: 256, Len: 256 * 30, Src: data}
	rows, warns, err := Detect(context.Background(), in, Options{Montage: "longitudinal-bipolar"})
	if err != nil {
		t.Fatal(err)
	}
	if !hasWarning(warns, "montage longitudinal-bipolar") || !hasWarning(warns, "dipole fit unavailable") {
		t.Errorf("warnings %q", warns)
	}
	if len(rows) == 0 {
		t.Fatal("no event found at the inserted transient")
	}
	for _, r := range rows {
		if r.C6DipoleGOF == r.C6DipoleGOF || r.C6Met {
			t.Errorf("c6 measured with three electrodes: %+v", r)
		}
	}
	if _, _, err := Detect(context.Background(), in, Options{Montage: "no-such"}); err == nil {
		t.Error("unknown montage accepted")
	}
}

// patchPhysMax overwrites the "physical maximum" field of the first k
// signals, which the writer rightly refuses to produce. Layout from Kemp et
// al. (1992): after the 256-byte fixed header come ns×16 label, ns×80
// transducer, ns×8 dimension, ns×8 physical minimum, ns×8 physical maximum.
func patchPhysMax(t *testing.T, path string, k int, v string) {
	f, err := os.OpenFile(path, os.O_RDWR, 0)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	r, err := edf.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	ns := len(r.Header().Signals)
	r.Close()
	field := []byte(v + strings.Repeat(" ", 8-len(v)))
	for i := range k {
		if _, err := f.WriteAt(field, int64(256+ns*(16+80+8+8)+8*i)); err != nil {
			t.Fatal(err)
		}
	}
}

// TestNonFiniteSamples checks that NaN, +Inf and −Inf samples each make
// their channel excluded with a warning, and that finite extremes of
// float32 (±MaxFloat32, the smallest subnormal) do not.
func TestNonFiniteSamples(t *testing.T) {
	labels := []string{"Fp1", "F3", "C3", "P3", "O1", "Fp2", "F4", "C4", "P4", "O2"}
	const fs, n = 256, 256 * 30
	for _, c := range []struct {
		v   float32
		bad bool
	}{
		{float32(math.NaN()), true}, {float32(math.Inf(1)), true}, {float32(math.Inf(-1)), true},
		{math.MaxFloat32, false}, {-math.MaxFloat32, false}, {math.SmallestNonzeroFloat32, false},
	} {
		var data memSource
		for i := range labels {
			data = append(data, noise(uint64(40+i), n, 30))
		}
		data[3][n/2] = c.v
		in := Input{RecordingID: "r", Labels: labels, Rate: fs, Len: n, Src: data}
		_, warns, err := Detect(context.Background(), in, Options{})
		if err != nil {
			t.Fatal(err)
		}
		if got := hasWarning(warns, "channel P3: non-finite"); got != c.bad {
			t.Errorf("sample %g: non-finite warning %v, want %v (%q)", c.v, got, c.bad, warns)
		}
	}
}
