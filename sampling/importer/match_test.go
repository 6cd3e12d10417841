package importer

import (
	"strings"
	"testing"
)

// TestFind checks the documented order: recording_id, archive-relative path, file name
// (any case), file name without extension; ambiguity is refused.
func TestFind(t *testing.T) {
	rs := newResolver(testRecordings())
	for _, c := range []struct {
		key  string
		want int    // -1 when refused
		why  string // part of the refusal
	}{
		{"rec-cccc", 2, ""},
		{"ward2/pt02.edf", 2, ""},
		{`.\ward1\pt02.edf`, 1, ""},
		{"PT01_NIGHT.EDF", 0, ""},
		{`C:\exports\pt01_night.edf`, 0, ""},
		{"pt01_night", 0, ""},
		{"pt02.edf", -1, "rec-bbbb, rec-cccc"},
		{"pt02", -1, "by file name without extension"},
		{"pt03.edf", -1, "indexed recording"},
		{"", -1, "empty"},
	} {
		got, why := rs.find(c.key)
		if got != c.want || (c.want < 0 && !strings.Contains(why, c.why)) {
			t.Errorf("%q: %d %q, want %d %q", c.key, got, why, c.want, c.why)
		}
	}
}
