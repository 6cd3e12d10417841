package edf

import (
	"strings"
	"testing"
	"time"
)

// TestQuantise checks rounding to the nearest digital step and clipping to
// [DigMin, DigMax], by inverting phys = (dig − DigMin)·gain + PhysMin
// (Kemp et al. 1992) with gain = 200/200 = 1 on digital [−100, 100].
func TestQuantise(t *testing.T) {
	sig := []Signal{{Label: "Cz", PhysMin: -100, PhysMax: 100, DigMin: -100, DigMax: 100, SamplesPerRecord: 6}}
	var buf bytesBuffer
	w, err := NewWriter(&buf, WriterHeader{Format: EDF, Start: fixedStart, RecordDuration: 1, NumRecords: 1, Signals: sig})
	if err != nil {
		t.Fatal(err)
	}
	if err := w.WriteRecord([][]float32{{0.49, 0.51, -0.51, 250, -250, 99.6}}); err != nil {
		t.Fatal(err)
	}
	if err := w.Close(); err != nil {
		t.Fatal(err)
	}
	raw := [][]int32{make([]int32, 6)}
	if err := open(t, buf.b).ReadRecordRaw(0, raw); err != nil {
		t.Fatal(err)
	}
	want := []int32{0, 1, -1, 100, -100, 100}
	for k := range want {
		if raw[0][k] != want[k] {
			t.Errorf("sample %d: %d, want %d", k, raw[0][k], want[k])
		}
	}
}

// TestWriterRejects checks the writer refuses what the specification
// cannot express.
func TestWriterRejects(t *testing.T) {
	sigs := testSignals()[:1]
	var buf bytesBuffer
	// 1/3 s has no exact 8-character decimal (Kemp et al. 1992: duration in seconds, 8 ascii).
	if _, err := NewWriter(&buf, WriterHeader{Format: EDFPlusC, Start: fixedStart, RecordDuration: 1.0 / 3, NumRecords: 1, Signals: sigs}); err == nil {
		t.Error("accepted a record duration of 1/3 s")
	}
	if _, err := NewWriter(&buf, WriterHeader{Format: EDF, Start: time.Date(2090, 1, 1, 0, 0, 0, 0, time.UTC), RecordDuration: 1, NumRecords: 1, Signals: sigs}); err == nil {
		t.Error("accepted year 2090 in plain EDF (dd.mm.yy covers 1985–2084)")
	}
	w, err := NewWriter(&buf, WriterHeader{Format: EDFPlusD, Start: fixedStart, RecordDuration: 1, NumRecords: 2, Signals: sigs})
	if err != nil {
		t.Fatal(err)
	}
	x := [][]float32{make([]float32, 256)}
	if err := w.WriteRecordAt(5, x); err != nil {
		t.Fatal(err)
	}
	if err := w.WriteRecordAt(5.5, x); err == nil {
		t.Error("accepted overlapping records")
	}
	if err := w.WriteRecordAt(7, x, Annotation{Onset: 7, Text: strings.Repeat("long ", 50)}); err == nil {
		t.Error("accepted TALs larger than AnnotationBytes")
	}
	if err := w.Close(); err == nil {
		t.Error("Close accepted 1 record of 2 announced")
	}
}

// TestSubsecondStart checks the sub-second start is carried by the first
// time-keeping annotation (Kemp & Olivan 2003, section 2.2.4) and comes
// back as the first segment's start.
func TestSubsecondStart(t *testing.T) {
	var buf bytesBuffer
	w, err := NewWriter(&buf, WriterHeader{Format: EDFPlusC, Start: fixedStart.Add(250 * time.Millisecond), RecordDuration: 1, NumRecords: 2, Signals: testSignals()[:1]})
	if err != nil {
		t.Fatal(err)
	}
	for i := 0; i < 2; i++ {
		if err := w.WriteRecord([][]float32{make([]float32, 256)}); err != nil {
			t.Fatal(err)
		}
	}
	w.Close()
	r := open(t, buf.b)
	// Header 256×(2+1) bytes, then 256 two-byte samples of signal 0.
	if got := string(buf.b[768+512 : 768+512+7]); got != "+0.25\x14\x14" {
		t.Errorf("first TAL %q", got)
	}
	segs, err := r.Segments()
	if err != nil || len(segs) != 1 || segs[0].Start != 0.25 || !r.Header().Start.Equal(fixedStart) {
		t.Errorf("segments %+v %v, start %v", segs, err, r.Header().Start)
	}
}

// TestFlatWarning checks equal physical limits are reported, not fatal.
func TestFlatWarning(t *testing.T) {
	b := writeFile(t, EDF, testSignals()[:1], 1, nil, nil)
	b = setField(b, 256+16+80+8+8, 8, "-3276.8") // physical maximum of signal 0 = minimum
	r := open(t, b)
	if w := r.Header().Warnings; len(w) != 1 || !strings.Contains(w[0], "physical minimum equals maximum") {
		t.Errorf("warnings %q", w)
	}
}
