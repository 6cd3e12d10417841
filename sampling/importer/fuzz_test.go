package importer

import (
	"bytes"
	"regexp"
	"testing"
)

// FuzzReadCSV feeds arbitrary bytes through the CSV/TSV and BIDS readers and places
// every event: nothing may panic, and every rejection must say where and why.
func FuzzReadCSV(f *testing.F) {
	f.Add([]byte(teamCSV), uint8(0))
	f.Add([]byte("recording;onset;score\nrec-aaaa;23:59:59.999;0,5\n"), uint8(1))
	f.Add([]byte("onset\tduration\ttrial_type\n1\tn/a\tspike\n\"x\t2\n"), uint8(2))
	f.Add([]byte("\xef\xbb\xbf\"a\"\"\",b\r\nrec-bbbb,2024-03-02T00:00:01+01:00\n"), uint8(3))
	rs := newResolver(testRecordings())
	pattern := regexp.MustCompile("(?i)spike")
	f.Fuzz(func(t *testing.T, data []byte, mode uint8) {
		m := Mapping{OnsetFormat: []OnsetFormat{OnsetAuto, OnsetSeconds, OnsetClock}[mode%3]}
		var evs []event
		var rej []Rejection
		var err error
		switch mode % 4 {
		case 0:
			evs, rej, err = readCSV(bytes.NewReader(data), "f.csv", 0, m, -1)
		case 1:
			evs, rej, err = readCSV(bytes.NewReader(data), "f.csv", ';', m, 1)
		case 2:
			evs, rej, _, err = readBIDS(bytes.NewReader(data), "sub-07_task-sleep_run-1_events.tsv", m, pattern, 3, "", "")
		default:
			evs, rej, _, err = readBIDS(bytes.NewReader(data), "e.tsv", m, nil, -1, "", "no recording")
		}
		if err != nil {
			return
		}
		for _, ev := range evs {
			p, r := place(ev, rs)
			if r != nil {
				rej = append(rej, *r)
				continue
			}
			if d := rs.recs[p.rec].DurationS; !(p.onset >= 0 && p.onset <= d) {
				t.Fatalf("placed onset %g outside [0, %g]", p.onset, d)
			}
		}
		for _, r := range rej {
			if r.Line < 1 || r.Want == "" || r.File == "" {
				t.Fatalf("rejection without place or reason: %+v", r)
			}
		}
	})
}
