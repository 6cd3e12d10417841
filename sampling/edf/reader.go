package edf

import (
	"errors"
	"fmt"
	"io"
	"os"
	"strconv"
)

// Reader gives random access to the data records of one EDF-family file.
// It holds one data record's bytes at a time, so memory does not grow with
// the recording. A Reader is not safe for concurrent use.
type Reader struct {
	r         io.ReaderAt
	closer    io.Closer
	name      string
	h         *Header
	dataStart int64
	recBytes  int64
	sigOff    []int64 // byte offset of each signal inside a record
	width     int
	annot     []int // annotation signal indices
	buf       []byte
	tol       float64 // onsets closer than this are the same instant
	derived   derivedCache
}

// NewReader reads the header of the size-byte file r and checks the file
// size against it: a file with fewer complete data records than the header
// announces is an error (see the package documentation); BDF-sized data
// under an EDF version field, or EDF-sized data under a BDF one, is an
// error on the version field.
func NewReader(r io.ReaderAt, size int64, name string) (*Reader, error) {
	if size == 0 {
		return nil, &FieldError{File: name, Field: "version", Signal: -1, Offset: 0,
			Want: "an EDF or BDF header record; the file is empty"}
	}
	h, err := ReadHeader(io.NewSectionReader(r, 0, size), name)
	if err != nil {
		return nil, err
	}
	if err := checkSize(h, size, name); err != nil {
		return nil, err
	}
	rd := &Reader{r: r, name: name, h: h, dataStart: int64(h.HeaderBytes), width: h.Format.sampleBytes()}
	rd.sigOff = make([]int64, len(h.Signals))
	var off int64
	maxRate := 0.0
	for i := range h.Signals {
		rd.sigOff[i] = off
		off += int64(h.Signals[i].SamplesPerRecord * rd.width)
		if h.Signals[i].IsAnnotation() {
			rd.annot = append(rd.annot, i)
		} else if spr := float64(h.Signals[i].SamplesPerRecord); spr > maxRate {
			maxRate = spr
		}
	}
	rd.recBytes = off
	rd.tol = 1e-9
	if maxRate > 0 && h.RecordDuration > 0 {
		rd.tol = 0.5 * h.RecordDuration / maxRate
	}
	return rd, nil
}

// checkSize compares the data area with NumRecords × record size,
// filling NumRecords when the header says -1.
func checkSize(h *Header, size int64, name string) error {
	rec := h.RecordBytes()
	data := size - int64(h.HeaderBytes)
	if h.NumRecords == unknownRecs {
		h.NumRecords = data / rec
		if h.NumRecords < 1 {
			return &FieldError{File: name, Field: "number of data records", Signal: -1, Offset: 236, Value: "-1",
				Want: fmt.Sprintf("at least one complete %d-byte data record after the header", rec)}
		}
		h.Warnings = append(h.Warnings, fmt.Sprintf("number of data records is -1; %d complete records found", h.NumRecords))
	}
	// Compare by division: NumRecords × rec can overflow on hostile headers.
	if data >= 0 && data%rec == 0 && data/rec == h.NumRecords {
		return nil
	}
	// Same signals stored with the other sample width?
	w := int64(h.Format.sampleBytes())
	otherW := 5 - w // 2 ↔ 3
	if otherRec := rec / w * otherW; data > 0 && data%otherRec == 0 && data/otherRec == h.NumRecords {
		want := "0xFF \"BIOSEMI\": the data records hold 3-byte samples"
		if h.Format.Is24Bit() {
			want = "\"0\": the data records hold 2-byte samples"
		}
		return &FieldError{File: name, Field: "version", Signal: -1, Offset: 0, Value: rawVersion(h), Want: want}
	}
	if data < 0 || data/rec < h.NumRecords {
		return &FieldError{File: name, Field: "number of data records", Signal: -1, Offset: 236,
			Value: strconv.FormatInt(h.NumRecords, 10),
			Want: fmt.Sprintf("%d complete %d-byte data records; the file holds %d bytes of data, room for %d",
				h.NumRecords, rec, max(data, 0), max(data, 0)/rec)}
	}
	need := h.NumRecords * rec
	h.Warnings = append(h.Warnings, fmt.Sprintf("%d bytes after the last data record ignored", data-need))
	return nil
}

func rawVersion(h *Header) string {
	if h.Format.Is24Bit() {
		return bdfVersion
	}
	return edfVersion
}

// Open opens the named file for reading; Close releases it.
func Open(path string) (*Reader, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	st, err := f.Stat()
	if err != nil {
		f.Close()
		return nil, err
	}
	r, err := NewReader(f, st.Size(), path)
	if err != nil {
		f.Close()
		return nil, err
	}
	r.closer = f
	return r, nil
}

// Close closes the file opened by Open; otherwise it does nothing.
func (r *Reader) Close() error {
	if r.closer == nil {
		return nil
	}
	err := r.closer.Close()
	r.closer = nil
	return err
}

// Header returns the parsed header. Callers must not modify it.
func (r *Reader) Header() *Header { return r.h }

// NumRecords is the number of data records.
func (r *Reader) NumRecords() int64 { return r.h.NumRecords }

func (r *Reader) checkRecord(i int64) error {
	if i < 0 || i >= r.h.NumRecords {
		return fmt.Errorf("edf: %s: record %d out of range [0, %d)", r.name, i, r.h.NumRecords)
	}
	return nil
}

// readAt fills b from absolute offset off, reporting a short file as a
// FieldError on the data record.
func (r *Reader) readAt(b []byte, off int64) error {
	n, err := r.r.ReadAt(b, off)
	if n == len(b) {
		return nil
	}
	if err == nil || errors.Is(err, io.EOF) {
		return &FieldError{File: r.name, Field: "data record", Signal: -1, Offset: off + int64(n),
			Want: fmt.Sprintf("%d more bytes; the file is shorter than its header says", len(b)-n)}
	}
	return err
}

func (r *Reader) loadRecord(i int64) error {
	if err := r.checkRecord(i); err != nil {
		return err
	}
	if int64(cap(r.buf)) < r.recBytes {
		r.buf = make([]byte, r.recBytes)
	}
	r.buf = r.buf[:r.recBytes]
	return r.readAt(r.buf, r.dataStart+i*r.recBytes)
}

// ReadRecord decodes data record i into physical values: dst[j] receives
// the SamplesPerRecord samples of signal j. dst has one entry per header
// signal; a nil entry, and every annotation signal, is skipped.
func (r *Reader) ReadRecord(i int64, dst [][]float32) error {
	return eachSignal(r, i, dst, r.decode)
}

func (r *Reader) decode(d []float32, src []byte, s *Signal) {
	g, o := float32(s.Gain()), float32(s.Offset())
	if r.width == 2 {
		DecodeInt16(d, src, g, o)
	} else {
		DecodeInt24(d, src, g, o)
	}
}

// ReadRecordRaw is ReadRecord without scaling: the stored digital values.
func (r *Reader) ReadRecordRaw(i int64, dst [][]int32) error {
	return eachSignal(r, i, dst, func(d []int32, src []byte, s *Signal) {
		decodeRaw(d[:s.SamplesPerRecord], src, r.width)
	})
}

// eachSignal loads record i and hands each wanted ordinary signal's bytes to
// decode, with its destination.
func eachSignal[T any](r *Reader, i int64, dst [][]T, decode func(d []T, src []byte, s *Signal)) error {
	if err := r.checkDst(len(dst)); err != nil {
		return err
	}
	if err := r.loadRecord(i); err != nil {
		return err
	}
	for j, d := range dst {
		s := &r.h.Signals[j]
		if d == nil || s.IsAnnotation() {
			continue
		}
		if len(d) < s.SamplesPerRecord {
			return fmt.Errorf("edf: dst[%d] holds %d samples, signal %d needs %d", j, len(d), j, s.SamplesPerRecord)
		}
		decode(d, r.buf[r.sigOff[j]:r.sigOff[j]+int64(s.SamplesPerRecord*r.width)], s)
	}
	return nil
}

func (r *Reader) checkDst(n int) error {
	if n != len(r.h.Signals) {
		return fmt.Errorf("edf: dst has %d entries, the file has %d signals", n, len(r.h.Signals))
	}
	return nil
}

// ReadSignal decodes len(dst) consecutive samples of signal sig starting
// at sample index start, counting samples record after record (gaps of an
// EDF+D file are not filled; see Segments). Only the bytes of that signal
// in the records the window covers are read. It returns the number of
// samples decoded and io.EOF if the window runs past the last record.
func (r *Reader) ReadSignal(sig int, start int64, dst []float32) (int, error) {
	if sig < 0 || sig >= len(r.h.Signals) || r.h.Signals[sig].IsAnnotation() {
		return 0, fmt.Errorf("edf: %s: signal %d is not an ordinary signal", r.name, sig)
	}
	s := &r.h.Signals[sig]
	spr := int64(s.SamplesPerRecord)
	if start < 0 {
		return 0, fmt.Errorf("edf: negative start sample %d", start)
	}
	done := 0
	for done < len(dst) {
		pos := start + int64(done)
		rec, k := pos/spr, pos%spr
		if rec >= r.h.NumRecords {
			return done, io.EOF
		}
		n := min(spr-k, int64(len(dst)-done))
		b := int(n) * r.width
		if cap(r.buf) < b {
			r.buf = make([]byte, max(b, int(r.recBytes)))
		}
		chunk := r.buf[:b]
		if err := r.readAt(chunk, r.dataStart+rec*r.recBytes+r.sigOff[sig]+k*int64(r.width)); err != nil {
			return done, err
		}
		r.decode(dst[done:done+int(n)], chunk, s)
		done += int(n)
	}
	return done, nil
}

// RecordBytes is the size of one data record in bytes.
func (r *Reader) RecordBytes() int64 { return r.recBytes }
