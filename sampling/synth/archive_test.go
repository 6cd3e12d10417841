package synth

import (
	"bytes"
	"encoding/csv"
	"reflect"
	"regexp"
	"strconv"
	"testing"
)

// EDF+ local patient and recording identification fields (Kemp & Olivan
// 2003, "European data format 'plus' (EDF+)", Clin Neurophysiol
// 114:1755–1761, section 2.1.3): space-separated subfields, dates as
// dd-MMM-yyyy, no spaces inside subfields, at most 80 characters.
var (
	edfPatient   = regexp.MustCompile(`^\S+ [FMX] \d{2}-(JAN|FEB|MAR|APR|MAY|JUN|JUL|AUG|SEP|OCT|NOV|DEC)-\d{4} \S+$`)
	edfRecording = regexp.MustCompile(`^Startdate \d{2}-(JAN|FEB|MAR|APR|MAY|JUN|JUL|AUG|SEP|OCT|NOV|DEC)-\d{4} \S+ \S+ \S+$`)
)

func TestArchive(t *testing.T) {
	cfg := ArchiveConfig{Seed: 4, Subjects: 12, Forward: standInForward}
	a, b := Archive(cfg), Archive(cfg)
	if !reflect.DeepEqual(stripForward(a), stripForward(b)) {
		t.Fatal("same seed, different archive")
	}
	cfg.Seed++
	if reflect.DeepEqual(stripForward(a), stripForward(Archive(cfg))) {
		t.Fatal("different seeds, same archive")
	}
	seeds := map[uint64]bool{}
	controls := 0
	for i, s := range a {
		if want := "sub-" + leftPad(i+1); s.ID != want {
			t.Errorf("subject %d id %q, want %q", i, s.ID, want)
		}
		if !edfPatient.MatchString(s.PatientID) || len(s.PatientID) > 80 {
			t.Errorf("patient field %q not EDF+", s.PatientID)
		}
		if s.IEDRate == 0 {
			controls++
		}
		if len(s.Records) == 0 {
			t.Errorf("%s has no recordings", s.ID)
		}
		for _, r := range s.Records {
			if !edfRecording.MatchString(r.RecordingID) || len(r.RecordingID) > 80 {
				t.Errorf("recording field %q not EDF+", r.RecordingID)
			}
			if r.Config.Focus != s.Focus || r.Config.IEDRate != s.IEDRate || r.Config.Forward == nil {
				t.Errorf("%s does not carry its subject's parameters", r.ID)
			}
			if seeds[r.Config.Seed] {
				t.Errorf("%s reuses a seed", r.ID)
			}
			seeds[r.Config.Seed] = true
		}
	}
	if controls == 0 || controls == len(a) {
		t.Errorf("%d controls among %d subjects", controls, len(a))
	}
	if _, err := Generate(withDuration(a[0].Records[0].Config, 10)); err != nil {
		t.Fatal(err)
	}
}

func withDuration(c Config, d float64) Config { c.Duration = d; return c }

func leftPad(i int) string {
	s := strconv.Itoa(i)
	for len(s) < 3 {
		s = "0" + s
	}
	return s
}

func stripForward(ss []Subject) []Subject {
	out := make([]Subject, len(ss))
	for i, s := range ss {
		out[i] = s
		out[i].Records = append([]RecordingSpec(nil), s.Records...)
		for j := range out[i].Records {
			out[i].Records[j].Config.Forward = nil
		}
	}
	return out
}

// The truth CSV must parse as RFC 4180 and carry every event.
func TestTruthCSV(t *testing.T) {
	g, err := NewGenerator(Config{Seed: 8, Duration: 60, IEDRate: 10, LookalikeRate: 10, Forward: standInForward})
	if err != nil {
		t.Fatal(err)
	}
	var buf bytes.Buffer
	truth := g.Truth()
	if err := WriteTruthCSV(&buf, truth); err != nil {
		t.Fatal(err)
	}
	rows, err := csv.NewReader(&buf).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if len(rows) != len(truth)+1 || !reflect.DeepEqual(rows[0], TruthHeader) {
		t.Fatalf("%d rows for %d events", len(rows), len(truth))
	}
	for i, e := range truth {
		r := rows[i+1]
		onset, _ := strconv.ParseFloat(r[3], 64)
		met := 0
		for _, v := range r[8:14] {
			if v == "1" {
				met++
			}
		}
		if r[0] != e.ID || r[1] != e.Kind || r[6] != e.PeakElectrode || onset != e.Onset || met != e.MetCount() {
			t.Errorf("row %d %v does not match %+v", i+1, r, e)
		}
	}
}
