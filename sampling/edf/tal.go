package edf

import (
	"strconv"
)

// TAL is one Time-stamped Annotation List (Kemp & Olivan 2003, section
// 2.2.2): an onset in seconds relative to the file start time, an optional
// duration, and zero or more annotation texts sharing them. The first TAL
// of each data record carries an empty first text: the record's
// time-keeping annotation (section 2.2.4).
type TAL struct {
	Onset       float64
	Duration    float64
	HasDuration bool
	Texts       []string
}

// Annotation is one annotation text with its timing, located in data
// record Record.
type Annotation struct {
	Onset       float64 // seconds from the header start time
	Duration    float64
	HasDuration bool
	Text        string
	Record      int64
}

const (
	talDur  = 0x15 // precedes the duration
	talSep  = 0x14 // ends the onset/duration and every annotation text
	talEnd  = 0x00 // ends a TAL; also pads the rest of the signal
	talWant = "a TAL: +onset[\\x15duration]\\x14[text\\x14]...\\x00"
)

// ParseTAL parses the bytes of one "EDF Annotations" signal in one data
// record: consecutive TALs of the form
//
//	+onset[\x15duration]\x14[text\x14]...\x00
//
// followed by zero padding. Onset carries a mandatory sign, the duration
// none; both are plain decimals. Texts are returned as stored (UTF-8 per
// the specification, not checked). Errors are *FieldError values whose
// Offset is relative to b.
func ParseTAL(b []byte) ([]TAL, error) {
	var out []TAL
	p := 0
	for p < len(b) && b[p] != talEnd {
		start := p
		bad := func(at int, want string) error {
			end := at + 16
			if end > len(b) {
				end = len(b)
			}
			return &FieldError{Field: "annotation", Signal: -1, Offset: int64(at), Value: string(b[start:end]), Want: want}
		}
		if b[p] != '+' && b[p] != '-' {
			return out, bad(p, "onset starting with '+' or '-' in "+talWant)
		}
		q := p + 1
		for q < len(b) && isNumByte(b[q]) {
			q++
		}
		onset, ok := parseDecimal(b[p:q], true)
		if !ok {
			return out, bad(p, "a decimal onset in "+talWant)
		}
		t := TAL{Onset: onset}
		if q < len(b) && b[q] == talDur {
			r := q + 1
			for r < len(b) && isNumByte(b[r]) {
				r++
			}
			d, ok := parseDecimal(b[q+1:r], false)
			if !ok {
				return out, bad(q+1, "an unsigned decimal duration after \\x15 in "+talWant)
			}
			t.Duration, t.HasDuration = d, true
			q = r
		}
		if q >= len(b) || b[q] != talSep {
			return out, bad(q, "\\x14 after the onset in "+talWant)
		}
		q++
		// Texts up to the terminating \x00; each ends with \x14.
		for {
			if q >= len(b) {
				return out, bad(q, "\\x00 ending the TAL")
			}
			if b[q] == talEnd {
				q++
				break
			}
			r := q
			for r < len(b) && b[r] != talSep && b[r] != talEnd {
				r++
			}
			if r >= len(b) || b[r] != talSep {
				return out, bad(r, "\\x14 ending the annotation text")
			}
			t.Texts = append(t.Texts, string(b[q:r]))
			q = r + 1
		}
		out = append(out, t)
		p = q
	}
	return out, nil
}

func isNumByte(c byte) bool { return c >= '0' && c <= '9' || c == '.' || c == '+' || c == '-' }

// parseDecimal parses [sign]digits[.digits]; signed requires the sign.
func parseDecimal(s []byte, signed bool) (float64, bool) {
	t := string(s)
	if signed {
		if len(t) == 0 || (t[0] != '+' && t[0] != '-') {
			return 0, false
		}
		if !plainNumber(t) {
			return 0, false
		}
	} else if len(t) == 0 || t[0] == '+' || t[0] == '-' || !plainNumber(t) {
		return 0, false
	}
	v, err := strconv.ParseFloat(t, 64)
	return v, err == nil
}

// formatTAL appends one TAL, for the writer.
func formatTAL(b []byte, onset float64, dur float64, hasDur bool, texts ...string) []byte {
	if onset == 0 {
		onset = 0 // -0 would print as "-0" after the '+'
	}
	if onset >= 0 {
		b = append(b, '+')
	}
	b = strconv.AppendFloat(b, onset, 'f', -1, 64)
	if hasDur {
		b = append(b, talDur)
		b = strconv.AppendFloat(b, dur, 'f', -1, 64)
	}
	b = append(b, talSep)
	for _, t := range texts {
		b = append(b, t...)
		b = append(b, talSep)
	}
	return append(b, talEnd)
}
