package edf

import (
	"reflect"
	"testing"
)

// TestParseTALSpec parses the TAL examples of the EDF+ specification
// (Kemp & Olivan 2003, sections 2.2.2–2.2.4; wording from memory: the
// stored copy found by search showed only the table of contents).
func TestParseTALSpec(t *testing.T) {
	for _, c := range []struct {
		in   string
		want []TAL
	}{
		// 2.2.2: lights off and door closed 3 minutes after the start.
		{"+180\x14Lights off\x14Close door\x14\x00",
			[]TAL{{Onset: 180, Texts: []string{"Lights off", "Close door"}}}},
		// 2.2.2: an apnea of 25.5 s starting 1800.2 s after the start.
		{"+1800.2\x1525.5\x14Apnea\x14\x00",
			[]TAL{{Onset: 1800.2, Duration: 25.5, HasDuration: true, Texts: []string{"Apnea"}}}},
		// 2.2.4: time-keeping annotations, empty text.
		{"+0\x14\x14\x00", []TAL{{Onset: 0, Texts: []string{""}}}},
		{"+567\x14\x14\x00", []TAL{{Onset: 567, Texts: []string{""}}}},
		// Negative onset: an event before the file start (section 2.2.2 allows '-').
		{"-0.065\x14Pre-stimulus\x14\x00", []TAL{{Onset: -0.065, Texts: []string{"Pre-stimulus"}}}},
		// Two TALs back to back, then zero padding (section 2.2.2).
		{"+0\x14\x14\x00+3.5\x14Hypopnea\x14Arousal\x14\x00\x00\x00\x00",
			[]TAL{{Onset: 0, Texts: []string{""}}, {Onset: 3.5, Texts: []string{"Hypopnea", "Arousal"}}}},
		// A TAL with an onset and no annotation at all.
		{"+12\x14\x00", []TAL{{Onset: 12}}},
		{"\x00\x00", nil},
	} {
		got, err := ParseTAL([]byte(c.in))
		if err != nil {
			t.Errorf("%q: %v", c.in, err)
			continue
		}
		if !reflect.DeepEqual(got, c.want) {
			t.Errorf("%q: got %+v, want %+v", c.in, got, c.want)
		}
	}
}

// TestParseTALErrors checks malformed TALs against the grammar of
// Kemp & Olivan (2003), section 2.2.2.
func TestParseTALErrors(t *testing.T) {
	for _, c := range []struct {
		in  string
		off int64
	}{
		{"180\x14x\x14\x00", 0},            // onset without sign
		{"+1e3\x14x\x14\x00", 2},           // exponent notation
		{"+1\x15-2\x14x\x14\x00", 3},       // signed duration
		{"+1\x14x\x00", 4},                 // text not closed by \x14
		{"+1\x14x\x14", 5},                 // TAL not closed by \x00
		{"+1 \x14x\x14\x00", 2},            // space after onset
		{"+0\x14\x14\x00+\x14\x14\x00", 5}, // empty second onset
	} {
		_, err := ParseTAL([]byte(c.in))
		fe := fieldErr(t, err, "annotation")
		if fe.Offset != c.off {
			t.Errorf("%q: error at %d, want %d: %v", c.in, fe.Offset, c.off, err)
		}
	}
}

// TestFormatTAL checks the writer's TALs against the same examples.
func TestFormatTAL(t *testing.T) {
	if got := string(formatTAL(nil, 1800.2, 25.5, true, "Apnea")); got != "+1800.2\x1525.5\x14Apnea\x14\x00" {
		t.Errorf("got %q", got)
	}
	if got := string(formatTAL(nil, 0, 0, false, "")); got != "+0\x14\x14\x00" {
		t.Errorf("got %q", got)
	}
}
