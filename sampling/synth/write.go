package synth

import (
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"time"

	"github.com/quorate-eeg/quorate/internal/atomicfile"
	"github.com/quorate-eeg/quorate/sampling/edf"
)

// Written is one recording written by WriteArchive.
type Written struct {
	Subject   Subject
	Spec      RecordingSpec
	Path      string  // the EDF+ file
	TruthPath string  // its truth table (CSV)
	Truth     []Event // what was inserted
}

// WriteArchive generates every recording of the fictional archive described by subjects
// and writes it as EDF+ (one-second data records, 16-bit, 0.1 µV steps) under
// archiveDir/<subject>/<recording>.edf, with its truth table under
// truthDir/<recording>_truth.csv — outside the archive, as a centre's own records of
// truth would be. Labels are written the way acquisition systems often write them
// ("EEG Fp1-REF"), so the reader's label normalisation is exercised too.
func WriteArchive(archiveDir, truthDir string, subjects []Subject) ([]Written, error) {
	var out []Written
	for _, s := range subjects {
		for _, spec := range s.Records {
			w := Written{Subject: s, Spec: spec,
				Path:      filepath.Join(archiveDir, s.ID, spec.ID+".edf"),
				TruthPath: filepath.Join(truthDir, spec.ID+"_truth.csv")}
			truth, err := writeRecording(w.Path, s, spec)
			if err != nil {
				return nil, fmt.Errorf("writing %s: %w", w.Path, err)
			}
			w.Truth = truth
			if err := atomicfile.Write(w.TruthPath, 0o644, func(f io.Writer) error { return WriteTruthCSV(f, truth) }); err != nil {
				return nil, err
			}
			out = append(out, w)
		}
	}
	return out, nil
}

func writeRecording(path string, s Subject, spec RecordingSpec) ([]Event, error) {
	g, err := NewGenerator(spec.Config)
	if err != nil {
		return nil, err
	}
	rate := g.Rate()
	if rate != math.Trunc(rate) {
		return nil, fmt.Errorf("sample rate %g Hz is not whole: one-second records need whole rates", rate)
	}
	labels, kinds := g.Labels(), g.Kinds()
	sigs := make([]edf.Signal, len(labels))
	for i, l := range labels {
		label := "EEG " + l + "-REF"
		if kinds[i] != EEG {
			label = l
		}
		sigs[i] = edf.Signal{Label: label, Transducer: "AgAgCl electrode", PhysDim: "uV",
			PhysMin: -3276.8, PhysMax: 3276.7, DigMin: -32768, DigMax: 32767,
			Prefilter: "HP:0.016Hz LP:100Hz", SamplesPerRecord: int(rate)}
	}
	records := int64(math.Ceil(float64(g.Len()) / rate))
	if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
		return nil, err
	}
	err = atomicfile.Write(path, 0o644, func(f io.Writer) error {
		wr, err := edf.NewWriter(f, edf.WriterHeader{Format: edf.EDFPlusC, PatientID: s.PatientID,
			RecordingID: spec.RecordingID, Start: spec.Start, RecordDuration: 1, NumRecords: records, Signals: sigs})
		if err != nil {
			return err
		}
		buf := make([][]float32, len(labels))
		for i := range buf {
			buf[i] = make([]float32, int(rate))
		}
		// Each change of vigilance state is annotated as a scorer would, in the AASM
		// stage names (Berry et al. 2017): W for awake, N1 for drowsy.
		var stages []edf.Annotation
		for _, st := range g.States() {
			text := "Sleep stage W"
			if st.State == Drowsy {
				text = "Sleep stage N1"
			}
			stages = append(stages, edf.Annotation{Onset: st.Start, Duration: st.End - st.Start, HasDuration: true, Text: text})
		}
		for r := int64(0); r < records; r++ {
			n, err := g.Read(buf)
			if err != nil && err != io.EOF {
				return err
			}
			for i := range buf {
				clear(buf[i][n:]) // the last record is padded with zeros
			}
			var anns []edf.Annotation
			for _, a := range stages {
				if a.Onset >= float64(r) && a.Onset < float64(r+1) {
					anns = append(anns, a)
				}
			}
			if err := wr.WriteRecord(buf, anns...); err != nil {
				return err
			}
		}
		return wr.Close()
	})
	if err != nil {
		return nil, err
	}
	// The file's time is the end of the fictional recording, so that an archive made
	// twice from one seed is the same to the byte and to the index.
	end := spec.Start.Add(time.Duration(float64(records) * float64(time.Second)))
	if err := os.Chtimes(path, end, end); err != nil {
		return nil, err
	}
	return g.Truth(), nil
}
