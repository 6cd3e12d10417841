package detect

import (
	"math"
	"os"
	"path/filepath"
	"slices"
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

// TestCommonReferenceLabels checks that a recording whose channels are
// labelled as derivations against Cz ("EEG Fp1-Cz", …) is read as the
// referential recording it is: the common average is the same whatever
// the reference (common practice), so it gives the events of the same
// recording stored against another reference without Cz. Before, every
// such channel read as a bipolar derivation and the recording was skipped.
func TestCommonReferenceLabels(t *testing.T) {
	g := generated(t, 1, 10)
	in := inputOf(g)
	dir := t.TempDir()
	n := int(g.Rate) * 120
	cz := slices.Index(in.Labels, "Cz")
	if cz < 0 {
		t.Fatal("no Cz")
	}
	var plain, againstCz []string
	var data, refd [][]float32
	for c, x := range in.Src.(memSource) {
		if c == cz {
			continue
		}
		plain = append(plain, "EEG "+in.Labels[c]+"-REF")
		againstCz = append(againstCz, "EEG "+in.Labels[c]+"-Cz")
		data = append(data, x[:n])
		d := make([]float32, n)
		for i := range d {
			d[i] = x[i] - in.Src.(memSource)[cz][i]
		}
		refd = append(refd, d)
	}
	var rows [2][]candidate.Row
	rows[0], _, _ = detectWritten(t, dir, "r0.edf", plain, data, int(g.Rate))
	var warns, hw []string
	rows[1], warns, hw = detectWritten(t, dir, "r1.edf", againstCz, refd, int(g.Rate))
	if !strings.Contains(strings.Join(hw, "\n"), "against Cz") {
		t.Errorf("no warning that Cz is the reference: %q %q", hw, warns)
	}
	if len(rows[0]) < 10 {
		t.Fatalf("only %d events", len(rows[0]))
	}
	same := sameEvents(rows[0], rows[1], 0)
	// the two files differ only by 0.1 µV quantisation of other values
	if len(rows[1]) < len(rows[0])*9/10 || same < len(rows[0])*9/10 {
		t.Errorf("against Cz: %d events, %d of the %d of the plain file at the same time and channel", len(rows[1]), same, len(rows[0]))
	}
}

// TestBipolarRecording checks that a recording stored only as a
// longitudinal bipolar chain (the double banana, linked across the midline
// by C3-Cz and Cz-C4) gives the events of the same recording stored
// referentially: the potentials recovered from the derivations are the
// common average the finder uses (edf.TestRecoverElectrodes). Before the
// recovery such a recording was skipped as having no scalp EEG.
func TestBipolarRecording(t *testing.T) {
	g := generated(t, 1, 10)
	in := inputOf(g)
	dir := t.TempDir()
	n := int(g.Rate) * 120
	src := in.Src.(memSource)
	at := func(e string) []float32 {
		c := slices.Index(in.Labels, e)
		if c < 0 {
			t.Fatalf("no %s", e)
		}
		return src[c][:n]
	}
	var plain, chain []string
	var data, derived [][]float32
	for c, x := range src {
		plain = append(plain, "EEG "+in.Labels[c]+"-REF")
		data = append(data, x[:n])
	}
	pairs := [][2]string{
		{"Fp1", "F7"}, {"F7", "T7"}, {"T7", "P7"}, {"P7", "O1"},
		{"Fp1", "F3"}, {"F3", "C3"}, {"C3", "P3"}, {"P3", "O1"},
		{"Fp2", "F8"}, {"F8", "T8"}, {"T8", "P8"}, {"P8", "O2"},
		{"Fp2", "F4"}, {"F4", "C4"}, {"C4", "P4"}, {"P4", "O2"},
		{"Fz", "Cz"}, {"Cz", "Pz"}, {"C3", "Cz"}, {"Cz", "C4"},
	}
	for _, p := range pairs {
		a, b := at(p[0]), at(p[1])
		d := make([]float32, n)
		for i := range d {
			d[i] = a[i] - b[i]
		}
		chain = append(chain, "EEG "+p[0]+"-"+p[1])
		derived = append(derived, d)
	}
	if len(plain) != 19 {
		t.Fatalf("the generator's montage has %d electrodes, the chain covers 19", len(plain))
	}
	var rows [2][]candidate.Row
	rows[0], _, _ = detectWritten(t, dir, "r0.edf", plain, data, int(g.Rate))
	rows[1], _, _ = detectWritten(t, dir, "r1.edf", chain, derived, int(g.Rate))
	if len(rows[0]) < 10 {
		t.Fatalf("only %d events", len(rows[0]))
	}
	same := sameEvents(rows[0], rows[1], 0.005)
	t.Logf("referential %d events, bipolar %d, %d at the same time and channel", len(rows[0]), len(rows[1]), same)
	// the files differ by the 0.1 µV quantisation of derivations and potentials
	if len(rows[1]) < len(rows[0])*9/10 || same < len(rows[0])*9/10 {
		t.Errorf("bipolar chain: %d events, %d of the %d of the referential file at the same time and channel", len(rows[1]), same, len(rows[0]))
	}
	for _, r := range rows[1] {
		if math.IsNaN(r.C6DipoleGOF) {
			t.Fatalf("linked chain: c6 not measured at %.3f s", r.OnsetS)
		}
	}

	// Without C3-Cz and Cz-C4 the two sides are unlinked groups, each
	// relative to its own mean, and the midline (three electrodes) is left
	// out: events are still found, criterion 6 is not measured.
	got, warns, _ := detectWritten(t, dir, "unlinked.edf", chain[:18], derived[:18], int(g.Rate))
	if !strings.Contains(strings.Join(warns, "\n"), "c6 not measured") {
		t.Errorf("unlinked groups: no warning that c6 is not measured: %q", warns)
	}
	if len(got) < len(rows[0])/2 {
		t.Errorf("unlinked groups: %d events against %d", len(got), len(rows[0]))
	}
	for _, r := range got {
		if !math.IsNaN(r.C6DipoleGOF) {
			t.Fatalf("unlinked groups: c6 %.3f at %.3f s, want NaN", r.C6DipoleGOF, r.OnsetS)
		}
	}
}

// detectWritten writes labels and data as an EDF+ file in dir and detects
// on it, returning the rows, the warnings and the header's warnings.
func detectWritten(t *testing.T, dir, name string, labels []string, data [][]float32, rate int) ([]candidate.Row, []string, []string) {
	t.Helper()
	r, err := edf.Open(writeEDF(t, dir, name, labels, data, rate, nil))
	if err != nil {
		t.Fatal(err)
	}
	defer r.Close()
	rows, warns, err := detectFileRows(mustSettings(t), r, "r")
	if err != nil {
		t.Fatal(err)
	}
	return rows, warns, r.Header().Warnings
}

// sameEvents counts the rows of a with a row of b at the same peak channel
// within tol seconds.
func sameEvents(a, b []candidate.Row, tol float64) int {
	n := 0
	for _, x := range a {
		if slices.ContainsFunc(b, func(y candidate.Row) bool {
			return math.Abs(x.OnsetS-y.OnsetS) <= tol && x.PeakChannel == y.PeakChannel
		}) {
			n++
		}
	}
	return n
}
