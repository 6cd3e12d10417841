package edf

import (
	"bytes"
	"strings"
	"testing"
	"time"
)

// TestHeaderLayout checks every field's byte offset and width against the
// EDF specification (Kemp et al. 1992, header record table: 8 ascii
// version, 80 patient, 80 recording, 8 startdate, 8 starttime, 8 header
// bytes, 44 reserved, 8 records, 8 duration, 4 ns, then ns×16 label, ns×80
// transducer, ns×8 dimension, ns×8 physical min, ns×8 physical max, ns×8
// digital min, ns×8 digital max, ns×80 prefiltering, ns×8 samples, ns×32
// reserved). Offsets below are summed by hand from that table for ns = 4.
func TestHeaderLayout(t *testing.T) {
	b := writeFile(t, EDFPlusC, testSignals(), 2, nil, nil)
	field := func(off, width int) string { return string(b[off : off+width]) }
	pad := func(s string, w int) string { return s + strings.Repeat(" ", w-len(s)) }
	checks := []struct {
		name       string
		off, width int
		want       string
	}{
		{"version", 0, 8, pad("0", 8)},
		{"patient", 8, 80, pad("MCH-0234567 F 02-MAY-1951 Haagse_Harry", 80)},
		{"recording", 88, 80, pad("Startdate 05-MAR-2024 X X X", 80)},
		{"startdate", 168, 8, "05.03.24"},
		{"starttime", 176, 8, "10.11.12"},
		{"header bytes", 184, 8, pad("1280", 8)}, // 256×(4+1)
		{"reserved", 192, 44, pad("EDF+C", 44)},
		{"records", 236, 8, pad("2", 8)},
		{"duration", 244, 8, pad("1", 8)},
		{"ns", 252, 4, pad("4", 4)},
		{"label 0", 256, 16, pad("EEG Fp1-REF", 16)},
		{"label 3", 256 + 3*16, 16, pad("EDF Annotations", 16)},
		{"transducer 0", 320, 80, pad("", 80)},        // 256 + 4×16
		{"dimension 0", 640, 8, pad("uV", 8)},         // 320 + 4×80
		{"dimension 2", 656, 8, pad("mV", 8)},         //
		{"physical min 0", 672, 8, "-3276.8 "},        // 640 + 4×8
		{"physical max 1", 704 + 8, 8, pad("500", 8)}, // 672 + 4×8 = 704
		{"digital min 1", 736 + 8, 8, pad("-2048", 8)},
		{"digital max 2", 768 + 16, 8, pad("32767", 8)},
		{"prefiltering 0", 800, 80, pad("HP:0.5Hz LP:70Hz", 80)}, // 768 + 4×8
		{"samples 0", 1120, 8, pad("256", 8)},                    // 800 + 4×80
		{"samples 2", 1136, 8, pad("128", 8)},
		{"reserved 0", 1152, 32, pad("", 32)}, // 1120 + 4×8; ends at 1152 + 4×32 = 1280
	}
	for _, c := range checks {
		if got := field(c.off, c.width); got != c.want {
			t.Errorf("%s at %d: got %q, want %q", c.name, c.off, got, c.want)
		}
	}
	// Data: 2 records × (256+256+128+100) samples × 2 bytes after 1280 header bytes.
	if len(b) != 1280+2*(256+256+128+100)*2 {
		t.Errorf("file size %d", len(b))
	}
	h, err := ReadHeader(bytes.NewReader(b), "t.edf")
	if err != nil {
		t.Fatal(err)
	}
	if h.Format != EDFPlusC || h.NumRecords != 2 || h.RecordDuration != 1 || len(h.Signals) != 4 || h.HeaderBytes != 1280 {
		t.Errorf("header %+v", h)
	}
	if s := h.Signals[1]; s.Name != "T7" || s.Kind != EEG || s.DigMin != -2048 || s.PhysMax != 500 {
		t.Errorf("signal 1 %+v", s)
	}
	if want := time.Date(2024, 3, 5, 10, 11, 12, 0, time.UTC); !h.Start.Equal(want) {
		t.Errorf("start %v, want %v", h.Start, want)
	}
}

// setField overwrites a header field with s padded by spaces.
func setField(b []byte, off, width int, s string) []byte {
	c := append([]byte(nil), b...)
	copy(c[off:off+width], s+strings.Repeat(" ", width-len(s)))
	return c
}

// TestStartYear checks the two-digit year rule of Kemp & Olivan (2003),
// section 2.1.3.2: 85–99 are 1985–1999, 00–84 are 2000–2084, and "yy"
// defers to the recording identification's "Startdate dd-MMM-yyyy".
func TestStartYear(t *testing.T) {
	edf := writeFile(t, EDF, testSignals()[:1], 1, nil, nil)
	plus := writeFile(t, EDFPlusC, testSignals()[:1], 1, nil, nil)
	for _, c := range []struct {
		base      []byte
		date, rec string
		want      int
	}{
		{edf, "01.01.85", "", 1985},
		{edf, "31.12.99", "", 1999},
		{edf, "01.01.00", "", 2000},
		{edf, "01.01.84", "", 2084},
		{plus, "02.03.yy", "Startdate 02-MAR-2090 X X X", 2090},
		{plus, "02.03.02", "Startdate 02-MAR-2002 X X X", 2002},
	} {
		b := setField(c.base, 168, 8, c.date)
		if c.rec != "" {
			b = setField(b, 88, 80, c.rec)
		}
		h, err := ReadHeader(bytes.NewReader(b), "y.edf")
		if err != nil {
			t.Errorf("%s: %v", c.date, err)
			continue
		}
		if h.Start.Year() != c.want {
			t.Errorf("%s %q: year %d, want %d", c.date, c.rec, h.Start.Year(), c.want)
		}
	}
}

// TestFormats checks the version and reserved-field markers: EDF "0",
// EDF+ "EDF+C"/"EDF+D" (Kemp & Olivan 2003, section 2.1.1), BDF 0xFF
// "BIOSEMI" with "24BIT" and BDF+ "BDF+C"/"BDF+D" (BDF format description).
func TestFormats(t *testing.T) {
	for _, f := range []Format{EDF, EDFPlusC, EDFPlusD, BDF, BDFPlusC, BDFPlusD} {
		var onsets []float64
		if f.IsDiscontinuous() {
			onsets = []float64{0}
		}
		b := writeFile(t, f, testSignals()[:1], 1, onsets, nil)
		wantV := "0       "
		if f.Is24Bit() {
			wantV = "\xffBIOSEMI"
		}
		if string(b[:8]) != wantV {
			t.Errorf("%v: version %q", f, b[:8])
		}
		wantR := map[Format]string{EDF: "", EDFPlusC: "EDF+C", EDFPlusD: "EDF+D", BDF: "24BIT", BDFPlusC: "BDF+C", BDFPlusD: "BDF+D"}[f]
		if got := strings.TrimSpace(string(b[192:236])); got != wantR {
			t.Errorf("%v: reserved %q, want %q", f, got, wantR)
		}
		r := open(t, b)
		if r.Header().Format != f || f.String() == "" {
			t.Errorf("read back %v, want %v", r.Header().Format, f)
		}
	}
}
