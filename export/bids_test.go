package export

import (
	"encoding/json"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"
)

// TestBIDSEventsRules checks the written tree against the BIDS specification's rules
// (v1.9.0; EEG extension, Pernet et al. 2019): events files named
// sub-<label>_task-<label>_run-<index>_events.tsv under sub-<label>/eeg; onset and
// duration the first two columns, in seconds, duration zero or positive or n/a; missing
// values written n/a; labels alphanumeric; channels.tsv starting name, type, units with
// BIDS EEG channel types; dataset_description.json with Name and BIDSVersion, and
// GeneratedBy for a derivative.
func TestBIDSEventsRules(t *testing.T) {
	f := newFixture(t, 30)
	dir, _ := runExport(t, f.opts, "bids", false)
	files, _ := filepath.Glob(filepath.Join(dir, "sub-*", "eeg", "*_events.tsv"))
	if len(files) != 2 {
		t.Fatalf("%d events files, want one per recording with events (2)", len(files))
	}
	name := regexp.MustCompile(`^sub-([a-zA-Z0-9]+)_task-[a-zA-Z0-9]+_run-[0-9]+_events\.tsv$`)
	var sidecar map[string]map[string]any
	b, err := os.ReadFile(filepath.Join(dir, "task-"+BIDSTask+"_events.json"))
	if err != nil {
		t.Fatal(err)
	}
	if err := json.Unmarshal(b, &sidecar); err != nil {
		t.Fatal(err)
	}
	rowsSeen := 0
	for _, p := range files {
		m := name.FindStringSubmatch(filepath.Base(p))
		if m == nil {
			t.Fatalf("%s: not a BIDS events file name", p)
		}
		if filepath.Base(filepath.Dir(filepath.Dir(p))) != "sub-"+m[1] {
			t.Errorf("%s: not under sub-%s/eeg", p, m[1])
		}
		rows := readTSV(t, p)
		if rows[0][0] != "onset" || rows[0][1] != "duration" {
			t.Fatalf("%s: first columns %v, want onset, duration", p, rows[0][:2])
		}
		for _, col := range rows[0] {
			if _, ok := sidecar[col]; !ok {
				t.Errorf("column %s not described in the events.json sidecar", col)
			}
		}
		prev := -1.0
		for _, r := range rows[1:] {
			rowsSeen++
			if len(r) != len(rows[0]) {
				t.Fatalf("%s: row of %d cells, header %d", p, len(r), len(rows[0]))
			}
			on, err := strconv.ParseFloat(r[0], 64)
			if err != nil || on < prev {
				t.Errorf("%s: onset %q not a number in order", p, r[0])
			}
			prev = on
			if r[1] != "n/a" {
				if d, err := strconv.ParseFloat(r[1], 64); err != nil || d < 0 {
					t.Errorf("%s: duration %q", p, r[1])
				}
			}
			for i, c := range r {
				if c == "" {
					t.Errorf("%s: empty cell in column %s, want n/a", p, rows[0][i])
				}
			}
		}
		ch := readTSV(t, strings.Replace(p, "_events.tsv", "_channels.tsv", 1))
		if strings.Join(ch[0][:3], ",") != "name,type,units" {
			t.Errorf("channels.tsv starts %v", ch[0])
		}
		types := map[string]int{}
		for _, r := range ch[1:] {
			types[r[1]]++
		}
		if types["EEG"] != 21 || types["ECG"] != 1 || len(ch) != 23 {
			t.Errorf("channel types %v, want 21 EEG and 1 ECG", types)
		}
	}
	if rowsSeen != len(f.opts.Draw) {
		t.Errorf("%d event rows, want %d", rowsSeen, len(f.opts.Draw))
	}
	var desc map[string]any
	b, _ = os.ReadFile(filepath.Join(dir, DatasetDescriptionFile))
	if err := json.Unmarshal(b, &desc); err != nil {
		t.Fatal(err)
	}
	if desc["Name"] == nil || desc["BIDSVersion"] == nil || desc["DatasetType"] != "derivative" || desc["GeneratedBy"] == nil {
		t.Errorf("dataset_description.json: %v", desc)
	}
}

func TestBIDSLabel(t *testing.T) {
	for in, want := range map[string]string{"sub-0a1b2c3d4e5f6789": "0a1b2c3d4e5f6789", "sub-ab_c-d.1": "abcd1"} {
		if got := BIDSLabel(in); got != want {
			t.Errorf("BIDSLabel(%q) = %q, want %q", in, got, want)
		}
	}
}

// TestTSVCellOneLine: BIDS TSV has no quoting, so a tab or line break inside a value
// would split it; they become spaces, and an empty value is n/a.
func TestTSVCellOneLine(t *testing.T) {
	for in, want := range map[string]string{"a\tb\nc\rd": "a b c d", "": "n/a", "T7;P7": "T7;P7"} {
		if got := tsvCell(in); got != want {
			t.Errorf("tsvCell(%q) = %q, want %q", in, got, want)
		}
	}
}
