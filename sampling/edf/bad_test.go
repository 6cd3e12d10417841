package edf

import (
	"bytes"
	"strings"
	"testing"
)

// readErr runs NewReader, Segments and Inspect (which reads every
// record's annotations), returning the first error.
func readErr(b []byte) error {
	r, err := NewReader(bytes.NewReader(b), int64(len(b)), "rec01.edf")
	if err != nil {
		return err
	}
	if _, err = r.Segments(); err != nil {
		return err
	}
	_, err = Inspect(bytes.NewReader(b), int64(len(b)), "rec01.edf")
	return err
}

// TestBadInputs checks that each violation of the EDF (Kemp et al. 1992)
// or EDF+ (Kemp & Olivan 2003) specification yields a *FieldError naming
// the file, the field and its byte offset.
func TestBadInputs(t *testing.T) {
	good := writeFile(t, EDFPlusC, testSignals(), 3, nil, nil)
	goodD := writeFile(t, EDFPlusD, testSignals(), 3, []float64{0, 5, 6}, nil)
	goodBDF := writeFile(t, BDF, testSignals()[:1], 2, nil, nil)
	// ns = 4: digital minimum of signal 1 at 256 + 4×(16+80+8+8+8) + 8 = 744.
	const digMin1 = 744
	cases := []struct {
		name   string
		b      []byte
		field  string
		offset int64
	}{
		{"zero-length file", nil, "version", 0},
		{"shorter than fixed header", good[:100], "local recording identification", 100},
		{"shorter than signal headers", good[:700], "number of bytes in header record", 700},
		{"truncated data records", good[:len(good)-10], "number of data records", 236},
		{"header bytes disagree with ns", setField(good, 184, 8, "1024"), "number of bytes in header record", 184},
		{"non-numeric record count", setField(good, 236, 8, "abc"), "number of data records", 236},
		{"non-numeric duration", setField(good, 244, 8, "1s"), "duration of a data record", 244},
		{"non-numeric ns", setField(good, 252, 4, "x"), "number of signals", 252},
		{"exponent in physical minimum", setField(good, 672, 8, "-3e3"), "physical minimum", 672},
		{"digital minimum equals maximum", setField(good, digMin1, 8, "2047"), "digital minimum", digMin1},
		{"digital minimum above maximum", setField(good, digMin1, 8, "3000"), "digital minimum", digMin1},
		{"digital minimum beyond 16 bits", setField(good, digMin1, 8, "-40000"), "digital minimum", digMin1},
		{"zero records", setField(good, 236, 8, "0"), "number of data records", 236},
		{"bad start date", setField(good, 168, 8, "32.01.24"), "startdate of recording", 168},
		{"bad start time", setField(good, 176, 8, "10:11:12"), "starttime of recording", 176},
		{"unknown version", setField(good, 0, 8, "1"), "version", 0},
		{"BDF marker under EDF version", setField(good, 192, 44, "24BIT"), "reserved", 192},
		{"BDF data under EDF version", append(setField(goodBDF[:1], 0, 8, "0"), goodBDF[8:]...), "version", 0},
		{"EDF data under BDF version", append([]byte("\xffBIOSEMI"), writeFile(t, EDF, testSignals()[:1], 2, nil, nil)[8:]...), "version", 0},
		{"non-ASCII digital minimum", setField(good, digMin1, 8, "-2048\xb5"), "digital minimum", digMin1},
		{"non-ASCII start date", setField(good, 168, 8, "05.03.2\xb4"), "startdate of recording", 168},
		{"EDF+D onsets out of order", setTKAL(goodD, 2, "+4"), "time-keeping annotation", tkalOffset(goodD, 2)},
		{"missing time-keeping annotation", setTKAL(good, 1, "+1\x14x"), "time-keeping annotation", tkalOffset(good, 1)},
		{"malformed TAL", setTKAL(good, 1, "1"), "annotation", tkalOffset(good, 1)},
	}
	for _, c := range cases {
		err := readErr(c.b)
		if err == nil {
			t.Errorf("%s: no error", c.name)
			continue
		}
		fe := fieldErr(t, err, c.field)
		if fe.Offset != c.offset {
			t.Errorf("%s: offset %d, want %d (%v)", c.name, fe.Offset, c.offset, err)
		}
		if !strings.HasPrefix(err.Error(), "rec01.edf: ") || !strings.Contains(err.Error(), c.field) {
			t.Errorf("%s: message %q", c.name, err)
		}
	}
}

// TestErrorMessage checks the documented message shape.
func TestErrorMessage(t *testing.T) {
	good := writeFile(t, EDF, testSignals()[:1], 1, nil, nil)
	err := readErr(setField(good, 236, 8, "abc"))
	want := `rec01.edf: header field "number of data records" at byte 236: got "abc     ", want an integer`
	if err == nil || err.Error() != want {
		t.Errorf("got %v\nwant %s", err, want)
	}
}

// tkalOffset is the file offset of the annotation signal (the last of
// testSignals()+1) in record i.
func tkalOffset(b []byte, i int64) int64 {
	rec := int64((256 + 256 + 128 + 100) * 2)
	return 1280 + i*rec + (256+256+128)*2
}

// setTKAL replaces the start of record i's annotation signal by a TAL
// with the given onset part and empty text.
func setTKAL(b []byte, i int64, onset string) []byte {
	c := append([]byte(nil), b...)
	off := tkalOffset(b, i)
	tal := onset + "\x14\x14\x00"
	clear(c[off : off+200])
	copy(c[off:], tal)
	return c
}

// TestWarnings checks tolerated deviations become warnings, not errors.
func TestWarnings(t *testing.T) {
	good := writeFile(t, EDFPlusC, testSignals(), 2, nil, nil)
	r := open(t, append(append([]byte(nil), good...), 1, 2, 3))
	if len(r.Header().Warnings) != 1 || !strings.Contains(r.Header().Warnings[0], "3 bytes") {
		t.Errorf("trailing bytes: %q", r.Header().Warnings)
	}
	r = open(t, setField(good, 236, 8, "-1"))
	if r.NumRecords() != 2 || len(r.Header().Warnings) != 1 {
		t.Errorf("-1 records: %d, %q", r.NumRecords(), r.Header().Warnings)
	}
}

// TestLatin1FreeText checks that a byte outside printable US-ASCII in a
// free-text header field — a Latin-1 micro sign in the physical dimension,
// an accented letter in a label or in the patient's name, NUL padding — is
// read as its ISO/IEC 8859-1 character (control bytes as spaces) with a
// warning naming the field, instead of refusing the recording (Kemp et al.
// 1992 ask for ASCII; many writers do not keep to it).
func TestLatin1FreeText(t *testing.T) {
	good := writeFile(t, EDFPlusC, testSignals(), 3, nil, nil)
	// ns = 4: labels at 256 (16 bytes each), transducers at 320 (80 each),
	// physical dimensions at 640 (8 each)
	b := setField(good, 8, 80, "X X X Zo\xeb")
	b = setField(b, 256, 16, "Fp1\xe9")
	b = setField(b, 640, 8, "\xb5V\x00\x00")
	r, err := NewReader(bytes.NewReader(b), int64(len(b)), "rec01.edf")
	if err != nil {
		t.Fatal(err)
	}
	h := r.Header()
	if h.PatientID != "X X X Zoë" || h.Signals[0].Label != "Fp1é" || h.Signals[0].PhysDim != "µV" {
		t.Errorf("patient %q, label %q, dimension %q", h.PatientID, h.Signals[0].Label, h.Signals[0].PhysDim)
	}
	if k, ok := h.Signals[0].Microvolts(); k != 1 || !ok {
		t.Errorf("µV read as %g, %v", k, ok)
	}
	warned := strings.Join(h.Warnings, "\n")
	for _, f := range []string{"local patient identification", "label of 1 signal", "physical dimension of 1 signal"} {
		if !strings.Contains(warned, f) {
			t.Errorf("no warning for %s in %q", f, warned)
		}
	}
	if err := readErr(b); err != nil {
		t.Errorf("reading the records: %v", err)
	}
}

// TestNULPadding checks that header fields padded with NUL bytes where Kemp
// et al. (1992) ask for spaces — a number, a label — are read as if padded
// with spaces, with a warning; a NUL inside a number still refuses it.
func TestNULPadding(t *testing.T) {
	good := writeFile(t, EDFPlusC, testSignals(), 3, nil, nil)
	// ns = 4: labels at 256, nr of samples of signal 0 at 256 + 4×(16+80+8+8+8+8+8+80) = 1120
	const spr0 = 1120
	nul := func(s string, width int) string { return s + strings.Repeat("\x00", width-len(s)) }
	b := setField(good, 256, 16, nul("Fp1", 16))
	b = setField(b, spr0, 8, nul("256", 8))
	b = setField(b, 236, 8, nul("3", 8))
	r, err := NewReader(bytes.NewReader(b), int64(len(b)), "rec01.edf")
	if err != nil {
		t.Fatal(err)
	}
	h := r.Header()
	if h.Signals[0].Label != "Fp1" || h.Signals[0].SamplesPerRecord != 256 || h.NumRecords != 3 {
		t.Errorf("label %q, samples per record %d, records %d", h.Signals[0].Label, h.Signals[0].SamplesPerRecord, h.NumRecords)
	}
	if !strings.Contains(strings.Join(h.Warnings, "\n"), "NUL") {
		t.Errorf("no warning: %q", h.Warnings)
	}
	bad := setField(good, spr0, 8, "25\x006")
	if err := readErr(bad); err == nil {
		t.Errorf("a NUL inside a number was accepted")
	} else {
		fieldErr(t, err, "nr of samples in each data record")
	}
}
