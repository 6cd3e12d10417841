package importer

import (
	"context"
	"encoding/csv"
	"errors"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/quorate-eeg/quorate/sampling/archive"
	"github.com/quorate-eeg/quorate/sampling/candidate"
)

const teamCSV = "recording,onset,channel,score\n" +
	"PT01_night.edf,23:00:00,T7,0.8\n" + // 2: clock, 1800 s
	"rec-aaaa,1800.002,T8,0.95\n" + // 3: within 1/256 s of line 2: merged
	"ward1/pt02.edf,10,F7,0.5\n" + // 4
	"pt99.edf,10,F7,0.5\n" + // 5: unknown recording
	"rec-bbbb,601,F7,0.5\n" + // 6: past the end (600 s)
	"pt02.edf,10,F7,0.5\n" + // 7: ambiguous file name
	"rec-aaaa,01:00:00.25,,\n" // 8: after midnight: 9000.25 s

func TestRunCSV(t *testing.T) {
	dir := t.TempDir()
	f := writeFile(t, dir, "team.csv", teamCSV)
	out := filepath.Join(dir, "candidates")
	// A built-in table beside the import: ReadDir must read both.
	if err := candidate.Write(filepath.Join(out, "shard=0", "rec-aaaa.parquet"),
		[]candidate.Row{{EventID: "ev-builtin", RecordingID: "rec-aaaa", Source: "builtin", OnsetS: 1, Imported: math.NaN()}}); err != nil {
		t.Fatal(err)
	}
	o := Options{Files: []string{f}, Kind: KindCSV, Source: "team-a", Recordings: testRecordings(), Measure: stubMeasure, OutDir: out}
	res, err := Run(context.Background(), o)
	if err != nil {
		t.Fatal(err)
	}
	if res.Read != 7 || res.Merged != 1 || res.Kept != 3 || len(res.Rejected) != 3 {
		t.Fatalf("read %d merged %d kept %d rejected %+v", res.Read, res.Merged, res.Kept, res.Rejected)
	}
	for i, w := range []struct {
		line  int
		field string
		want  string
	}{
		{5, "recording", "indexed recording"},
		{6, "onset", "from 0 to 600 s"},
		{7, "recording", "rec-bbbb, rec-cccc"},
	} {
		r := res.Rejected[i]
		if r.File != f || r.Line != w.line || r.Field != w.field || !strings.Contains(r.Want, w.want) {
			t.Errorf("rejection %d: %+v, want line %d field %s mentioning %q", i, r, w.line, w.field, w.want)
		}
	}

	all, err := candidate.ReadDir(out)
	if err != nil {
		t.Fatal(err)
	}
	var imp []candidate.Row
	for _, r := range all {
		if r.Source == "import:team-a" {
			imp = append(imp, r)
		}
	}
	if len(all) != 4 || len(imp) != 3 {
		t.Fatalf("read %d rows, %d imported: %+v", len(all), len(imp), all)
	}
	a := imp[0] // rec-aaaa at 1800 s: the merged pair keeps the first onset and the best score
	if a.RecordingID != "rec-aaaa" || a.SubjectKey != "subj-1" || a.OnsetS != 1800 || a.Imported != 0.95 || a.PeakChannel != "T8" {
		t.Errorf("merged row %+v", a)
	}
	// 1800 s at 256 Hz is sample 460800.
	if a.EventID != candidate.EventID("rec-aaaa", "import:team-a", 460800) {
		t.Errorf("event id %s", a.EventID)
	}
	if imp[1].OnsetS != 9000.25 || !math.IsNaN(imp[1].Imported) || imp[1].PeakChannel != "" {
		t.Errorf("after midnight %+v", imp[1])
	}
	if imp[2].RecordingID != "rec-bbbb" || imp[2].OnsetS != 10 {
		t.Errorf("rec-bbbb row %+v", imp[2])
	}

	// rejected.csv lists the same rejections.
	rf, err := os.Open(filepath.Join(out, "import=team-a", RejectsFile))
	if err != nil {
		t.Fatal(err)
	}
	recs, err := csv.NewReader(rf).ReadAll()
	rf.Close()
	if err != nil || len(recs) != 4 || strings.Join(recs[0], ",") != "file,line,field,value,want" || recs[2][1] != "6" || recs[2][3] != "601" {
		t.Errorf("rejected.csv %v %q", err, recs)
	}

	// A second import of the same source needs Replace, which drops tables no longer produced.
	if _, err := Run(context.Background(), o); err == nil {
		t.Fatal("overwrote an earlier import without Replace")
	} else {
		as[*ExistsError](t, err)
	}
	g := writeFile(t, dir, "team2.tsv", "recording\tonset\nrec-bbbb\t20\n")
	o.Files, o.Kind, o.Replace = []string{g}, KindTSV, true
	res, err = Run(context.Background(), o)
	if err != nil || res.Kept != 1 {
		t.Fatalf("replace: %v %+v", err, res)
	}
	if _, err := os.Stat(filepath.Join(out, "import=team-a", "rec-aaaa.parquet")); !errors.Is(err, os.ErrNotExist) {
		t.Errorf("stale table kept: %v", err)
	}
	if _, err := os.Stat(filepath.Join(out, "shard=0", "rec-aaaa.parquet")); err != nil {
		t.Errorf("built-in table touched: %v", err)
	}
}

func TestRunOptions(t *testing.T) {
	dir := t.TempDir()
	f := writeFile(t, dir, "e.csv", "recording,onset\nrec-aaaa,1\n")
	base := Options{Files: []string{f}, Kind: KindCSV, Source: "team-a", Recordings: testRecordings(), Measure: stubMeasure, OutDir: filepath.Join(dir, "c")}
	for _, c := range []struct {
		name  string
		edit  func(*Options)
		field string
	}{
		{"path in source", func(o *Options) { o.Source = "../x" }, "Source"},
		{"upper case source", func(o *Options) { o.Source = "Team" }, "Source"},
		{"empty source", func(o *Options) { o.Source = "" }, "Source"},
		{"kind", func(o *Options) { o.Kind = "xlsx" }, "Kind"},
		{"pattern on csv", func(o *Options) { o.Pattern = "spike" }, "Pattern"},
		{"bad pattern", func(o *Options) { o.Kind, o.Pattern = KindBIDS, "(" }, "Pattern"},
		{"recording for two files", func(o *Options) { o.Recording, o.Files = "rec-aaaa", []string{f, f} }, "Recording"},
		{"unknown recording", func(o *Options) { o.Recording = "nowhere.edf" }, "Recording"},
		{"no measure", func(o *Options) { o.Measure = nil }, "Measure"},
		{"no index", func(o *Options) { o.Recordings = nil }, "Recordings"},
	} {
		o := base
		c.edit(&o)
		_, err := Run(context.Background(), o)
		if err == nil {
			t.Errorf("%s: accepted", c.name)
			continue
		}
		if oe := as[*optionError](t, err); oe.Field != c.field {
			t.Errorf("%s: field %s, want %s", c.name, oe.Field, c.field)
		}
	}

	// A measurer that drops a row breaks the one-row-per-onset contract.
	o := base
	o.Measure = func(r archive.Recording, on []float64) ([]candidate.Row, []string, error) { return nil, nil, nil }
	_, err := Run(context.Background(), o)
	if me := as[*measureError](t, err); me.RecordingID != "rec-aaaa" {
		t.Errorf("measure error %+v", me)
	}
	if _, err := os.Stat(filepath.Join(dir, "c")); !errors.Is(err, os.ErrNotExist) {
		t.Errorf("wrote output despite a measure error: %v", err)
	}
	// Notes come back prefixed with the recording.
	o.Measure = func(r archive.Recording, on []float64) ([]candidate.Row, []string, error) {
		rows, _, _ := stubMeasure(r, on)
		return rows, []string{"c6 not fitted: 2 electrodes"}, nil
	}
	res, err := Run(context.Background(), o)
	if err != nil || len(res.Notes) != 1 || res.Notes[0] != "rec-aaaa: c6 not fitted: 2 electrodes" {
		t.Errorf("notes %v %+v", err, res)
	}
	// --recording ties a file without a recording column.
	g := writeFile(t, dir, "one.csv", "onset\n5\n")
	o = base
	o.Files, o.Recording, o.OutDir = []string{g}, "ward2/pt02.edf", filepath.Join(dir, "d")
	if res, err := Run(context.Background(), o); err != nil || len(res.Files) != 1 || filepath.Base(res.Files[0]) != "rec-cccc.parquet" {
		t.Errorf("single recording: %v %+v", err, res)
	}
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	o.OutDir = filepath.Join(dir, "e")
	if _, err := Run(ctx, o); !errors.Is(err, context.Canceled) {
		t.Errorf("cancelled: %v", err)
	}
}
