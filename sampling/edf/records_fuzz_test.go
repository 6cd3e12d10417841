package edf

import (
	"bytes"
	"math"
	"testing"
)

// FuzzReadRecords decodes every data record, raw and scaled, and every EDF+
// annotation of whatever parses as a header: no panic, and a decoded sample is
// finite (Kemp et al. 1992: a digital value maps linearly into the physical range).
func FuzzReadRecords(f *testing.F) {
	f.Add(writeFile(f, EDFPlusC, testSignals()[:2], 2, nil, map[int64][]Annotation{1: {{Onset: 1.25, Duration: 0.5, Text: "spike"}}}))
	f.Add(writeFile(f, EDFPlusD, testSignals()[:1], 2, []float64{0, 3}, nil))
	f.Add(writeFile(f, BDF, testSignals()[:1], 2, nil, nil))
	f.Add(writeFile(f, EDF, testSignals()[:1], 1, nil, nil))
	f.Fuzz(func(t *testing.T, b []byte) {
		if len(b) > 1<<16 {
			return
		}
		r, err := NewReader(bytes.NewReader(b), int64(len(b)), "f.edf")
		if err != nil || r.RecordBytes() > 1<<14 || r.NumRecords() > 64 {
			return
		}
		sigs := r.Header().Signals
		dst := make([][]float32, len(sigs))
		raw := make([][]int32, len(sigs))
		for i, s := range sigs {
			if s.SamplesPerRecord > 1<<14 {
				return
			}
			dst[i] = make([]float32, s.SamplesPerRecord)
			raw[i] = make([]int32, s.SamplesPerRecord)
		}
		for i := range r.NumRecords() {
			if err := r.ReadRecord(i, dst); err != nil {
				return
			}
			if err := r.ReadRecordRaw(i, raw); err != nil {
				t.Fatalf("record %d: scaled read passed, raw failed: %v", i, err)
			}
			for _, d := range dst {
				for _, v := range d {
					if math.IsNaN(float64(v)) {
						t.Fatalf("record %d: NaN sample", i)
					}
				}
			}
		}
		for _, err := range r.AllAnnotations() {
			if err != nil {
				break
			}
		}
	})
}
