package returns

import (
	"bytes"
	"strings"
	"testing"
)

// accepted checks the invariants of any accepted return: it names a packet
// of the manifest, that packet's rater and check value, and only its items;
// and the same bytes with the check value altered are refused.
func accepted(t *testing.T, data []byte, r *Return) {
	e, ok := fixture.m.Lookup(r.Packet)
	if !ok || r.Check != e.Check || r.Rater != e.Rater {
		t.Fatalf("accepted packet %q check %q rater %q", r.Packet, r.Check, r.Rater)
	}
	items := map[string]bool{}
	for _, c := range e.Items {
		items[c] = true
	}
	for _, a := range r.Answers {
		if !items[a.Item] {
			t.Fatalf("accepted foreign item %q", a.Item)
		}
	}
	forged := bytes.ReplaceAll(data, []byte(e.Check), []byte(strings.Repeat("0", 32)))
	if _, err := Parse("forged", forged, fixture.m); err == nil {
		t.Fatalf("accepted with a wrong check value:\n%s", forged)
	}
}

func FuzzParseJSON(f *testing.F) {
	f.Add(encode(f, validJSON()))
	m := validJSON()
	m["check"] = strings.Repeat("a", 32)
	f.Add(encode(f, m))
	f.Add([]byte(`{"format":"quorate-return","version":1,"answers":[{"item":null}]}`))
	f.Add([]byte(`{"answers":[1,"x",{}],"version":1e400}`))
	f.Fuzz(func(t *testing.T, data []byte) {
		if len(data) > 0 && data[0] != '{' {
			data = append([]byte{'{'}, data...)
		}
		r, err := Parse("f.json", data, fixture.m)
		if err == nil {
			accepted(t, data, r)
		}
	})
}

func FuzzParseCSV(f *testing.F) {
	f.Add(fixture.sheet)
	f.Add(fillSheet(f, map[int]map[string]string{0: full("c1", "a"), 1: {"verdict": "n"}}, []string{"item", "packet", "check", "rater", "c1", "c2", "c3", "c4", "c5", "c6", "verdict"}))
	f.Add([]byte("packet,check\r\n\"a\"\"b,c\r\n"))
	f.Add([]byte("\xef\xbb\xbfitem\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		r, err := Parse("f.csv", data, fixture.m)
		if err == nil {
			accepted(t, data, r)
		}
	})
}
