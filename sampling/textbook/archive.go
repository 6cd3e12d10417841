package textbook

import (
	"fmt"
	"io"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"time"

	"github.com/quorate-eeg/quorate/internal/atomicfile"
	"github.com/quorate-eeg/quorate/sampling/edf"
	"github.com/quorate-eeg/quorate/sampling/synth"
)

// DefaultCentre is the fictional centre of this generator's archives.
const DefaultCentre = "Brackenfold Neurophysiology Service"

// ArchiveConfig describes a fictional archive. Zero values take the
// defaults beside each field.
type ArchiveConfig struct {
	Seed       uint64
	Centre     string  // DefaultCentre
	Subjects   int     // 5
	Recordings int     // per subject; 1 if 0
	Duration   float64 // seconds per recording; 240
	// ControlShare is the share of subjects without IEDs; 0.2 if 0, none if
	// negative.
	ControlShare float64
}

// Subject is one fictional patient.
type Subject struct {
	ID        string // "sub-001"
	PatientID string // EDF+ patient field
	Records   []Spec
}

// Spec is one recording of a subject.
type Spec struct {
	ID          string // "sub-001_ses-01_task-rest_run-01"
	RecordingID string // EDF+ recording field
	Start       time.Time
	Config      Config
}

// Archive describes a seeded fictional archive: each subject has a focus
// (temporal or extratemporal), an IED rate of 1–10 per minute (0 for
// controls), an alpha frequency, and 4–10 look-alikes per minute.
func Archive(cfg ArchiveConfig) []Subject {
	if cfg.Centre == "" {
		cfg.Centre = DefaultCentre
	}
	if cfg.Subjects <= 0 {
		cfg.Subjects = 5
	}
	if cfg.Recordings <= 0 {
		cfg.Recordings = 1
	}
	if cfg.Duration <= 0 {
		cfg.Duration = 240
	}
	if cfg.ControlShare == 0 {
		cfg.ControlShare = 0.2
	}
	r := rand.New(rand.NewPCG(cfg.Seed, 0x424f4f4b)) // "BOOK"
	out := make([]Subject, cfg.Subjects)
	for i := range out {
		s := &out[i]
		s.ID = fmt.Sprintf("sub-%03d", i+1)
		sex := []string{"F", "M"}[r.IntN(2)]
		birth := time.Date(1945+r.IntN(70), time.Month(1+r.IntN(12)), 1+r.IntN(28), 0, 0, 0, 0, time.UTC)
		// EDF+ patient field: code, sex, birthdate, name (Kemp & Olivan 2003).
		s.PatientID = fmt.Sprintf("BNS-%04d %s %s Fictional_Person%d", i+1, sex, edfDate(birth), i+1)
		rate := 0.0
		if r.Float64() >= cfg.ControlShare {
			rate = logUni(r, 1, 10)
		}
		focus, alpha := drawFocus(r), uni(r, 8.5, 11.5)
		start := time.Date(2022+r.IntN(3), time.Month(1+r.IntN(12)), 1+r.IntN(28), 8+r.IntN(8), r.IntN(60), 0, 0, time.UTC)
		for j := range cfg.Recordings {
			st := start.AddDate(0, 0, 14*j)
			s.Records = append(s.Records, Spec{
				ID:          fmt.Sprintf("%s_ses-%02d_task-rest_run-01", s.ID, j+1),
				RecordingID: fmt.Sprintf("Startdate %s BNS-%04d-%02d Tech_Fictional Textbook_EEG_19", edfDate(st), i+1, j+1),
				Start:       st,
				Config: Config{Seed: r.Uint64(), Duration: cfg.Duration, IEDRate: rate,
					LookalikeRate: uni(r, 4, 10), AlphaFreq: alpha, Focus: focus},
			})
		}
	}
	return out
}

// edfDate is dd-MMM-yyyy with an upper-case English month (EDF+, Kemp &
// Olivan 2003, section 2.1.3).
func edfDate(t time.Time) string {
	return fmt.Sprintf("%02d-%s-%04d", t.Day(), [...]string{"JAN", "FEB", "MAR", "APR", "MAY", "JUN",
		"JUL", "AUG", "SEP", "OCT", "NOV", "DEC"}[t.Month()-1], t.Year())
}

// Written is one recording written by WriteArchive.
type Written struct {
	Subject   Subject
	Spec      Spec
	Path      string        // the EDF+ file
	TruthPath string        // its truth table, synth.WriteTruthCSV's format
	Truth     []synth.Event // what was inserted
}

// WriteArchive generates and writes every recording as EDF+ under
// archiveDir/<subject>/<recording>.edf with its truth table under
// truthDir/<recording>_truth.csv, in the truth-table format of
// synth.WriteTruthCSV so that one evaluation reads both generators.
func WriteArchive(archiveDir, truthDir string, subjects []Subject) ([]Written, error) {
	var out []Written
	for _, s := range subjects {
		for _, spec := range s.Records {
			w := Written{Subject: s, Spec: spec,
				Path:      filepath.Join(archiveDir, s.ID, spec.ID+".edf"),
				TruthPath: filepath.Join(truthDir, spec.ID+"_truth.csv")}
			rec, err := Generate(spec.Config)
			if err != nil {
				return nil, fmt.Errorf("generating %s: %w", spec.ID, err)
			}
			if err := WriteEDF(w.Path, s.PatientID, spec.RecordingID, spec.Start, rec); err != nil {
				return nil, fmt.Errorf("writing %s: %w", w.Path, err)
			}
			w.Truth = rec.Truth
			if err := atomicfile.Write(w.TruthPath, 0o644, func(f io.Writer) error { return synth.WriteTruthCSV(f, rec.Truth) }); err != nil {
				return nil, err
			}
			out = append(out, w)
		}
	}
	return out, nil
}

// stageText names a state as the AASM manual does (Berry et al. 2017).
var stageText = map[synth.State]string{Awake: "Sleep stage W", Drowsy: "Sleep stage N1", N2: "Sleep stage N2"}

// WriteEDF writes rec as EDF+C, one-second records, 16-bit at 0.1 µV, labels
// "EEG <name>-AVG" (the data are average-referenced), and each vigilance
// state as an annotation. The file time is the recording's end, so that two
// writes from one seed are identical.
func WriteEDF(path, patientID, recordingID string, start time.Time, rec *synth.Recording) error {
	rate := int(rec.Rate)
	if float64(rate) != rec.Rate {
		return fmt.Errorf("sample rate %g Hz is not whole: one-second records need whole rates", rec.Rate)
	}
	sigs := make([]edf.Signal, len(rec.Labels))
	for i, l := range rec.Labels {
		sigs[i] = edf.Signal{Label: "EEG " + l + "-AVG", Transducer: "AgAgCl electrode", PhysDim: "uV",
			PhysMin: -3276.8, PhysMax: 3276.7, DigMin: -32768, DigMax: 32767,
			Prefilter: "HP:0.1Hz LP:70Hz", SamplesPerRecord: rate}
	}
	n := len(rec.Data[0])
	records := int64(math.Ceil(float64(n) / float64(rate)))
	if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
		return err
	}
	err := atomicfile.Write(path, 0o644, func(f io.Writer) error {
		wr, err := edf.NewWriter(f, edf.WriterHeader{Format: edf.EDFPlusC, PatientID: patientID,
			RecordingID: recordingID, Start: start, RecordDuration: 1, NumRecords: records, Signals: sigs})
		if err != nil {
			return err
		}
		buf := make([][]float32, len(rec.Labels))
		for i := range buf {
			buf[i] = make([]float32, rate)
		}
		for r := range records {
			lo := int(r) * rate
			for i := range buf {
				clear(buf[i][copy(buf[i], rec.Data[i][lo:min(n, lo+rate)]):])
			}
			var anns []edf.Annotation
			for _, st := range rec.States {
				if st.Start >= float64(r) && st.Start < float64(r+1) {
					anns = append(anns, edf.Annotation{Onset: st.Start, Duration: st.End - st.Start, HasDuration: true, Text: stageText[st.State]})
				}
			}
			if err := wr.WriteRecord(buf, anns...); err != nil {
				return err
			}
		}
		return wr.Close()
	})
	if err != nil {
		return err
	}
	end := start.Add(time.Duration(records) * time.Second)
	return os.Chtimes(path, end, end)
}
