package edf

import (
	"errors"
	"fmt"
	"io"
	"strconv"
	"strings"
	"time"
)

// Header is the parsed header record of an EDF-family file.
type Header struct {
	Version        string    // "0" for EDF, "\xffBIOSEMI" for BDF
	PatientID      string    // local patient identification, trimmed
	RecordingID    string    // local recording identification, trimmed
	Start          time.Time // start date and time of the recording (UTC: the format stores no zone)
	HeaderBytes    int       // number of bytes in the header record, 256×(ns+1)
	Reserved       string    // the 44-byte reserved field, trimmed
	Format         Format
	NumRecords     int64   // number of data records
	RecordDuration float64 // duration of a data record, seconds
	Signals        []Signal
	Recovered      []Recovered // electrodes recovered from bipolar derivations when no signal is one (recoverElectrodes)
	Warnings       []string    // deviations tolerated while parsing
}

// Signal is one signal's header fields (Kemp et al. 1992, header record).
type Signal struct {
	Label            string      // raw label, trimmed
	Name             string      // NormalizeLabel(Label); the first electrode of a derivation against a common reference (commonReference)
	Kind             ChannelKind // NormalizeLabel(Label); EEG for such a derivation
	Transducer       string
	PhysDim          string // physical dimension, e.g. "uV"
	PhysMin, PhysMax float64
	DigMin, DigMax   int
	Prefilter        string
	SamplesPerRecord int
	Reserved         string
}

// IsAnnotation reports whether s is an "EDF Annotations" signal.
func (s *Signal) IsAnnotation() bool { return s.Kind == AnnotationSignal }

// Gain is the physical units per digital step,
// (PhysMax − PhysMin)/(DigMax − DigMin) (Kemp et al. 1992).
func (s *Signal) Gain() float64 {
	return (s.PhysMax - s.PhysMin) / float64(s.DigMax-s.DigMin)
}

// Offset is the physical value of digital zero, so that
// phys = dig·Gain + Offset ≡ (dig − DigMin)·Gain + PhysMin.
func (s *Signal) Offset() float64 {
	return s.PhysMin - float64(s.DigMin)*s.Gain()
}

// SampleRate is SamplesPerRecord / recordDuration, in Hz.
func (s *Signal) SampleRate(recordDuration float64) float64 {
	return float64(s.SamplesPerRecord) / recordDuration
}

// RecordBytes is the size of one data record.
func (h *Header) RecordBytes() int64 {
	var n int64
	for i := range h.Signals {
		n += int64(h.Signals[i].SamplesPerRecord)
	}
	return n * int64(h.Format.sampleBytes())
}

// Duration is NumRecords × RecordDuration in seconds; for EDF+D it ignores gaps
// (see Reader.Segments).
func (h *Header) Duration() float64 { return float64(h.NumRecords) * h.RecordDuration }

const (
	fixedBytes  = 256
	bdfVersion  = "\xffBIOSEMI"
	edfVersion  = "0       "
	annotLabel  = "EDF Annotations"
	maxSignals  = 4096 // bounds header memory on hostile input // common practice
	int24Min    = -1 << 23
	int24Max    = 1<<23 - 1
	unknownRecs = -1
)

// Fixed-header field layout (Kemp et al. 1992): name, offset, width.
var fixedFields = []struct {
	name       string
	off, width int
}{
	{"version", 0, 8},
	{"local patient identification", 8, 80},
	{"local recording identification", 88, 80},
	{"startdate of recording", 168, 8},
	{"starttime of recording", 176, 8},
	{"number of bytes in header record", 184, 8},
	{"reserved", 192, 44},
	{"number of data records", 236, 8},
	{"duration of a data record", 244, 8},
	{"number of signals", 252, 4},
}

// Per-signal field layout: each field is stored for all ns signals in turn.
var signalFields = []struct {
	name  string
	width int
}{
	{"label", 16},
	{"transducer type", 80},
	{"physical dimension", 8},
	{"physical minimum", 8},
	{"physical maximum", 8},
	{"digital minimum", 8},
	{"digital maximum", 8},
	{"prefiltering", 80},
	{"nr of samples in each data record", 8},
	{"reserved", 32},
}

// headerParser carries the file name and raw bytes for error reporting.
type headerParser struct {
	name   string
	b      []byte
	ns     int
	nulPad bool // some field ended in NUL bytes, read as the spaces they stand for
}

func (p *headerParser) err(field string, sig int, off int, want string) *FieldError {
	w := fieldWidth(field, sig)
	end := off + w
	if end > len(p.b) {
		end = len(p.b)
	}
	v := ""
	if off < end {
		v = string(p.b[off:end])
	}
	return &FieldError{File: p.name, Field: field, Signal: sig, Offset: int64(off), Value: v, Want: want}
}

func fieldWidth(field string, sig int) int {
	if sig < 0 {
		for _, f := range fixedFields {
			if f.name == field {
				return f.width
			}
		}
		return 0
	}
	for _, f := range signalFields {
		if f.name == field {
			return f.width
		}
	}
	return 0
}

// fixed returns the raw text of a fixed-header field and its offset.
func (p *headerParser) fixed(i int) (string, int) {
	f := fixedFields[i]
	return p.unpad(p.b[f.off : f.off+f.width]), f.off
}

// unpad returns a field's text with trailing NUL bytes as spaces: some writers
// pad fields with NULs where the specification asks for spaces.
func (p *headerParser) unpad(b []byte) string {
	n := len(b)
	for n > 0 && b[n-1] == 0 {
		n--
	}
	if n == len(b) {
		return string(b)
	}
	p.nulPad = true
	return string(b[:n]) + strings.Repeat(" ", len(b)-n)
}

// sigField returns the raw text of field k of signal i and its offset.
func (p *headerParser) sigField(k, i int) (string, int) {
	off := fixedBytes
	for j := 0; j < k; j++ {
		off += p.ns * signalFields[j].width
	}
	w := signalFields[k].width
	off += i * w
	return p.unpad(p.b[off : off+w]), off
}

// fixedText and signalText mark the header's free-text fields (by index
// into fixedFields and signalFields): patient and recording
// identification, reserved; label, transducer type, physical dimension,
// prefiltering, reserved. The specification asks for printable US-ASCII
// throughout, but recordings from many writers carry a Latin-1 "µV" or an
// accented name there; refusing the file for it would lose the recording,
// so those bytes are read as Latin-1 with a warning (latin1Text). Numbers,
// dates and times stay strict: there a stray byte means the field cannot
// be read.
var (
	fixedText  = map[int]bool{1: true, 2: true, 6: true}
	signalText = [...]bool{0: true, 1: true, 2: true, 7: true, 9: true}
)

// latin1Text reads a free-text header field: printable US-ASCII as it is,
// bytes 160–255 as the Latin-1 (ISO/IEC 8859-1) characters they encode,
// and control bytes (0–31, 127–159; NUL padding among them) as spaces.
// changed reports whether any byte was not printable US-ASCII.
func latin1Text(s string) (t string, changed bool) {
	if ascii(s) < 0 {
		return s, false
	}
	var b strings.Builder
	for i := 0; i < len(s); i++ {
		switch c := s[i]; {
		case c >= 32 && c < 127:
			b.WriteByte(c)
		case c >= 160:
			b.WriteRune(rune(c))
		default:
			b.WriteByte(' ')
		}
	}
	return b.String(), true
}

// ascii checks that b holds only printable US-ASCII (bytes 32..126), as the
// EDF specification requires of every header character.
func ascii(s string) int {
	for i := 0; i < len(s); i++ {
		if s[i] < 32 || s[i] > 126 {
			return i
		}
	}
	return -1
}

func (p *headerParser) int(field string, sig int, s string, off int) (int64, error) {
	t := strings.TrimSpace(s)
	v, err := strconv.ParseInt(t, 10, 64)
	if err != nil {
		// Some writers put "32767.0" in integer fields; accept integral decimals.
		f, ferr := strconv.ParseFloat(t, 64)
		if ferr != nil || f != float64(int64(f)) || !plainNumber(t) {
			return 0, p.err(field, sig, off, "an integer")
		}
		return int64(f), nil
	}
	return v, nil
}

// plainNumber reports whether t is an optionally signed decimal with at
// most one point: the only numeric form the EDF header allows.
func plainNumber(t string) bool {
	if t == "" {
		return false
	}
	if t[0] == '+' || t[0] == '-' {
		t = t[1:]
	}
	digits, dots := 0, 0
	for i := 0; i < len(t); i++ {
		switch c := t[i]; {
		case c >= '0' && c <= '9':
			digits++
		case c == '.':
			dots++
		default:
			return false
		}
	}
	return digits > 0 && dots <= 1
}

func (p *headerParser) float(field string, sig int, s string, off int) (float64, error) {
	t := strings.TrimSpace(s)
	if !plainNumber(t) {
		return 0, p.err(field, sig, off, "a decimal number")
	}
	v, err := strconv.ParseFloat(t, 64)
	if err != nil {
		return 0, p.err(field, sig, off, "a decimal number")
	}
	return v, nil
}

// ReadHeader reads and checks the header record of an EDF, EDF+, BDF or
// BDF+ file from r, consuming exactly HeaderBytes bytes. name is used only
// in errors. Checks on the file size are left to NewReader and Inspect.
func ReadHeader(r io.Reader, name string) (*Header, error) {
	fixed := make([]byte, fixedBytes)
	n, err := io.ReadFull(r, fixed)
	if err != nil {
		if errors.Is(err, io.EOF) || errors.Is(err, io.ErrUnexpectedEOF) {
			f := fixedFieldAt(n)
			return nil, &FieldError{File: name, Field: f.name, Signal: -1, Offset: int64(n),
				Value: "", Want: fmt.Sprintf("a %d-byte header record, file ends at byte %d", fixedBytes, n)}
		}
		return nil, err
	}
	p := &headerParser{name: name, b: fixed}
	h := &Header{}
	if err := p.parseFixed(h); err != nil {
		return nil, err
	}
	rest := make([]byte, p.ns*256)
	if n, err := io.ReadFull(r, rest); err != nil {
		if errors.Is(err, io.EOF) || errors.Is(err, io.ErrUnexpectedEOF) {
			return nil, &FieldError{File: name, Field: "number of bytes in header record", Signal: -1,
				Offset: int64(fixedBytes + n), Value: strconv.Itoa(h.HeaderBytes),
				Want: fmt.Sprintf("a %d-byte header record, file ends at byte %d", h.HeaderBytes, fixedBytes+n)}
		}
		return nil, err
	}
	p.b = append(fixed, rest...)
	if err := p.parseSignals(h); err != nil {
		return nil, err
	}
	commonReference(h)
	recoverElectrodes(h)
	if p.nulPad {
		h.Warnings = append(h.Warnings, "header fields padded with NUL bytes instead of spaces; read as spaces")
	}
	return h, nil
}

func fixedFieldAt(off int) struct {
	name       string
	off, width int
} {
	for _, f := range fixedFields {
		if off < f.off+f.width {
			return f
		}
	}
	return fixedFields[len(fixedFields)-1]
}

func (p *headerParser) parseFixed(h *Header) error {
	version, _ := p.fixed(0)
	var bdf bool
	switch version {
	case edfVersion:
	case bdfVersion:
		bdf = true
	default:
		return p.err("version", -1, 0, `"0" padded with spaces (EDF) or 0xFF "BIOSEMI" (BDF)`)
	}
	h.Version = strings.TrimSpace(version)
	// Every other fixed field must be printable US-ASCII; the free-text
	// ones are read as Latin-1 when they are not (fixedText).
	for i := 1; i < len(fixedFields); i++ {
		if fixedText[i] {
			continue
		}
		s, off := p.fixed(i)
		if j := ascii(s); j >= 0 {
			return p.err(fixedFields[i].name, -1, off, "printable US-ASCII (byte "+strconv.Itoa(off+j)+" is not)")
		}
	}
	text := func(i int) string {
		s, _ := p.fixed(i)
		t, odd := latin1Text(s)
		if odd {
			h.Warnings = append(h.Warnings, fmt.Sprintf("%s holds bytes outside printable US-ASCII; read as Latin-1", fixedFields[i].name))
		}
		return t
	}
	h.PatientID = strings.TrimSpace(text(1))
	h.RecordingID = strings.TrimSpace(text(2))

	s := text(6)
	_, off := p.fixed(6)
	h.Reserved = strings.TrimSpace(s)
	switch {
	case !bdf && strings.HasPrefix(s, "EDF+C"):
		h.Format = EDFPlusC
	case !bdf && strings.HasPrefix(s, "EDF+D"):
		h.Format = EDFPlusD
	case !bdf && (strings.HasPrefix(s, "BDF+") || strings.HasPrefix(s, "24BIT")):
		return p.err("reserved", -1, off, `an EDF marker ("EDF+C", "EDF+D" or spaces) under the EDF version "0"; BDF files start with 0xFF "BIOSEMI"`)
	case !bdf:
		h.Format = EDF
	case strings.HasPrefix(s, "BDF+C"):
		h.Format = BDFPlusC
	case strings.HasPrefix(s, "BDF+D"):
		h.Format = BDFPlusD
	case strings.HasPrefix(s, "EDF+C"):
		h.Format = BDFPlusC
		h.Warnings = append(h.Warnings, `BDF file marked "EDF+C"; read as BDF+C`)
	case strings.HasPrefix(s, "EDF+D"):
		h.Format = BDFPlusD
		h.Warnings = append(h.Warnings, `BDF file marked "EDF+D"; read as BDF+D`)
	default:
		h.Format = BDF
	}

	s, off = p.fixed(5)
	hb, err := p.int("number of bytes in header record", -1, s, off)
	if err != nil {
		return err
	}
	s, off = p.fixed(9)
	ns, err := p.int("number of signals", -1, s, off)
	if err != nil {
		return err
	}
	if ns < 1 || ns > maxSignals {
		return p.err("number of signals", -1, off, fmt.Sprintf("between 1 and %d", maxSignals))
	}
	p.ns = int(ns)
	if hb != 256*(ns+1) {
		_, off = p.fixed(5)
		return p.err("number of bytes in header record", -1, off,
			fmt.Sprintf("256×(ns+1) = %d for ns = %d", 256*(ns+1), ns))
	}
	h.HeaderBytes = int(hb)

	s, off = p.fixed(7)
	nr, err := p.int("number of data records", -1, s, off)
	if err != nil {
		return err
	}
	switch {
	case nr == unknownRecs:
	case nr < 1:
		return p.err("number of data records", -1, off, "at least one data record (or -1 while recording)")
	}
	h.NumRecords = nr

	s, off = p.fixed(8)
	dur, err := p.float("duration of a data record", -1, s, off)
	if err != nil {
		return err
	}
	if dur < 0 {
		return p.err("duration of a data record", -1, off, "a non-negative number of seconds")
	}
	h.RecordDuration = dur

	start, err := p.start(h)
	if err != nil {
		return err
	}
	h.Start = start
	return nil
}

var months = map[string]time.Month{"JAN": 1, "FEB": 2, "MAR": 3, "APR": 4, "MAY": 5, "JUN": 6,
	"JUL": 7, "AUG": 8, "SEP": 9, "OCT": 10, "NOV": 11, "DEC": 12}

// start parses startdate dd.mm.yy and starttime hh.mm.ss. The two-digit
// year is clipped per Kemp & Olivan (2003) section 2.1.3.2: 85–99 → 19yy,
// 00–84 → 20yy. In EDF+ the recording identification may begin with
// "Startdate dd-MMM-yyyy"; its four-digit year then wins, which is also
// the only way to express years after 2084 (startdate "yy").
func (p *headerParser) start(h *Header) (time.Time, error) {
	ds, doff := p.fixed(3)
	ts, toff := p.fixed(4)
	two := func(s string, i int) (int, bool) {
		if s[i] < '0' || s[i] > '9' || s[i+1] < '0' || s[i+1] > '9' {
			return 0, false
		}
		return int(s[i]-'0')*10 + int(s[i+1]-'0'), true
	}
	hh, ok1 := two(ts, 0)
	mi, ok2 := two(ts, 3)
	ss, ok3 := two(ts, 6)
	if !ok1 || !ok2 || !ok3 || ts[2] != '.' || ts[5] != '.' || hh > 23 || mi > 59 || ss > 59 {
		return time.Time{}, p.err("starttime of recording", -1, toff, "hh.mm.ss")
	}
	dd, ok1 := two(ds, 0)
	mm, ok2 := two(ds, 3)
	yy, ok3 := two(ds, 6)
	yyLiteral := ds[6:8] == "yy"
	if !ok1 || !ok2 || (!ok3 && !yyLiteral) || ds[2] != '.' || ds[5] != '.' || dd < 1 || dd > 31 || mm < 1 || mm > 12 {
		return time.Time{}, p.err("startdate of recording", -1, doff, "dd.mm.yy")
	}
	year := 2000 + yy
	if yy >= 85 {
		year = 1900 + yy
	}
	if h.Format.IsPlus() {
		if y, m, d, ok := recordingStartdate(h.RecordingID); ok {
			if int(m) != mm || d != dd || (!yyLiteral && y%100 != yy) {
				h.Warnings = append(h.Warnings, fmt.Sprintf("recording identification startdate %02d-%s-%04d disagrees with startdate %s; used the latter", d, m.String()[:3], y, ds))
			} else {
				year = y
			}
		} else if yyLiteral {
			return time.Time{}, p.err("startdate of recording", -1, doff, `"yy" only with "Startdate dd-MMM-yyyy" in the recording identification`)
		}
	} else if yyLiteral {
		return time.Time{}, p.err("startdate of recording", -1, doff, "dd.mm.yy")
	}
	t := time.Date(year, time.Month(mm), dd, hh, mi, ss, 0, time.UTC)
	if t.Day() != dd {
		return time.Time{}, p.err("startdate of recording", -1, doff, "a calendar date dd.mm.yy")
	}
	return t, nil
}

// recordingStartdate extracts "Startdate dd-MMM-yyyy" from an EDF+
// recording identification (Kemp & Olivan 2003, section 2.1.3.3).
func recordingStartdate(rec string) (int, time.Month, int, bool) {
	f := strings.Fields(rec)
	if len(f) < 2 || f[0] != "Startdate" || len(f[1]) != 11 || f[1][2] != '-' || f[1][6] != '-' {
		return 0, 0, 0, false
	}
	d, err1 := strconv.Atoi(f[1][0:2])
	m, ok := months[strings.ToUpper(f[1][3:6])]
	y, err2 := strconv.Atoi(f[1][7:11])
	if err1 != nil || err2 != nil || !ok {
		return 0, 0, 0, false
	}
	return y, m, d, true
}

func (p *headerParser) parseSignals(h *Header) error {
	ns := p.ns
	h.Signals = make([]Signal, ns)
	for k := range signalFields {
		if signalText[k] {
			continue
		}
		for i := 0; i < ns; i++ {
			s, off := p.sigField(k, i)
			if j := ascii(s); j >= 0 {
				return p.err(signalFields[k].name, i, off, "printable US-ASCII (byte "+strconv.Itoa(off+j)+" is not)")
			}
		}
	}
	var odd [len(signalText)]int // signals whose free-text field k was not ASCII
	text := func(k, i int) string {
		s, _ := p.sigField(k, i)
		t, changed := latin1Text(s)
		if changed {
			odd[k]++
		}
		return t
	}
	defer func() {
		for k, n := range odd {
			if n > 0 {
				h.Warnings = append(h.Warnings, fmt.Sprintf("%s of %d signal(s) holds bytes outside printable US-ASCII; read as Latin-1", signalFields[k].name, n))
			}
		}
	}()
	lo, hi := int64(-32768), int64(32767)
	if h.Format.Is24Bit() {
		lo, hi = int24Min, int24Max
	}
	allAnnot := true
	for i := 0; i < ns; i++ {
		sg := &h.Signals[i]
		sg.Label = strings.TrimSpace(text(0, i))
		sg.Name, sg.Kind = NormalizeLabel(sg.Label)
		sg.Transducer = strings.TrimSpace(text(1, i))
		sg.PhysDim = strings.TrimSpace(text(2, i))
		var err error
		s, off := p.sigField(3, i)
		if sg.PhysMin, err = p.float("physical minimum", i, s, off); err != nil {
			return err
		}
		s, off = p.sigField(4, i)
		if sg.PhysMax, err = p.float("physical maximum", i, s, off); err != nil {
			return err
		}
		s, off = p.sigField(5, i)
		dmin, err := p.int("digital minimum", i, s, off)
		if err != nil {
			return err
		}
		if dmin < lo || dmin > hi {
			return p.err("digital minimum", i, off, fmt.Sprintf("an integer in [%d, %d]", lo, hi))
		}
		s, off = p.sigField(6, i)
		dmax, err := p.int("digital maximum", i, s, off)
		if err != nil {
			return err
		}
		if dmax < lo || dmax > hi {
			return p.err("digital maximum", i, off, fmt.Sprintf("an integer in [%d, %d]", lo, hi))
		}
		sg.DigMin, sg.DigMax = int(dmin), int(dmax)
		sg.Prefilter = strings.TrimSpace(text(7, i))
		s, off = p.sigField(8, i)
		spr, err := p.int("nr of samples in each data record", i, s, off)
		if err != nil {
			return err
		}
		if spr < 1 || spr > 1<<24 {
			return p.err("nr of samples in each data record", i, off, "a positive integer")
		}
		sg.SamplesPerRecord = int(spr)
		sg.Reserved = strings.TrimSpace(text(9, i))

		if sg.IsAnnotation() {
			if !h.Format.IsPlus() {
				h.Warnings = append(h.Warnings, fmt.Sprintf("signal %d is %q in a plain %s file; treated as annotations", i, annotLabel, h.Format))
			}
			continue
		}
		allAnnot = false
		if dmin >= dmax {
			_, off = p.sigField(5, i)
			return p.err("digital minimum", i, off, fmt.Sprintf("less than digital maximum %d", dmax))
		}
		if sg.PhysMin == sg.PhysMax {
			h.Warnings = append(h.Warnings, fmt.Sprintf("signal %d (%s): physical minimum equals maximum; every sample reads %g", i, sg.Label, sg.PhysMin))
		}
	}
	if h.RecordDuration == 0 && !allAnnot {
		_, off := p.fixed(8)
		return p.err("duration of a data record", -1, off, "a positive number of seconds (0 only for annotation-only files)")
	}
	if h.Format.IsPlus() && firstAnnotation(h) < 0 {
		h.Warnings = append(h.Warnings, fmt.Sprintf("%s file has no %q signal; records taken as contiguous from the start time", h.Format, annotLabel))
	}
	return nil
}

// firstAnnotation returns the index of the first annotation signal, or -1.
func firstAnnotation(h *Header) int {
	for i := range h.Signals {
		if h.Signals[i].IsAnnotation() {
			return i
		}
	}
	return -1
}
