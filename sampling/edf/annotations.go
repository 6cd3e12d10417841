package edf

import (
	"errors"
	"fmt"
	"iter"
	"strconv"
)

// Segment is a run of contiguous data records (Kemp & Olivan 2003, section
// 2.2.4: in EDF+D the time-keeping annotation of each record gives its
// onset; records whose onsets follow without a gap form one segment).
type Segment struct {
	Start       float64 // seconds from the header start time
	Duration    float64 // seconds
	FirstRecord int64
	Records     int64
}

// End is Start + Duration.
func (s Segment) End() float64 { return s.Start + s.Duration }

// recordTALs reads and parses annotation signal a of record i, with
// errors located in the file.
func (r *Reader) recordTALs(i int64, a int) ([]TAL, error) {
	s := &r.h.Signals[a]
	n := s.SamplesPerRecord * r.width
	if cap(r.buf) < n {
		r.buf = make([]byte, max(n, int(r.recBytes)))
	}
	b := r.buf[:n]
	off := r.dataStart + i*r.recBytes + r.sigOff[a]
	if err := r.readAt(b, off); err != nil {
		return nil, err
	}
	tals, err := ParseTAL(b)
	var fe *FieldError
	if errors.As(err, &fe) {
		fe.File, fe.Signal, fe.Offset = r.name, a, fe.Offset+off
	}
	return tals, err
}

// recordAnnotations returns record i's onset (from its time-keeping
// annotation, or i × duration without one) and its other annotations.
func (r *Reader) recordAnnotations(i int64, keep bool) (float64, []Annotation, error) {
	if err := r.checkRecord(i); err != nil {
		return 0, nil, err
	}
	onset := float64(i) * r.h.RecordDuration
	var anns []Annotation
	for k, a := range r.annot {
		tals, err := r.recordTALs(i, a)
		if err != nil {
			return 0, nil, err
		}
		for t, tal := range tals {
			texts := tal.Texts
			if k == 0 && t == 0 && r.h.Format.IsPlus() {
				if len(texts) == 0 || texts[0] != "" {
					return 0, nil, &FieldError{File: r.name, Field: "time-keeping annotation", Signal: a,
						Offset: r.dataStart + i*r.recBytes + r.sigOff[a], Value: firstText(texts),
						Want: "the record's first TAL to start with an empty annotation (+onset\\x14\\x14)"}
				}
				onset = tal.Onset
				texts = texts[1:]
			}
			if !keep {
				continue
			}
			for _, txt := range texts {
				anns = append(anns, Annotation{Onset: tal.Onset, Duration: tal.Duration,
					HasDuration: tal.HasDuration, Text: txt, Record: i})
			}
		}
	}
	return onset, anns, nil
}

func firstText(t []string) string {
	if len(t) == 0 {
		return ""
	}
	return t[0]
}

// RecordOnset is the onset of data record i in seconds from the header
// start time: its time-keeping annotation in EDF+/BDF+, i × RecordDuration
// otherwise.
func (r *Reader) RecordOnset(i int64) (float64, error) {
	o, _, err := r.recordAnnotations(i, false)
	return o, err
}

// Annotations returns the annotations stored in data record i, in file
// order, without the record's time-keeping annotation.
func (r *Reader) Annotations(i int64) ([]Annotation, error) {
	_, a, err := r.recordAnnotations(i, true)
	return a, err
}

// AllAnnotations iterates over the annotations of every record in order,
// reading one record's annotation signals at a time. Iteration stops after
// the first error.
func (r *Reader) AllAnnotations() iter.Seq2[Annotation, error] {
	return func(yield func(Annotation, error) bool) {
		if len(r.annot) == 0 {
			return
		}
		for i := int64(0); i < r.h.NumRecords; i++ {
			anns, err := r.Annotations(i)
			if err != nil {
				yield(Annotation{}, err)
				return
			}
			for _, a := range anns {
				if !yield(a, nil) {
					return
				}
			}
		}
	}
}

// segmenter folds record onsets into segments, checking that onsets
// increase by at least one record duration.
type segmenter struct {
	dur, tol float64
	cur      Segment
	started  bool
	emit     func(Segment)
}

func (s *segmenter) add(i int64, onset float64) error {
	if s.started {
		end := s.cur.End()
		switch {
		case onset < end-s.tol:
			return fmt.Errorf("record %d onset %s before previous record end %s", i,
				strconv.FormatFloat(onset, 'f', -1, 64), strconv.FormatFloat(end, 'f', -1, 64))
		case onset <= end+s.tol:
			s.cur.Records++
			s.cur.Duration += s.dur
			return nil
		}
		s.emit(s.cur)
	}
	s.cur = Segment{Start: onset, Duration: s.dur, FirstRecord: i, Records: 1}
	s.started = true
	return nil
}

func (s *segmenter) flush() {
	if s.started {
		s.emit(s.cur)
	}
}

// Segments returns the contiguous runs of data records. EDF, BDF and
// continuous EDF+/BDF+ files give one segment starting at the first
// record's onset; EDF+D/BDF+D files are read record by record (only the
// first annotation signal's bytes) and split wherever a record's onset is
// later than the previous record's end by more than half the shortest
// sample period. An onset earlier than the previous record's end is a
// *FieldError on the time-keeping annotation.
func (r *Reader) Segments() ([]Segment, error) {
	var out []Segment
	err := r.walk(func(s Segment) { out = append(out, s) }, nil)
	return out, err
}

// walk visits the records' time keeping (and, if anns is non-nil, their
// annotations), emitting segments as they close.
func (r *Reader) walk(emit func(Segment), anns func([]Annotation)) error {
	seg := &segmenter{dur: r.h.RecordDuration, tol: r.tol, emit: emit}
	if len(r.annot) == 0 || !r.h.Format.IsDiscontinuous() && anns == nil {
		start := 0.0
		if len(r.annot) > 0 {
			o, err := r.RecordOnset(0)
			if err != nil {
				return err
			}
			start = o
		}
		emit(Segment{Start: start, Duration: r.h.Duration(), FirstRecord: 0, Records: r.h.NumRecords})
		return nil
	}
	for i := int64(0); i < r.h.NumRecords; i++ {
		onset, a, err := r.recordAnnotations(i, anns != nil)
		if err != nil {
			return err
		}
		if anns != nil {
			anns(a)
		}
		if !r.h.Format.IsDiscontinuous() {
			continue
		}
		if err := seg.add(i, onset); err != nil {
			a := r.annot[0]
			return &FieldError{File: r.name, Field: "time-keeping annotation", Signal: a,
				Offset: r.dataStart + i*r.recBytes + r.sigOff[a], Value: strconv.FormatFloat(onset, 'f', -1, 64),
				Want: "increasing record onsets: " + err.Error()}
		}
	}
	if !r.h.Format.IsDiscontinuous() {
		start, err := r.RecordOnset(0)
		if err != nil {
			return err
		}
		emit(Segment{Start: start, Duration: r.h.Duration(), FirstRecord: 0, Records: r.h.NumRecords})
		return nil
	}
	seg.flush()
	return nil
}
