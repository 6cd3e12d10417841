package edf

import (
	"math"
	"testing"
)

// roundTrip writes wave samples, reads them back and checks each within
// one digital step (the quantisation bound of Kemp et al. 1992's linear
// mapping: rounding moves a value by at most half a step).
func roundTrip(t *testing.T, f Format, sigs []Signal) {
	const nrec = 3
	b := writeFile(t, f, sigs, nrec, nil, map[int64][]Annotation{1: {{Onset: 1.25, Text: "spike"}, {Onset: 1.5, Duration: 0.2, HasDuration: true, Text: "sharp wave"}}})
	r := open(t, b)
	h := r.Header()
	if h.Format != f || r.NumRecords() != nrec {
		t.Fatalf("%v: read %v with %d records", f, h.Format, r.NumRecords())
	}
	dst := make([][]float32, len(h.Signals))
	for j := range sigs {
		dst[j] = make([]float32, sigs[j].SamplesPerRecord)
	}
	for i := int64(0); i < nrec; i++ {
		if err := r.ReadRecord(i, dst); err != nil {
			t.Fatal(err)
		}
		for j, s := range h.Signals[:len(sigs)] {
			step := math.Abs(s.Gain())
			for k, got := range dst[j] {
				want := wave(j, i, k, s.SamplesPerRecord, sigs[j].PhysMin, sigs[j].PhysMax)
				// float32 storage adds a relative 2^-24 on top of the step.
				if d := math.Abs(float64(got - want)); d > step+1e-6*math.Abs(float64(want)) {
					t.Fatalf("%v record %d signal %d sample %d: %v, want %v (step %v)", f, i, j, k, got, want, step)
				}
			}
		}
	}
	anns, err := r.Annotations(1)
	if err != nil {
		t.Fatal(err)
	}
	want := []Annotation{{Onset: 1.25, Text: "spike", Record: 1}, {Onset: 1.5, Duration: 0.2, HasDuration: true, Text: "sharp wave", Record: 1}}
	if len(anns) != 2 || anns[0] != want[0] || anns[1] != want[1] {
		t.Errorf("%v annotations %+v", f, anns)
	}
	n := 0
	for a, err := range r.AllAnnotations() {
		if err != nil {
			t.Fatal(err)
		}
		if a != want[n] {
			t.Errorf("iterator %d: %+v", n, a)
		}
		n++
	}
	if n != 2 {
		t.Errorf("iterator gave %d annotations", n)
	}
	segs, err := r.Segments()
	if err != nil || len(segs) != 1 || segs[0] != (Segment{Start: 0, Duration: nrec, FirstRecord: 0, Records: nrec}) {
		t.Errorf("segments %+v, %v", segs, err)
	}
}

func TestRoundTripEDFPlus(t *testing.T) { roundTrip(t, EDFPlusC, testSignals()) }

func TestRoundTripBDFPlus(t *testing.T) {
	sigs := testSignals()
	for i := range sigs {
		sigs[i].DigMin, sigs[i].DigMax = 0, 0 // full 24-bit range
	}
	roundTrip(t, BDFPlusC, sigs)
}

// TestRoundTripBDFExact checks 24-bit storage keeps integers exactly: with
// gain 1 (physical range = digital range) every value is representable.
func TestRoundTripBDFExact(t *testing.T) {
	sig := []Signal{{Label: "Cz", PhysMin: -8388608, PhysMax: 8388607, DigMin: -8388608, DigMax: 8388607, SamplesPerRecord: 4}}
	var buf bytesBuffer
	w, err := NewWriter(&buf, WriterHeader{Format: BDF, Start: fixedStart, RecordDuration: 1, NumRecords: 1, Signals: sig})
	if err != nil {
		t.Fatal(err)
	}
	in := []float32{-8388608, 8388607, -1, 123456}
	if err := w.WriteRecord([][]float32{in}); err != nil {
		t.Fatal(err)
	}
	if err := w.Close(); err != nil {
		t.Fatal(err)
	}
	r := open(t, buf.b)
	raw := [][]int32{make([]int32, 4)}
	if err := r.ReadRecordRaw(0, raw); err != nil {
		t.Fatal(err)
	}
	for k := range in {
		if float32(raw[0][k]) != in[k] {
			t.Errorf("sample %d: %d, want %v", k, raw[0][k], in[k])
		}
	}
}

// TestSegments writes an EDF+D file with two gaps and reads them back as
// segments (Kemp & Olivan 2003, section 2.2.4: each record's onset is its
// time-keeping annotation).
func TestSegments(t *testing.T) {
	onsets := []float64{0, 1, 2, 10, 11, 30.5}
	b := writeFile(t, EDFPlusD, testSignals(), int64(len(onsets)), onsets, nil)
	r := open(t, b)
	segs, err := r.Segments()
	if err != nil {
		t.Fatal(err)
	}
	want := []Segment{{0, 3, 0, 3}, {10, 2, 3, 2}, {30.5, 1, 5, 1}}
	if len(segs) != len(want) {
		t.Fatalf("segments %+v", segs)
	}
	for i := range want {
		if segs[i] != want[i] {
			t.Errorf("segment %d: %+v, want %+v", i, segs[i], want[i])
		}
	}
	for i, o := range onsets {
		if got, err := r.RecordOnset(int64(i)); err != nil || got != o {
			t.Errorf("record %d onset %v, %v", i, got, err)
		}
	}
	s, err := Inspect(bytesReader(b), int64(len(b)), "d.edf")
	if err != nil {
		t.Fatal(err)
	}
	if s.Discontinuities != 2 || s.Duration != 31.5 {
		t.Errorf("summary: %d discontinuities, duration %v; want 2, 31.5", s.Discontinuities, s.Duration)
	}
}

// TestReadSignal checks a window that straddles records against the same
// samples taken from whole records.
func TestReadSignal(t *testing.T) {
	b := writeFile(t, EDFPlusC, testSignals(), 4, nil, nil)
	r := open(t, b)
	spr := 128
	whole := make([]float32, 0, 4*spr)
	dst := make([][]float32, 4)
	dst[2] = make([]float32, spr)
	for i := int64(0); i < 4; i++ {
		if err := r.ReadRecord(i, dst); err != nil {
			t.Fatal(err)
		}
		whole = append(whole, dst[2]...)
	}
	win := make([]float32, 300)
	n, err := r.ReadSignal(2, 100, win)
	if err != nil || n != 300 {
		t.Fatalf("n=%d err=%v", n, err)
	}
	for k := range win {
		if win[k] != whole[100+k] {
			t.Fatalf("sample %d: %v, want %v", k, win[k], whole[100+k])
		}
	}
	n, err = r.ReadSignal(2, 4*128-10, win)
	if n != 10 || err == nil {
		t.Errorf("past the end: n=%d err=%v", n, err)
	}
	if _, err := r.ReadSignal(3, 0, win); err == nil {
		t.Error("reading the annotation signal as samples succeeded")
	}
}

// TestUnknownCount checks the "-1 while recording" record count is
// patched by Close on a seekable writer (Kemp et al. 1992: -1 until the
// recording is closed).
func TestUnknownCount(t *testing.T) {
	var buf seekBuffer
	w, err := NewWriter(&buf, WriterHeader{Format: EDFPlusC, Start: fixedStart, RecordDuration: 0.5, Signals: testSignals()[:1]})
	if err != nil {
		t.Fatal(err)
	}
	for i := 0; i < 3; i++ {
		if err := w.WriteRecord([][]float32{make([]float32, 256)}); err != nil {
			t.Fatal(err)
		}
	}
	if err := w.Close(); err != nil {
		t.Fatal(err)
	}
	if got := string(buf.b[236:244]); got != "3       " {
		t.Errorf("record count field %q", got)
	}
	if o, err := open(t, buf.b).RecordOnset(2); err != nil || o != 1 {
		t.Errorf("record 2 onset %v, %v", o, err)
	}
}
