package detect

import (
	"os"
	"path/filepath"
	"testing"
	"time"

	"github.com/quorate-eeg/quorate/sampling/edf"
	"github.com/quorate-eeg/quorate/sampling/synth"
)

// writeEDF writes channels (one per label, µV at rate Hz, whole seconds) as
// an EDF+C file with 1 s records and returns its path. physRange overrides
// the physical range of every signal when non-nil. Annotations go into the
// record holding their onset.
func writeEDF(t testing.TB, dir, name string, labels []string, data [][]float32, rate int, physRange *[2]float64, anns ...edf.Annotation) string {
	t.Helper()
	sigs := make([]edf.Signal, len(labels))
	for i, l := range labels {
		sigs[i] = edf.Signal{Label: l, PhysDim: "uV", PhysMin: -3200, PhysMax: 3200, DigMin: -32768, DigMax: 32767, SamplesPerRecord: rate}
		if physRange != nil {
			sigs[i].PhysMin, sigs[i].PhysMax = physRange[0], physRange[1]
		}
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
