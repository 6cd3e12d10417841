package tuning

import (
	"errors"
	"strings"
	"testing"
)

// A table saved with semicolons (common in locales with a decimal comma) once gave a
// problem per row and no word on why; the header refusal names the separator.
func TestExternalReferenceSemicolonHint(t *testing.T) {
	_, err := ReadExternalReference(writeCSV(t, "event_id;reference\ne1;1\ne2;0\n"), refEvents, refSubjects)
	var re *ReferenceError
	if !errors.As(err, &re) || re.Row != 1 || !strings.Contains(err.Error(), "semicolons") {
		t.Errorf("semicolon table: %v, want a header refusal naming semicolons", err)
	}
}

// FuzzReadExternalReference: any bytes give a table or an error naming the file.
func FuzzReadExternalReference(f *testing.F) {
	f.Add("event_id,reference\ne1,1\ne2,not-ied\n")
	f.Add("subject_key,reference\ns1,ied\n")
	f.Add("event_id;reference\ne1;1\n")
	f.Add("\ufeffevent_id,reference\n\"e1\",\"1\"\n")
	f.Fuzz(func(t *testing.T, body string) {
		p := writeCSV(t, body)
		got, err := ReadExternalReference(p, refEvents, refSubjects)
		if err != nil {
			if got != nil {
				t.Error("values beside an error")
			}
			if !strings.Contains(err.Error(), p) {
				t.Errorf("error %q does not name the file", err)
			}
			return
		}
		for id, v := range got {
			if v < -1 || v > 1 || refSubjects[id] == "" {
				t.Errorf("event %q reference %d", id, v)
			}
		}
	})
}
