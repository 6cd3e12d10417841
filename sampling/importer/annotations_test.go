package importer

import (
	"context"
	"math"
	"os"
	"path/filepath"
	"testing"

	"github.com/quorate-eeg/quorate/sampling/archive"
	"github.com/quorate-eeg/quorate/sampling/candidate"
	"github.com/quorate-eeg/quorate/sampling/edf"
)

// writeEDFPlus writes a 10 s EDF+C file (Kemp & Olivan 2003) with two 256 Hz EEG
// channels and the given annotations, stored in the record holding their onset.
func writeEDFPlus(t *testing.T, path string, anns []edf.Annotation) {
	t.Helper()
	if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
		t.Fatal(err)
	}
	f, err := os.Create(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	sigs := []edf.Signal{
		{Label: "EEG T7", PhysDim: "uV", PhysMin: -500, PhysMax: 500, SamplesPerRecord: 256},
		{Label: "EEG T8", PhysDim: "uV", PhysMin: -500, PhysMax: 500, SamplesPerRecord: 256},
	}
	w, err := edf.NewWriter(f, edf.WriterHeader{Format: edf.EDFPlusC, Start: night, RecordDuration: 1, NumRecords: 10,
		Signals: sigs, AnnotationBytes: 200})
	if err != nil {
		t.Fatal(err)
	}
	for i := range 10 {
		x := [][]float32{make([]float32, 256), make([]float32, 256)}
		for k := range x[0] {
			x[0][k] = float32(50 * math.Sin(2*math.Pi*10*float64(k)/256))
		}
		var here []edf.Annotation
		for _, a := range anns {
			if int(a.Onset) == i || i == 9 && a.Onset >= 10 {
				here = append(here, a)
			}
		}
		if err := w.WriteRecord(x, here...); err != nil {
			t.Fatal(err)
		}
	}
	if err := w.Close(); err != nil {
		t.Fatal(err)
	}
}

// TestRunEDFAnnotations indexes an EDF+C file with the archive scanner and imports the
// annotations whose text matches spike|sharp, in any case.
func TestRunEDFAnnotations(t *testing.T) {
	dir := t.TempDir()
	root := filepath.Join(dir, "archive")
	writeEDFPlus(t, filepath.Join(root, "night", "a.edf"), []edf.Annotation{
		{Onset: 2.25, Duration: 0.1, HasDuration: true, Text: "Spike T7"},
		{Onset: 5, Text: "Eyes closed"},
		{Onset: 7.5, Text: "SHARP WAVE"},
		{Onset: 7.502, Text: "spike"}, // within one sample (1/256 s) of 7.5: the same event
		{Onset: 8, Text: "spindle"},
		{Onset: 12, Text: "spike after the end"},
	})
	idx, err := archive.Run(context.Background(), archive.Options{Roots: []string{root}, Secret: []byte("test"),
		IndexDir: filepath.Join(dir, "index"), Workers: 1})
	if err != nil {
		t.Fatal(err)
	}
	if len(idx.Recordings) != 1 {
		t.Fatalf("indexed %+v, problems %+v", idx.Recordings, idx.Problems)
	}
	rec := idx.Recordings[0]
	var got []float64
	measure := func(r archive.Recording, onsets []float64) ([]candidate.Row, []string, error) {
		got = append(got, onsets...)
		return stubMeasure(r, onsets)
	}
	out := filepath.Join(dir, "candidates")
	o := Options{Kind: KindEDFAnnotations, Pattern: "spike|sharp", Source: "ward-eeg", Recordings: idx.Recordings,
		Roots: []string{root}, Measure: measure, OutDir: out}
	res, err := Run(context.Background(), o)
	if err != nil {
		t.Fatal(err)
	}
	if len(got) != 2 || got[0] != 2.25 || got[1] != 7.5 {
		t.Errorf("measured at %v, want [2.25 7.5]", got)
	}
	if res.Read != 4 || res.Skipped != 2 || res.Merged != 1 || res.Kept != 2 || len(res.Rejected) != 1 {
		t.Errorf("read %d skipped %d merged %d kept %d rejected %+v", res.Read, res.Skipped, res.Merged, res.Kept, res.Rejected)
	}
	if r := res.Rejected[0]; r.Field != "annotation" || r.Line != 10 || r.File != filepath.Join(root, "night", "a.edf") {
		t.Errorf("rejection %+v, want the annotation in data record 10", r)
	}
	rows, err := candidate.ReadDir(out)
	if err != nil {
		t.Fatal(err)
	}
	if len(rows) != 2 || rows[0].RecordingID != rec.RecordingID || rows[0].Source != "import:ward-eeg" || rows[0].SubjectKey != rec.SubjectKey {
		t.Errorf("rows %+v", rows)
	}

	// Case-sensitive: "SHARP WAVE" and "Spike T7" no longer match; "spike" at 7.502 does.
	got = nil
	o.CaseSensitive, o.Pattern, o.Replace = true, "spike|sharp", true
	o.Files = []string{"night/a.edf"} // by archive-relative path
	if _, err := Run(context.Background(), o); err != nil {
		t.Fatal(err)
	}
	if len(got) != 1 || got[0] != 7.502 {
		t.Errorf("case-sensitive: measured at %v, want [7.502]", got)
	}
	o.Files = []string{"missing.edf"}
	_, err = Run(context.Background(), o)
	as[*optionError](t, err)
}
