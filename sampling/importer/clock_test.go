package importer

import (
	"strings"
	"testing"
	"time"

	"github.com/quorate-eeg/quorate/sampling/archive"
)

// TestClockOffset resolves clock times against a start, including times after
// midnight, a year end and a leap day; expected seconds from Python's datetime
// (testdata/clock_ref.py).
func TestClockOffset(t *testing.T) {
	for _, c := range []struct {
		start, value string
		want         float64
	}{
		{"2024-03-01T22:30:00", "22:45:10.250", 910.25},
		{"2024-03-01T22:30:00", "01:15:00", 9900.0},
		{"2024-03-01T22:30:00.500", "23:59:59.999", 5399.499},
		{"2024-03-01T22:30:00", "2024-03-02T00:00:01Z", 5401.0},
		{"2024-03-01T22:30:00", "2024-03-02T00:00:01+01:00", 5401.0},
		{"2024-12-31T23:00:00", "00:30:00", 5400.0},
		{"2024-02-28T23:59:00", "2024-02-29 00:01:00", 120.0},
		{"2024-03-01T22:30:00", "22:29:59", 86399.0},
		{"2024-03-01T00:00:00", "7:05:03.000001", 25503.000001},
	} {
		start, err := time.Parse("2006-01-02T15:04:05.999999999", c.start)
		if err != nil {
			t.Fatal(err)
		}
		v, ok := parseClock(c.value)
		if !ok {
			t.Errorf("%q: not parsed", c.value)
			continue
		}
		if got := v.offset(start); !near(got, c.want, 1e-9) {
			t.Errorf("%s from %s: %.9f s, want %.9f", c.value, c.start, got, c.want)
		}
	}
}

// TestParseClockRFC3339 reads the date-time examples of RFC 3339, section 5.8, as the
// wall clock written.
func TestParseClockRFC3339(t *testing.T) {
	for _, c := range []struct {
		in   string
		want time.Time
	}{
		{"1985-04-12T23:20:50.52Z", time.Date(1985, 4, 12, 23, 20, 50, 520e6, time.UTC)},
		{"1996-12-19T16:39:57-08:00", time.Date(1996, 12, 19, 16, 39, 57, 0, time.UTC)},
		{"1937-01-01T12:00:27.87+00:20", time.Date(1937, 1, 1, 12, 0, 27, 870e6, time.UTC)},
	} {
		v, ok := parseClock(c.in)
		if !ok || !v.dated || !v.at.Equal(c.want) {
			t.Errorf("%s: %v %v, want %v", c.in, v.at, ok, c.want)
		}
	}
	// RFC 3339 section 5.8 also shows the leap second 1990-12-31T23:59:60Z; an EDF clock
	// has no leap seconds, so it is refused rather than folded into the next minute.
	for _, bad := range []string{"1990-12-31T23:59:60Z", "24:00:00", "12:60:00", "12:00:60", "1:2:3", "12:00",
		"12:00:00.", "12:00:00.1234567890", "-1:00:00", "+1:00:00", "12:00:00.-5", "2024-13-01T00:00:00", "noon"} {
		if _, ok := parseClock(bad); ok {
			t.Errorf("%q parsed", bad)
		}
	}
}

// TestPlaceMidnight checks clock onsets in a recording from 22:30 to 06:30 the next day.
func TestPlaceMidnight(t *testing.T) {
	rs := newResolver(testRecordings())
	for _, c := range []struct {
		clock string
		want  float64 // -1: rejected
	}{
		{"23:00:00", 1800},
		{"00:00:00", 5400},
		{"06:30:00", 28800},  // the last instant
		{"06:30:00.5", -1},   // past the end
		{"22:29:59.999", -1}, // just before the start: would be the next evening
		{"2024-03-02T03:00:00", 16200},
		{"2024-03-01T22:00:00", -1}, // dated, before the start
	} {
		ev := event{file: "f.csv", line: 2, rec: 0, onsetField: "time", onset: c.clock, format: OnsetAuto}
		p, rej := place(ev, rs)
		switch {
		case c.want < 0 && rej == nil:
			t.Errorf("%s: placed at %g s, want rejection", c.clock, p.onset)
		case c.want < 0:
			if !strings.Contains(rej.Want, "22:30:00.000 to 06:30:00.000 (+1 day)") {
				t.Errorf("%s: rejection %q does not state the span", c.clock, rej.Want)
			}
		case rej != nil:
			t.Errorf("%s: rejected: %v", c.clock, rej)
		case !near(p.onset, c.want, 1e-9):
			t.Errorf("%s: %g s, want %g", c.clock, p.onset, c.want)
		}
	}
	// A recording within one day states its span without a day mark.
	short := []archive.Recording{{RecordingID: "rec-x", StartTime: time.Date(2024, 3, 1, 9, 0, 0, 0, time.UTC), DurationS: 60}}
	_, rej := place(event{file: "f", line: 3, rec: 0, onsetField: "t", onset: "09:02:00", format: OnsetClock}, newResolver(short))
	if rej == nil || !strings.Contains(rej.Want, "09:00:00.000 to 09:01:00.000,") {
		t.Errorf("short recording: %v", rej)
	}
}
