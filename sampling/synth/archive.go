package synth

import (
	"fmt"
	"math/rand/v2"
	"strings"
	"time"
)

// DefaultCentre is the fictional centre the demo archive belongs to.
const DefaultCentre = "Hollowmere Epilepsy Unit"

// ArchiveConfig describes a fictional archive. Zero values take the
// defaults given beside each field.
type ArchiveConfig struct {
	Seed       uint64
	Centre     string  // DefaultCentre
	Subjects   int     // 5
	Recordings int     // recordings per subject; drawn from 1–3 if 0
	Duration   float64 // seconds per recording; 300
	// ControlShare is the share of subjects without IEDs; 0.2 if 0, none if
	// negative.
	ControlShare float64
	Forward      Forward // copied into every recording's Config
}

// Subject is one fictional patient with their recordings.
type Subject struct {
	ID        string    // BIDS-style label, "sub-001"
	PatientID string    // EDF+ local patient identification field
	Sex       string    // "F" or "M"
	Birth     time.Time // fictional birthdate
	Name      string    // fictional, EDF+ style with underscores
	Focus     [3]float64
	IEDRate   float64 // per minute; 0 for controls
	Records   []RecordingSpec
}

// RecordingSpec is one recording of a subject, ready for Generate.
type RecordingSpec struct {
	ID          string    // "sub-001_ses-01_task-rest_run-01"
	RecordingID string    // EDF+ local recording identification field
	Start       time.Time // fictional start date and time
	Config      Config
}

// Invented name parts; any likeness to real people is unintended.
var (
	givenNames = []string{"Ada", "Bram", "Calla", "Dorian", "Elsbeth", "Fennick", "Greta", "Hollis",
		"Isolde", "Jory", "Kestrel", "Linnet", "Merrin", "Nye", "Orla", "Perrin", "Quilla", "Rook",
		"Saffi", "Tamsin", "Ulric", "Vesna", "Wren", "Yarrow"}
	surnames = []string{"Quillfeather", "Marrowdown", "Thistlecombe", "Ashgrove", "Bellwether",
		"Cindermoss", "Dunhollow", "Emberlane", "Fernwhistle", "Glimmerby", "Harrowgate",
		"Ivybridge", "Juniperwick", "Kettleburn", "Larkspire", "Mossbottom", "Nettlefold",
		"Oakenshade", "Pebblebrook", "Rushmere", "Saltmarsh", "Tumbledown", "Willowmere"}
	months = []string{"JAN", "FEB", "MAR", "APR", "MAY", "JUN", "JUL", "AUG", "SEP", "OCT", "NOV", "DEC"}
)

// edfDate formats a date as EDF+ requires, dd-MMM-yyyy with an English
// upper-case month (EDF+ specification, Kemp & Olivan 2003, section 2.1.3).
func edfDate(t time.Time) string {
	return fmt.Sprintf("%02d-%s-%04d", t.Day(), months[t.Month()-1], t.Year())
}

// Archive describes a seeded fictional archive: subjects with EDF+ patient
// fields, each with one or more recordings whose Configs differ in seed and
// share the subject's focus, IED rate and alpha frequency.
func Archive(cfg ArchiveConfig) []Subject {
	if cfg.Centre == "" {
		cfg.Centre = DefaultCentre
	}
	if cfg.Subjects <= 0 {
		cfg.Subjects = 5
	}
	if cfg.Duration <= 0 {
		cfg.Duration = 300
	}
	if cfg.ControlShare == 0 {
		cfg.ControlShare = 0.2
	}
	r := rand.New(rand.NewPCG(cfg.Seed, 0x41524348)) // "ARCH"
	code := centreCode(cfg.Centre)
	out := make([]Subject, cfg.Subjects)
	for i := range out {
		s := &out[i]
		s.ID = fmt.Sprintf("sub-%03d", i+1)
		s.Sex = []string{"F", "M"}[r.IntN(2)]
		s.Birth = time.Date(1940+r.IntN(75), time.Month(1+r.IntN(12)), 1+r.IntN(28), 0, 0, 0, 0, time.UTC)
		s.Name = surnames[r.IntN(len(surnames))] + "_" + givenNames[r.IntN(len(givenNames))]
		// EDF+ patient field: code, sex, birthdate, name (Kemp & Olivan 2003).
		s.PatientID = fmt.Sprintf("%s-%04d %s %s %s", code, i+1, s.Sex, edfDate(s.Birth), s.Name)
		s.Focus = cortical(r)
		if r.Float64() >= cfg.ControlShare {
			s.IEDRate = logUni(r, 0.5, 8)
		}
		alpha := uni(r, 8.5, 11)
		nRec := cfg.Recordings
		if nRec <= 0 {
			nRec = 1 + r.IntN(3)
		}
		start := time.Date(2021+r.IntN(4), time.Month(1+r.IntN(12)), 1+r.IntN(28), 8+r.IntN(8), r.IntN(60), 0, 0, time.UTC)
		for j := range nRec {
			st := start.AddDate(0, 0, 7*j+r.IntN(5))
			rec := RecordingSpec{
				ID: fmt.Sprintf("%s_ses-%02d_task-rest_run-01", s.ID, j+1),
				// EDF+ recording field: "Startdate", date, admin code,
				// technician, equipment (Kemp & Olivan 2003).
				RecordingID: fmt.Sprintf("Startdate %s %s-%04d-%02d Tech_Fictional Synth_EEG_19", edfDate(st), code, i+1, j+1),
				Start:       st,
				Config: Config{
					Seed:          r.Uint64(),
					Duration:      cfg.Duration,
					IEDRate:       s.IEDRate,
					LookalikeRate: uni(r, 2, 6),
					AlphaFreq:     alpha,
					Focus:         s.Focus,
					Forward:       cfg.Forward,
				},
			}
			s.Records = append(s.Records, rec)
		}
	}
	return out
}

// centreCode abbreviates a centre name to its initials, "HEU".
func centreCode(name string) string {
	var b strings.Builder
	for _, w := range strings.Fields(name) {
		if c := w[0]; c >= 'A' && c <= 'Z' {
			b.WriteByte(c)
		}
	}
	if b.Len() == 0 {
		return "X"
	}
	return b.String()
}
