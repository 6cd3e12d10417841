package importer

import (
	"fmt"
	"strconv"
	"strings"
	"time"
)

const day = 24 * time.Hour

// clockValue is a clock onset as written: a time of day, or a full date-time.
type clockValue struct {
	ofDay time.Duration // since midnight, when !dated
	at    time.Time     // wall clock as written, zone dropped, when dated
	dated bool
}

// parseClock reads HH:MM:SS[.fff] (hours 0–23, one or two digits) or an RFC 3339
// date-time (RFC 3339, section 5.6; the T may be a space, as section 5.6's note
// allows, and the zone offset may be missing).
func parseClock(s string) (clockValue, bool) {
	s = strings.TrimSpace(s)
	if len(s) >= 10 && s[4] == '-' {
		for _, layout := range []string{time.RFC3339Nano, "2006-01-02T15:04:05.999999999",
			"2006-01-02 15:04:05.999999999Z07:00", "2006-01-02 15:04:05.999999999"} {
			if t, err := time.Parse(layout, s); err == nil {
				// EDF stores the local wall clock of the recording site with no zone, so
				// the wall clock as written is what can be compared with it.
				w := time.Date(t.Year(), t.Month(), t.Day(), t.Hour(), t.Minute(), t.Second(), t.Nanosecond(), time.UTC)
				return clockValue{at: w, dated: true}, true
			}
		}
		return clockValue{}, false
	}
	hms, frac, _ := strings.Cut(s, ".")
	f := strings.Split(hms, ":")
	if len(f) != 3 || len(f[0]) < 1 || len(f[0]) > 2 || len(f[1]) != 2 || len(f[2]) != 2 {
		return clockValue{}, false
	}
	var v [3]int
	for i, x := range f {
		n, err := strconv.Atoi(x)
		if err != nil || n < 0 || x[0] == '+' || x[0] == '-' {
			return clockValue{}, false
		}
		v[i] = n
	}
	if v[0] > 23 || v[1] > 59 || v[2] > 59 {
		return clockValue{}, false
	}
	d := time.Duration(v[0])*time.Hour + time.Duration(v[1])*time.Minute + time.Duration(v[2])*time.Second
	if strings.Contains(s, ".") {
		if frac == "" || len(frac) > 9 {
			return clockValue{}, false
		}
		n, err := strconv.Atoi(frac)
		if err != nil || frac[0] == '+' || frac[0] == '-' {
			return clockValue{}, false
		}
		for range 9 - len(frac) {
			n *= 10
		}
		d += time.Duration(n)
	}
	return clockValue{ofDay: d}, true
}

// offset is the clock value's time after start, in seconds. A time of day is taken at
// its first occurrence at or after start: a value earlier in the day than the start
// belongs to the next day, which is how a recording that runs past midnight is read.
// A recording longer than a day makes a time of day ambiguous; its first occurrence is
// used, so such recordings need date-times.
func (c clockValue) offset(start time.Time) float64 {
	if c.dated {
		return c.at.Sub(start).Seconds()
	}
	y, m, d := start.Date()
	midnight := time.Date(y, m, d, 0, 0, 0, 0, start.Location())
	since := start.Sub(midnight)
	off := c.ofDay - since
	if off < 0 {
		off += day
	}
	return off.Seconds()
}

// span describes a recording's clock span for error messages.
func span(start time.Time, durationS float64) string {
	end := start.Add(time.Duration(durationS * float64(time.Second)))
	next := ""
	if days := int(end.Sub(start.Truncate(day)) / day); days > 0 {
		next = fmt.Sprintf(" (+%d day)", days)
	}
	return fmt.Sprintf("a clock time from %s to %s%s, the recording's span", start.Format("15:04:05.000"), end.Format("15:04:05.000"), next)
}
