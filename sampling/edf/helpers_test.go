package edf

import (
	"bytes"
	"errors"
	"math"
	"testing"
	"time"
)

// testSignals are two EEG channels and one ECG at different rates.
func testSignals() []Signal {
	return []Signal{
		{Label: "EEG Fp1-REF", PhysDim: "uV", PhysMin: -3276.8, PhysMax: 3276.7, DigMin: -32768, DigMax: 32767, SamplesPerRecord: 256, Prefilter: "HP:0.5Hz LP:70Hz"},
		{Label: "T3", PhysDim: "uV", PhysMin: -500, PhysMax: 500, DigMin: -2048, DigMax: 2047, SamplesPerRecord: 256},
		{Label: "ECG", PhysDim: "mV", PhysMin: -5, PhysMax: 5, SamplesPerRecord: 128},
	}
}

// wave is a deterministic test signal: sample k of signal j in record i.
func wave(j int, i int64, k, spr int, lo, hi float64) float32 {
	t := float64(i) + float64(k)/float64(spr)
	v := math.Sin(2*math.Pi*float64(j+1)*t) + 0.3*math.Cos(2*math.Pi*7.3*t)
	return float32(lo + (hi-lo)*(v+1.3)/2.6)
}

// writeFile writes nrec records with wave samples; onsets (EDF+D) may be nil.
func writeFile(t testing.TB, f Format, sigs []Signal, nrec int64, onsets []float64, anns map[int64][]Annotation) []byte {
	t.Helper()
	var buf bytes.Buffer
	w, err := NewWriter(&buf, WriterHeader{Format: f, PatientID: "MCH-0234567 F 02-MAY-1951 Haagse_Harry",
		Start: time.Date(2024, 3, 5, 10, 11, 12, 0, time.UTC), RecordDuration: 1, NumRecords: nrec, Signals: sigs, AnnotationBytes: 200})
	if err != nil {
		t.Fatal(err)
	}
	for i := int64(0); i < nrec; i++ {
		x := make([][]float32, len(sigs))
		for j, s := range sigs {
			x[j] = make([]float32, s.SamplesPerRecord)
			for k := range x[j] {
				x[j][k] = wave(j, i, k, s.SamplesPerRecord, s.PhysMin, s.PhysMax)
			}
		}
		if onsets != nil {
			err = w.WriteRecordAt(onsets[i], x, anns[i]...)
		} else {
			err = w.WriteRecord(x, anns[i]...)
		}
		if err != nil {
			t.Fatal(err)
		}
	}
	if err := w.Close(); err != nil {
		t.Fatal(err)
	}
	return buf.Bytes()
}

func open(t testing.TB, b []byte) *Reader {
	t.Helper()
	r, err := NewReader(bytes.NewReader(b), int64(len(b)), "t.edf")
	if err != nil {
		t.Fatal(err)
	}
	return r
}

// fieldErr asserts err is a *FieldError on field.
func fieldErr(t *testing.T, err error, field string) *FieldError {
	t.Helper()
	var fe *FieldError
	if !errors.As(err, &fe) {
		t.Fatalf("got %v, want a *FieldError on %q", err, field)
	}
	if fe.Field != field {
		t.Fatalf("error on field %q, want %q: %v", fe.Field, field, err)
	}
	return fe
}

var fixedStart = time.Date(2024, 3, 5, 10, 11, 12, 0, time.UTC)

type bytesBuffer struct{ b []byte }

func (w *bytesBuffer) Write(p []byte) (int, error) { w.b = append(w.b, p...); return len(p), nil }

// seekBuffer is an in-memory io.WriteSeeker.
type seekBuffer struct {
	b   []byte
	pos int
}

func (w *seekBuffer) Write(p []byte) (int, error) {
	if need := w.pos + len(p); need > len(w.b) {
		w.b = append(w.b, make([]byte, need-len(w.b))...)
	}
	copy(w.b[w.pos:], p)
	w.pos += len(p)
	return len(p), nil
}

func (w *seekBuffer) Seek(off int64, whence int) (int64, error) {
	switch whence {
	case 0:
		w.pos = int(off)
	case 1:
		w.pos += int(off)
	case 2:
		w.pos = len(w.b) + int(off)
	}
	return int64(w.pos), nil
}

func bytesReader(b []byte) *bytes.Reader { return bytes.NewReader(b) }

func asFieldError(err error, fe **FieldError) bool { return errors.As(err, fe) }
