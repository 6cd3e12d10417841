package detect

import (
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/quorate-eeg/quorate/sampling/candidate"
	"github.com/quorate-eeg/quorate/sampling/edf"
	"github.com/quorate-eeg/quorate/sampling/synth"
)

// writeEDF writes channels (one per label, µV at rate Hz, whole seconds) as
// an EDF+C file with 1 s records and returns its path. physRange overrides
// the physical range of every signal when non-nil. Annotations go into the
// record holding their onset.
func writeEDF(t testing.TB, dir, name string, labels []string, data [][]float32, rate int, physRange *[2]float64, anns ...edf.Annotation) string {
	t.Helper()
	return writeEDFIn(t, dir, name, "uV", labels, data, rate, physRange, anns...)
}

// writeEDFIn is writeEDF with the samples and the physical range given in
// µV but written in unit dim ("uV", "mV", "V" or "nV").
func writeEDFIn(t testing.TB, dir, name, dim string, labels []string, data [][]float32, rate int, physRange *[2]float64, anns ...edf.Annotation) string {
	t.Helper()
	per := map[string]float64{"uV": 1, "mV": 1e-3, "V": 1e-6, "nV": 1e3}[dim] // units per µV
	sigs := make([]edf.Signal, len(labels))
	for i, l := range labels {
		sigs[i] = edf.Signal{Label: l, PhysDim: dim, PhysMin: -3200 * per, PhysMax: 3200 * per, DigMin: -32768, DigMax: 32767, SamplesPerRecord: rate}
		if physRange != nil {
			sigs[i].PhysMin, sigs[i].PhysMax = physRange[0]*per, physRange[1]*per
		}
	}
	if per != 1 {
		scaled := make([][]float32, len(data))
		for c, x := range data {
			scaled[c] = make([]float32, len(x))
			for i, v := range x {
				scaled[c][i] = float32(float64(v) * per)
			}
		}
		data = scaled
	}
	nrec := len(data[0]) / rate
	path := filepath.Join(dir, name)
	f, err := os.Create(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	w, err := edf.NewWriter(f, edf.WriterHeader{Format: edf.EDFPlusC, Start: time.Date(2022, 3, 2, 9, 0, 0, 0, time.UTC), RecordDuration: 1, NumRecords: int64(nrec), Signals: sigs})
	if err != nil {
		t.Fatal(err)
	}
	rec := make([][]float32, len(labels))
	for r := range nrec {
		for c := range labels {
			rec[c] = data[c][r*rate : (r+1)*rate]
		}
		var here []edf.Annotation
		for _, a := range anns {
			if a.Onset >= float64(r) && a.Onset < float64(r+1) {
				here = append(here, a)
			}
		}
		if err := w.WriteRecord(rec, here...); err != nil {
			t.Fatal(err)
		}
	}
	if err := w.Close(); err != nil {
		t.Fatal(err)
	}
	return path
}

// stageAnnotations annotates a generated recording's vigilance spans as
// sampling/synth writes them (AASM stage names, Berry et al. 2017).
func stageAnnotations(g *synth.Recording) []edf.Annotation {
	var anns []edf.Annotation
	for _, st := range g.States {
		text := "Sleep stage W"
		if st.State == synth.Drowsy {
			text = "Sleep stage N1"
		}
		anns = append(anns, edf.Annotation{Onset: st.Start, Duration: st.End - st.Start, HasDuration: true, Text: text})
	}
	return anns
}

// TestUnitsOfTheFile checks that detection reads a recording stored in mV
// or nV as the same recording stored in µV: samples are converted with the
// SI prefixes (BIPM, The International System of Units, 9th ed. 2019,
// Table 7) before anything measures them, so flat-channel tests (a spread
// under 1 µV) and amplitudes hold whatever unit the file uses. Read as
// µV, the mV file's channels would all be flat and give no events.
func TestUnitsOfTheFile(t *testing.T) {
	g := generated(t, 1, 10)
	in := inputOf(g)
	dir := t.TempDir()
	n := int(g.Rate) * 120 // two minutes are enough
	data := make([][]float32, len(in.Labels))
	for c, x := range in.Src.(memSource) {
		data[c] = x[:n]
	}
	rows := map[string][]candidate.Row{}
	for _, dim := range []string{"uV", "mV", "nV"} {
		path := writeEDFIn(t, dir, dim+".edf", dim, in.Labels, data, int(g.Rate), nil)
		r, err := edf.Open(path)
		if err != nil {
			t.Fatal(err)
		}
		got, warns, err := detectFileRows(mustSettings(t), r, dim)
		r.Close()
		if err != nil {
			t.Fatal(err)
		}
		for _, w := range warns {
			if strings.Contains(w, "flat") || strings.Contains(w, "dimension") {
				t.Errorf("%s: warning %q", dim, w)
			}
		}
		rows[dim] = got
	}
	want := rows["uV"]
	if len(want) < 10 {
		t.Fatalf("only %d events in µV", len(want))
	}
	for _, dim := range []string{"mV", "nV"} {
		got := rows[dim]
		if len(got) != len(want) {
			t.Fatalf("%s: %d events, µV %d", dim, len(got), len(want))
		}
		for i := range want {
			a, b := want[i], got[i]
			if a.OnsetS != b.OnsetS || a.PeakChannel != b.PeakChannel || math.Abs(a.AmplitudeUV-b.AmplitudeUV) > 1e-3*a.AmplitudeUV {
				t.Fatalf("%s event %d: %.4f s %s %.2f µV, µV file %.4f s %s %.2f µV", dim, i, b.OnsetS, b.PeakChannel, b.AmplitudeUV, a.OnsetS, a.PeakChannel, a.AmplitudeUV)
			}
		}
	}
}
