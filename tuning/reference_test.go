package tuning

import (
	"errors"
	"os"
	"path/filepath"
	"reflect"
	"testing"
)

func writeCSV(t *testing.T, body string) string {
	t.Helper()
	p := filepath.Join(t.TempDir(), "ref.csv")
	if err := os.WriteFile(p, []byte(body), 0o644); err != nil {
		t.Fatal(err)
	}
	return p
}

var refEvents = []string{"e1", "e2", "e3"}
var refSubjects = map[string]string{"e1": "s1", "e2": "s1", "e3": "s2"}

func TestReadExternalReference(t *testing.T) {
	got, err := ReadExternalReference(writeCSV(t, "event_id,reference\ne1,1\ne2,not-ied\ne3,TRUE\n"), refEvents, refSubjects)
	if err != nil {
		t.Fatal(err)
	}
	if want := map[string]int8{"e1": 1, "e2": 0, "e3": 1}; !reflect.DeepEqual(got, want) {
		t.Errorf("got %v, want %v", got, want)
	}
	got, err = ReadExternalReference(writeCSV(t, "subject_key,reference\ns1,ied\ns2,0\n"), refEvents, refSubjects)
	if err != nil {
		t.Fatal(err)
	}
	if want := map[string]int8{"e1": 1, "e2": 1, "e3": 0}; !reflect.DeepEqual(got, want) {
		t.Errorf("subjects: got %v, want %v", got, want)
	}
}

func TestReadExternalReferenceErrors(t *testing.T) {
	_, err := ReadExternalReference(writeCSV(t, "event_id,reference\ne1,1\nx9,0\ne3,1\nx1,1\n"), refEvents, refSubjects)
	var ue *unknownIDsError
	if !errors.As(err, &ue) || !reflect.DeepEqual(ue.IDs, []string{"x1", "x9"}) || ue.Column != "event_id" {
		t.Errorf("unknown ids: %v", err)
	}
	_, err = ReadExternalReference(writeCSV(t, "subject_key,reference\ns7,1\n"), refEvents, refSubjects)
	if !errors.As(err, &ue) || ue.Column != "subject_key" {
		t.Errorf("unknown subject: %v", err)
	}
	var re *ReferenceError
	_, err = ReadExternalReference(writeCSV(t, "event_id,reference\ne1,1\ne2,maybe\n"), refEvents, refSubjects)
	if !errors.As(err, &re) || re.Row != 3 || re.Field != "reference" {
		t.Errorf("bad value: %v", err)
	}
	_, err = ReadExternalReference(writeCSV(t, "id,reference\n"), refEvents, refSubjects)
	if !errors.As(err, &re) || re.Row != 1 {
		t.Errorf("bad header: %v", err)
	}
	_, err = ReadExternalReference(writeCSV(t, "event_id,reference\ne1,1,extra\n"), refEvents, refSubjects)
	if !errors.As(err, &re) || re.Row != 2 {
		t.Errorf("ragged row: %v", err)
	}
}

func TestReferenceMaps(t *testing.T) {
	// The verdict column's words (consensus.VerdictString), and the present/absent of
	// consensus tables written by an older release; Bayes rule at ½ (Dawid & Skene 1979).
	for v, want := range map[string]int8{"epileptiform": 1, "not-epileptiform": 0, "present": 1, "absent": 0,
		"undetermined": -1, "no-quorum": -1, "cannot-judge": -1, "": -1} {
		if got := ReferenceFromPanel(v); got != want {
			t.Errorf("ReferenceFromPanel(%q) = %d, want %d", v, got, want)
		}
	}
	for p, want := range map[float64]int8{0.9: 1, 0.5: -1, 0.1: 0} {
		if got := ReferenceFromDS(p); got != want {
			t.Errorf("ReferenceFromDS(%v) = %d, want %d", p, got, want)
		}
	}
}
