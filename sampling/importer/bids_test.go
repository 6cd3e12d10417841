package importer

import (
	"context"
	"math"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"github.com/quorate-eeg/quorate/sampling/candidate"
)

// TestReadBIDS checks the rules of BIDS task events (BIDS Specification, "Modality
// agnostic files", "Task events"): tab-separated; onset first and duration second, in
// seconds; onset required; duration zero, positive or n/a; "n/a" for missing values.
func TestReadBIDS(t *testing.T) {
	in := "onset\tduration\ttrial_type\tchannel\tvalue\n" +
		"1.23\t0.65\tSpike\tT7\t3\n" + // line 2
		"5.65\tn/a\tsharp wave\tn/a\tn/a\n" + // 3: duration missing is allowed
		"12.1\t2.0\tartifact\tFp1\tn/a\n" + // 4: left out by the pattern
		"n/a\t0\tspike\tT8\tn/a\n" + // 5: onset is required
		"20\t-1\tspike\tT8\tn/a\n" + // 6: negative duration
		"21\t0\tspike\n" // 7: short row
	pattern := regexp.MustCompile("(?i)spike|sharp")
	evs, rej, skipped, err := readBIDS(strings.NewReader(in), "sub-07_task-sleep_run-1_events.tsv", Mapping{}, pattern, 3, "", "")
	if err != nil {
		t.Fatal(err)
	}
	if skipped != 1 {
		t.Errorf("skipped %d, want 1", skipped)
	}
	if len(evs) != 2 || evs[0].seconds != 1.23 || evs[0].channel != "T7" || evs[1].seconds != 5.65 || evs[1].channel != "" {
		t.Errorf("events %+v", evs)
	}
	if !math.IsNaN(evs[0].score) || evs[0].rec != 3 || evs[0].line != 2 {
		t.Errorf("event 0 %+v: no score column mapped, recording 3, line 2", evs[0])
	}
	wantRej := []struct {
		line  int
		field string
	}{{5, "onset"}, {6, "duration"}, {7, "row"}}
	if len(rej) != len(wantRej) {
		t.Fatalf("rejections %+v", rej)
	}
	for i, w := range wantRej {
		if rej[i].Line != w.line || rej[i].Field != w.field {
			t.Errorf("rejection %d: %+v, want line %d field %s", i, rej[i], w.line, w.field)
		}
	}
	// A score column mapped by name.
	evs, _, _, err = readBIDS(strings.NewReader(in), "e.tsv", Mapping{Score: "value"}, nil, 0, "", "")
	if err != nil || len(evs) != 3 || evs[0].score != 3 {
		t.Errorf("mapped score: %v %+v", err, evs)
	}

	for _, c := range []struct{ header, col string }{
		{"duration\tonset\ttrial_type\n", "duration"},                // order matters
		{"onset,duration,trial_type\n", "onset,duration,trial_type"}, // not tab-separated
		{"onset\n", ""},
		{"onset\tduration\n", "trial_type"}, // the pattern needs trial_type
	} {
		_, _, _, err := readBIDS(strings.NewReader(c.header+"1\t1\n"), "h.tsv", Mapping{}, pattern, 0, "", "")
		if ce := as[*columnError](t, err); ce.Column != c.col {
			t.Errorf("%q: column %q, want %q", c.header, ce.Column, c.col)
		}
	}
}

func TestBIDSEntities(t *testing.T) {
	got := entityString(bidsEntities("/data/sub-07/eeg/sub-07_ses-night_task-sleep_run-1_events.tsv"))
	if got != "sub-07_ses-night_task-sleep_run-1" {
		t.Errorf("entities %q", got)
	}
	m := map[string]string{"sub-07": "rec-aaaa", "sub-07_run-1": "rec-bbbb", "sub-08": "rec-cccc"}
	if k, why := mapBIDS("sub-07_task-sleep_run-1_events.tsv", m); k != "rec-bbbb" || why != "" {
		t.Errorf("most specific: %q %q", k, why)
	}
	if k, _ := mapBIDS("sub-07_task-sleep_run-2_events.tsv", m); k != "rec-aaaa" {
		t.Errorf("subject only: %q", k)
	}
	if k, why := mapBIDS("sub-09_task-sleep_events.tsv", m); k != "" || why != "" {
		t.Errorf("no mapping: %q %q", k, why)
	}
	m["task-sleep_run-1"] = "rec-cccc"
	if _, why := mapBIDS("sub-07_task-sleep_run-1_events.tsv", m); !strings.Contains(why, "both apply") {
		t.Errorf("tie not refused: %q", why)
	}
}

// TestRunBIDS finds the recording from the file name (sub-07_task-sleep_run-1_eeg.edf in
// the index) and from a mapping.
func TestRunBIDS(t *testing.T) {
	dir := t.TempDir()
	f := writeFile(t, dir, "sub-07/eeg/sub-07_task-sleep_run-1_events.tsv",
		"onset\tduration\ttrial_type\n100\t0\tspike\n3700\t0\tspike\n")
	o := Options{Files: []string{f}, Kind: KindBIDS, Source: "bids-team", Recordings: testRecordings(),
		Measure: stubMeasure, OutDir: filepath.Join(dir, "candidates")}
	res, err := Run(context.Background(), o)
	if err != nil {
		t.Fatal(err)
	}
	if res.Kept != 1 || len(res.Rejected) != 1 || res.Rejected[0].Line != 3 {
		t.Fatalf("kept %d, rejected %+v", res.Kept, res.Rejected)
	}
	rows, err := candidate.Read(filepath.Join(dir, "candidates", "import=bids-team", "rec-dddd.parquet"))
	if err != nil || len(rows) != 1 || rows[0].OnsetS != 100 {
		t.Fatalf("%v %+v", err, rows)
	}

	// An explicit mapping overrides the file-name match; an unknown mapped key is a
	// rejection naming the key.
	o.Replace, o.BIDSRecordings = true, map[string]string{"sub-07": "rec-aaaa"}
	if res, err = Run(context.Background(), o); err != nil || len(res.Files) != 1 || filepath.Base(res.Files[0]) != "rec-aaaa.parquet" {
		t.Fatalf("mapped: %v %+v", err, res)
	}
	o.BIDSRecordings = map[string]string{"sub-07": "lost.edf"}
	if res, err = Run(context.Background(), o); err != nil || res.Kept != 0 || len(res.Rejected) != 2 || res.Rejected[0].Value != "lost.edf" {
		t.Fatalf("unknown mapped key: %v %+v", err, res)
	}
	// No file-name match and no mapping: every row says what to give.
	g := writeFile(t, dir, "sub-99_task-x_events.tsv", "onset\tduration\n1\t0\n")
	o.Files, o.BIDSRecordings = []string{g}, nil
	res, err = Run(context.Background(), o)
	if err != nil || len(res.Rejected) != 1 || !strings.Contains(res.Rejected[0].Want, "a recording given for the file") || res.Rejected[0].Field != "recording" {
		t.Fatalf("unmatched: %v %+v", err, res.Rejected)
	}
}
