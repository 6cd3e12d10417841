package edf

import (
	"bytes"
	"testing"
)

// FuzzReadHeader feeds arbitrary bytes to ReadHeader and, when the header
// parses, to NewReader, Segments and Inspect: none may panic, and every
// error from a malformed file must be a *FieldError.
func FuzzReadHeader(f *testing.F) {
	f.Add(writeFile(f, EDFPlusC, testSignals()[:1], 1, nil, map[int64][]Annotation{0: {{Onset: 0.5, Text: "x"}}}))
	f.Add(writeFile(f, EDFPlusD, testSignals()[:1], 2, []float64{0, 3}, nil))
	f.Add(writeFile(f, BDF, testSignals()[:1], 1, nil, nil))
	f.Add([]byte{})
	f.Fuzz(func(t *testing.T, b []byte) {
		if len(b) > 1<<16 {
			return
		}
		if _, err := ReadHeader(bytes.NewReader(b), "f.edf"); err != nil {
			var fe *FieldError
			if !asFieldError(err, &fe) {
				t.Fatalf("not a FieldError: %v", err)
			}
			return
		}
		r, err := NewReader(bytes.NewReader(b), int64(len(b)), "f.edf")
		if err != nil {
			return
		}
		if r.RecordBytes() > 1<<16 {
			return
		}
		r.Segments()
		Inspect(bytes.NewReader(b), int64(len(b)), "f.edf")
	})
}

// FuzzParseTAL checks ParseTAL never panics and that what it accepts
// survives formatting and parsing again.
func FuzzParseTAL(f *testing.F) {
	for _, s := range []string{
		"+0\x14\x14\x00",
		"+180\x14Lights off\x14Close door\x14\x00",
		"+1800.2\x1525.5\x14Apnea\x14\x00",
		"+0\x14\x14\x00+3.5\x14Hypopnea\x14Arousal\x14\x00\x00\x00",
		"-0.065\x14x\x14\x00",
	} {
		f.Add([]byte(s))
	}
	f.Fuzz(func(t *testing.T, b []byte) {
		tals, err := ParseTAL(b)
		if err != nil {
			return
		}
		var out []byte
		for _, tl := range tals {
			out = formatTAL(out, tl.Onset, tl.Duration, tl.HasDuration, tl.Texts...)
		}
		again, err := ParseTAL(out)
		if err != nil || len(again) != len(tals) {
			t.Fatalf("reparse of %q: %v", out, err)
		}
		for i := range tals {
			if again[i].Onset != tals[i].Onset || again[i].Duration != tals[i].Duration || len(again[i].Texts) != len(tals[i].Texts) {
				t.Fatalf("TAL %d: %+v became %+v", i, tals[i], again[i])
			}
		}
	})
}
