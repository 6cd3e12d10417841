package edf

import (
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
	"time"
)

// WriterHeader describes a file to write.
type WriterHeader struct {
	Format      Format
	PatientID   string // EDF+ subfields "code sex birthdate name"; empty → "X X X X" for EDF+
	RecordingID string // EDF+: prefixed with "Startdate dd-MMM-yyyy" unless it starts with "Startdate"
	// Start is the recording start. Its sub-second part is carried by the
	// first record's time-keeping annotation in EDF+/BDF+ (Kemp & Olivan
	// 2003, section 2.2.4) and dropped in EDF/BDF.
	Start          time.Time
	RecordDuration float64 // seconds; must be exact in 8 characters
	// NumRecords is the number of records that will be written. Zero means
	// unknown: "-1" is written and patched by Close, which then needs an
	// io.WriteSeeker.
	NumRecords int64
	// Signals are the ordinary signals; the writer appends the
	// "EDF Annotations" signal itself for EDF+/BDF+. DigMin = DigMax = 0
	// selects the full 16-bit (EDF) or 24-bit (BDF) range.
	Signals []Signal
	// AnnotationBytes is the room for TALs in each record (EDF+/BDF+);
	// 0 selects 120 (EDF) or 120 rounded up to 3-byte samples (BDF).
	AnnotationBytes int
}

// Writer writes data records one at a time.
type Writer struct {
	w        io.Writer
	h        WriterHeader
	sigs     []Signal // as written, including the annotation signal
	gain     []float64
	off      []float64
	width    int
	annBytes int
	frac     float64 // sub-second start, seconds
	n        int64
	prevEnd  float64
	rec      []byte
	dig      []int32
	tal      []byte
}

// NewWriter validates h and writes the header record to w.
func NewWriter(w io.Writer, h WriterHeader) (*Writer, error) {
	wr := &Writer{w: w, h: h, width: h.Format.sampleBytes()}
	if h.Format < EDF || h.Format > BDFPlusD {
		return nil, fmt.Errorf("edf: unknown format %d", h.Format)
	}
	if len(h.Signals) == 0 {
		return nil, errors.New("edf: no signals")
	}
	lo, hi := -32768, 32767
	if h.Format.Is24Bit() {
		lo, hi = int24Min, int24Max
	}
	for _, s := range h.Signals {
		if s.DigMin == 0 && s.DigMax == 0 {
			s.DigMin, s.DigMax = lo, hi
		}
		if s.SamplesPerRecord < 1 {
			return nil, fmt.Errorf("edf: signal %q: samples per record %d", s.Label, s.SamplesPerRecord)
		}
		wr.sigs = append(wr.sigs, s)
	}
	if h.Format.IsPlus() {
		n := h.AnnotationBytes
		if n <= 0 {
			n = 120
		}
		spr := (n + wr.width - 1) / wr.width
		wr.annBytes = spr * wr.width
		wr.sigs = append(wr.sigs, Signal{Label: annotLabel, DigMin: lo, DigMax: hi, PhysMin: -1, PhysMax: 1,
			SamplesPerRecord: spr})
		wr.frac = float64(h.Start.Nanosecond()) / 1e9
	}
	hdr, err := wr.header()
	if err != nil {
		return nil, err
	}
	var recBytes int
	for i, s := range wr.sigs {
		recBytes += s.SamplesPerRecord * wr.width
		if i < len(h.Signals) {
			wr.gain = append(wr.gain, s.Gain())
			wr.off = append(wr.off, s.Offset())
		}
	}
	wr.rec = make([]byte, recBytes)
	wr.prevEnd = math.Inf(-1)
	if _, err := w.Write(hdr); err != nil {
		return nil, err
	}
	return wr, nil
}

// fitNumber formats v in at most 8 characters, dropping fraction digits
// as needed.
func fitNumber(v float64) (string, bool) {
	s := strconv.FormatFloat(v, 'f', -1, 64)
	for prec := 8; len(s) > 8 && prec >= 0; prec-- {
		s = strconv.FormatFloat(v, 'f', prec, 64)
		if strings.Contains(s, ".") {
			s = strings.TrimRight(strings.TrimRight(s, "0"), ".")
		}
	}
	return s, len(s) <= 8 && !math.IsInf(v, 0) && !math.IsNaN(v)
}

func (wr *Writer) header() ([]byte, error) {
	h := wr.h
	ns := len(wr.sigs)
	b := []byte(strings.Repeat(" ", 256*(ns+1)))
	put := func(off, width int, s, field string, sig int) error {
		if len(s) > width || ascii(s) >= 0 {
			return &FieldError{Field: field, Signal: sig, Offset: int64(off), Value: s,
				Want: fmt.Sprintf("at most %d printable US-ASCII characters", width)}
		}
		copy(b[off:], s)
		return nil
	}
	version := edfVersion
	if h.Format.Is24Bit() {
		version = bdfVersion
	}
	copy(b, version)
	st := h.Start.UTC()
	pid, rid := h.PatientID, h.RecordingID
	if h.Format.IsPlus() {
		if pid == "" {
			pid = "X X X X"
		}
		if !strings.HasPrefix(rid, "Startdate") {
			if rid == "" {
				rid = "X X X"
			}
			rid = fmt.Sprintf("Startdate %02d-%s-%04d %s", st.Day(), strings.ToUpper(st.Month().String()[:3]), st.Year(), rid)
		}
	}
	yy := fmt.Sprintf("%02d", st.Year()%100)
	if st.Year() < 1985 || st.Year() > 2084 {
		if !h.Format.IsPlus() || st.Year() < 1985 {
			return nil, fmt.Errorf("edf: start year %d outside 1985–2084 cannot be stored in %s", st.Year(), h.Format)
		}
		yy = "yy"
	}
	reserved := map[Format]string{EDF: "", EDFPlusC: "EDF+C", EDFPlusD: "EDF+D", BDF: "24BIT", BDFPlusC: "BDF+C", BDFPlusD: "BDF+D"}[h.Format]
	nrec := strconv.FormatInt(h.NumRecords, 10)
	if h.NumRecords == 0 {
		nrec = "-1"
	}
	dur, ok := fitNumber(h.RecordDuration)
	if back, _ := strconv.ParseFloat(dur, 64); !ok || back != h.RecordDuration || h.RecordDuration <= 0 {
		return nil, &FieldError{Field: "duration of a data record", Signal: -1, Offset: 244,
			Value: strconv.FormatFloat(h.RecordDuration, 'g', -1, 64), Want: "a positive duration exact in 8 characters"}
	}
	fixed := []string{version, pid, rid,
		fmt.Sprintf("%02d.%02d.%s", st.Day(), int(st.Month()), yy),
		fmt.Sprintf("%02d.%02d.%02d", st.Hour(), st.Minute(), st.Second()),
		strconv.Itoa(256 * (ns + 1)), reserved, nrec, dur, strconv.Itoa(ns)}
	for i, f := range fixedFields[1:] {
		if err := put(f.off, f.width, fixed[i+1], f.name, -1); err != nil {
			return nil, err
		}
	}
	off := 256
	for k, f := range signalFields {
		for i := range wr.sigs {
			s := &wr.sigs[i]
			var v string
			switch k {
			case 0:
				v = s.Label
			case 1:
				v = s.Transducer
			case 2:
				v = s.PhysDim
			case 3, 4:
				p := &s.PhysMin
				if k == 4 {
					p = &s.PhysMax
				}
				var ok bool
				if v, ok = fitNumber(*p); !ok {
					return nil, &FieldError{Field: f.name, Signal: i, Offset: int64(off),
						Value: strconv.FormatFloat(*p, 'g', -1, 64), Want: "a number that fits in 8 characters"}
				}
				// Quantise against what the reader will see.
				*p, _ = strconv.ParseFloat(v, 64)
			case 5:
				v = strconv.Itoa(s.DigMin)
			case 6:
				v = strconv.Itoa(s.DigMax)
			case 7:
				v = s.Prefilter
			case 8:
				v = strconv.Itoa(s.SamplesPerRecord)
			case 9:
				v = s.Reserved
			}
			if err := put(off, f.width, v, f.name, i); err != nil {
				return nil, err
			}
			off += f.width
		}
	}
	for i, s := range wr.sigs[:len(h.Signals)] {
		if s.DigMin >= s.DigMax || s.DigMin < -1<<23 || s.DigMax > 1<<23-1 ||
			(!h.Format.Is24Bit() && (s.DigMin < -32768 || s.DigMax > 32767)) {
			return nil, &FieldError{Field: "digital minimum", Signal: i, Offset: -1, Value: strconv.Itoa(s.DigMin),
				Want: fmt.Sprintf("less than digital maximum %d, within the %s sample range", s.DigMax, h.Format)}
		}
		if s.PhysMin == s.PhysMax {
			return nil, &FieldError{Field: "physical maximum", Signal: i, Offset: -1, Value: strconv.FormatFloat(s.PhysMax, 'g', -1, 64),
				Want: "different from physical minimum"}
		}
	}
	return b, nil
}

// WriteRecord writes the next data record of a continuous file (or the
// record that directly follows the previous one in EDF+D). samples[j]
// holds SamplesPerRecord physical values of ordinary signal j; they are
// quantised as dig = round((phys − PhysMin)/gain + DigMin), clipped to
// [DigMin, DigMax]. anns are stored in this record's annotation signal
// with onsets in seconds from Start.
func (wr *Writer) WriteRecord(samples [][]float32, anns ...Annotation) error {
	onset := wr.frac + float64(wr.n)*wr.h.RecordDuration
	return wr.write(onset, samples, anns)
}

// WriteRecordAt writes the next data record of an EDF+D/BDF+D file with
// the given onset (seconds from Start), which must not precede the end of
// the previous record.
func (wr *Writer) WriteRecordAt(onset float64, samples [][]float32, anns ...Annotation) error {
	if !wr.h.Format.IsDiscontinuous() {
		return fmt.Errorf("edf: WriteRecordAt needs EDF+D or BDF+D, not %s", wr.h.Format)
	}
	return wr.write(onset, samples, anns)
}

// roundNano keeps written onsets short: i×duration sums carry binary noise.
func roundNano(t float64) float64 { return math.Round(t*1e9) / 1e9 }

func (wr *Writer) write(onset float64, samples [][]float32, anns []Annotation) error {
	if len(samples) != len(wr.h.Signals) {
		return fmt.Errorf("edf: record %d: %d signals given, header has %d", wr.n, len(samples), len(wr.h.Signals))
	}
	if wr.h.NumRecords > 0 && wr.n >= wr.h.NumRecords {
		return fmt.Errorf("edf: record %d: header announced %d records", wr.n, wr.h.NumRecords)
	}
	onset = roundNano(onset)
	if onset < wr.prevEnd-1e-9 {
		return fmt.Errorf("edf: record %d onset %g precedes the previous record's end %g", wr.n, onset, wr.prevEnd)
	}
	if len(anns) > 0 && !wr.h.Format.IsPlus() {
		return fmt.Errorf("edf: %s files cannot hold annotations", wr.h.Format)
	}
	pos := 0
	for j, x := range samples {
		s := &wr.sigs[j]
		if len(x) != s.SamplesPerRecord {
			return fmt.Errorf("edf: record %d signal %d: %d samples, want %d", wr.n, j, len(x), s.SamplesPerRecord)
		}
		if cap(wr.dig) < len(x) {
			wr.dig = make([]int32, len(x))
		}
		d := wr.dig[:len(x)]
		g, o := wr.gain[j], wr.off[j]
		lo, hi := float64(s.DigMin), float64(s.DigMax)
		for k, v := range x {
			if v != v {
				return fmt.Errorf("edf: record %d signal %d sample %d is NaN", wr.n, j, k)
			}
			q := math.Round((float64(v) - o) / g)
			d[k] = int32(min(max(q, lo), hi))
		}
		encodeRaw(wr.rec[pos:], d, wr.width)
		pos += len(x) * wr.width
	}
	if wr.h.Format.IsPlus() {
		t := formatTAL(wr.tal[:0], onset, 0, false, "")
		for _, a := range anns {
			if strings.ContainsAny(a.Text, "\x00\x14\x15") {
				return fmt.Errorf("edf: annotation %q holds a TAL delimiter byte", a.Text)
			}
			t = formatTAL(t, roundNano(a.Onset), roundNano(a.Duration), a.HasDuration, a.Text)
		}
		if len(t) > wr.annBytes {
			return fmt.Errorf("edf: record %d: TALs need %d bytes, AnnotationBytes gives %d", wr.n, len(t), wr.annBytes)
		}
		wr.tal = t
		copy(wr.rec[pos:], t)
		clear(wr.rec[pos+len(t) : pos+wr.annBytes])
	}
	if _, err := wr.w.Write(wr.rec); err != nil {
		return err
	}
	wr.prevEnd = onset + wr.h.RecordDuration
	wr.n++
	return nil
}

// Close checks the record count, patching it into the header when it was
// unknown. It does not close the underlying writer.
func (wr *Writer) Close() error {
	if wr.h.NumRecords > 0 {
		if wr.n != wr.h.NumRecords {
			return fmt.Errorf("edf: %d records written, header announced %d", wr.n, wr.h.NumRecords)
		}
		return nil
	}
	if wr.n == 0 {
		return errors.New("edf: no data records written")
	}
	ws, ok := wr.w.(io.WriteSeeker)
	if !ok {
		return errors.New("edf: record count unknown and the writer cannot seek back to the header")
	}
	if _, err := ws.Seek(236, io.SeekStart); err != nil {
		return err
	}
	f := []byte("        ")
	copy(f, strconv.FormatInt(wr.n, 10))
	if _, err := ws.Write(f); err != nil {
		return err
	}
	_, err := ws.Seek(0, io.SeekEnd)
	return err
}
