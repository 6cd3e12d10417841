package importer

import (
	"fmt"
	"path/filepath"
	"slices"
	"strings"

	"github.com/quorate-eeg/quorate/sampling/archive"
)

// placed is an event tied to a recording and a time.
type placed struct {
	rec     int
	onset   float64 // seconds from the recording start
	channel string
	score   float64
	file    string
	line    int
}

// place resolves an event's recording and onset, or says why it cannot.
func place(ev event, res *resolver) (placed, *Rejection) {
	reject := func(field, value, want string) (placed, *Rejection) {
		return placed{}, &Rejection{File: ev.file, Line: ev.line, Field: field, Value: value, Want: want}
	}
	rec := ev.rec
	if rec < 0 {
		if ev.recKey == "" && ev.recWhy != "" {
			return reject("recording", filepath.Base(ev.file), ev.recWhy)
		}
		var want string
		if rec, want = res.find(ev.recKey); want != "" {
			return reject(ev.recField, ev.recKey, want)
		}
	}
	r := res.recs[rec]
	p := placed{rec: rec, channel: ev.channel, score: ev.score, file: ev.file, line: ev.line}
	clock := false
	switch {
	case ev.numeric:
		p.onset = ev.seconds
	case isNA(ev.onset):
		return reject(ev.onsetField, ev.onset, "an onset; it is required")
	case ev.format == OnsetClock || ev.format == OnsetAuto && strings.Contains(ev.onset, ":"):
		c, ok := parseClock(ev.onset)
		if !ok {
			return reject(ev.onsetField, ev.onset, "a clock time HH:MM:SS[.fff] or an RFC 3339 date-time (2006-01-02T15:04:05Z)")
		}
		p.onset, clock = c.offset(r.StartTime), true
	default:
		s, ok := parseSeconds(ev.onset)
		if !ok {
			return reject(ev.onsetField, ev.onset, "seconds from the recording start (a decimal number with a dot)")
		}
		p.onset = s
	}
	if p.onset < 0 || p.onset > r.DurationS {
		if clock {
			return reject(ev.onsetField, ev.onset, span(r.StartTime, r.DurationS)+" "+r.RecordingID)
		}
		return reject(ev.onsetField, ev.onset, fmt.Sprintf("an onset from 0 to %g s, the duration of %s", r.DurationS, r.RecordingID))
	}
	return p, nil
}

// samplePeriod is the recording's finest sample period; one millisecond when the index
// lists no EEG rate (common practice: below any EEG event's duration).
func samplePeriod(r archive.Recording) float64 {
	rate := 0.0
	for _, x := range r.SampleRatesHz {
		rate = max(rate, x)
	}
	if rate <= 0 {
		return 1e-3
	}
	return 1 / rate
}

// mergeDuplicates sorts one recording's events by onset and merges each run of events
// lying within one sample period of the run's first event: the merged event keeps the
// first onset, the largest score (NaN scores count as missing), and the channel of the
// event that gave that score (else the first channel given). It returns the merged
// events and how many were folded away.
func mergeDuplicates(ps []placed, period float64) ([]placed, int) {
	slices.SortStableFunc(ps, func(a, b placed) int {
		switch {
		case a.onset < b.onset:
			return -1
		case a.onset > b.onset:
			return 1
		}
		return 0
	})
	var out []placed
	merged := 0
	// Onsets written in decimal seconds rarely land exactly on a sample; the slack keeps
	// "exactly one sample apart" from depending on rounding.
	const slack = 1e-9
	for _, p := range ps {
		if n := len(out); n > 0 && p.onset-out[n-1].onset <= period+slack {
			q := &out[n-1]
			if p.score == p.score && (q.score != q.score || p.score > q.score) {
				q.score = p.score
				if p.channel != "" {
					q.channel = p.channel
				}
			} else if q.channel == "" {
				q.channel = p.channel
			}
			merged++
			continue
		}
		out = append(out, p)
	}
	return out, merged
}
