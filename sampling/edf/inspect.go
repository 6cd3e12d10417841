package edf

import (
	"fmt"
	"io"
	"slices"
	"strings"
	"time"
)

// Summary is what an archive index records about one file.
type Summary struct {
	Name            string
	Format          Format
	Start           time.Time
	Duration        float64 // seconds: records × record duration, or the end of the last EDF+D segment
	NumRecords      int64
	RecordDuration  float64   // seconds
	EEG             []string  // normalised names of the EEG signals, in file order
	EEGRates        []float64 // distinct sample rates of the EEG signals, ascending, Hz
	Annotations     int       // annotation texts, time-keeping annotations excluded
	Discontinuities int       // gaps between EDF+D segments
	Warnings        []string
}

// Inspect reads the header of the size-byte file r and, for EDF+/BDF+
// files, the annotation signals of every data record, one record at a
// time, so memory does not depend on the recording's length. Ordinary
// signal samples are never read. Errors are those of NewReader, plus
// *FieldError values for malformed annotations and out-of-order EDF+D
// record onsets.
func Inspect(r io.ReaderAt, size int64, name string) (*Summary, error) {
	rd, err := NewReader(r, size, name)
	if err != nil {
		return nil, err
	}
	h := rd.Header()
	s := &Summary{Name: name, Format: h.Format, Start: h.Start, NumRecords: h.NumRecords,
		RecordDuration: h.RecordDuration, Duration: h.Duration()}
	s.Warnings = append(s.Warnings, h.Warnings...)

	var ignored, unknown []string
	seen := map[string]bool{}
	terms := h.TermSignals()
	for i := range h.Signals {
		sg := &h.Signals[i]
		switch sg.Kind {
		case EEG:
			if seen[sg.Name] {
				s.Warnings = append(s.Warnings, fmt.Sprintf("EEG electrode %s appears more than once (signal %d, %q)", sg.Name, i, sg.Label))
			}
			seen[sg.Name] = true
			s.EEG = append(s.EEG, sg.Name)
			if rate := sg.SampleRate(h.RecordDuration); !slices.Contains(s.EEGRates, rate) {
				s.EEGRates = append(s.EEGRates, rate)
			}
		case AnnotationSignal:
		case Other:
			if !slices.Contains(terms, i) {
				unknown = append(unknown, sg.Label)
			}
		default:
			ignored = append(ignored, sg.Label+" ("+sg.Kind.String()+")")
		}
	}
	for _, e := range h.Recovered {
		s.EEG = append(s.EEG, e.Name)
	}
	if rate, _ := h.RecoveredRate(); rate > 0 && !slices.Contains(s.EEGRates, rate) {
		s.EEGRates = append(s.EEGRates, rate)
	}
	slices.Sort(s.EEGRates)
	if len(ignored) > 0 {
		s.Warnings = append(s.Warnings, "non-EEG channels ignored: "+strings.Join(ignored, ", "))
	}
	if len(unknown) > 0 {
		s.Warnings = append(s.Warnings, "unknown labels, not treated as EEG: "+strings.Join(unknown, ", "))
	}
	if len(s.EEGRates) > 1 {
		s.Warnings = append(s.Warnings, fmt.Sprintf("EEG channels sampled at different rates: %v Hz", s.EEGRates))
	}
	if len(s.EEG) == 0 {
		s.Warnings = append(s.Warnings, "no EEG channels")
	}

	segments := 0
	var last Segment
	err = rd.walk(func(g Segment) { segments++; last = g }, func(a []Annotation) { s.Annotations += len(a) })
	if err != nil {
		return nil, err
	}
	if segments > 1 {
		s.Discontinuities = segments - 1
	}
	if h.Format.IsDiscontinuous() && segments > 0 {
		s.Duration = last.End()
	}
	return s, nil
}
