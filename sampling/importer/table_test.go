package importer

import (
	"math"
	"strings"
	"testing"
)

func TestSniffDelimiter(t *testing.T) {
	for _, c := range []struct {
		header string
		want   rune
	}{
		{"recording,onset,score", ','},
		{"recording;onset;score", ';'},
		{"recording\tonset\tscore", '\t'},
		{`"file, name";onset;score`, ';'}, // the comma is quoted (RFC 4180, section 2, rule 6)
		{"recording\tonset,ms\tscore", '\t'},
		{"onset", 0},
	} {
		if got := sniffDelimiter([]byte(c.header)); got != c.want {
			t.Errorf("%q: %q, want %q", c.header, got, c.want)
		}
	}
}

// TestReadTableRFC4180 reads the quoting examples of RFC 4180, section 2 (rules 5–7:
// quoted fields, a line break inside quotes, a doubled quote), and checks that line
// numbers count physical lines so rejections point at the right place.
func TestReadTableRFC4180(t *testing.T) {
	in := "\xef\xbb\xbfa,b,c\r\n" + // byte-order mark from a spreadsheet
		`"aaa","b""bb","ccc"` + "\r\n" +
		`"aaa","b` + "\r\n" + `bb","ccc"` + "\r\n" +
		"zzz,yyy,xxx\r\n"
	tb, err := readTable(strings.NewReader(in), "x.csv", 0)
	if err != nil {
		t.Fatal(err)
	}
	if strings.Join(tb.header, "|") != "a|b|c" {
		t.Errorf("header %q", tb.header)
	}
	want := []struct {
		line int
		f    string
	}{{2, `aaa|b"bb|ccc`}, {3, "aaa|b\nbb|ccc"}, {5, "zzz|yyy|xxx"}}
	if len(tb.rows) != len(want) {
		t.Fatalf("%d rows, want %d", len(tb.rows), len(want))
	}
	for i, w := range want {
		if tb.rows[i].line != w.line || strings.Join(tb.rows[i].fields, "|") != w.f {
			t.Errorf("row %d: line %d %q, want line %d %q", i, tb.rows[i].line, tb.rows[i].fields, w.line, w.f)
		}
	}
	// A quote never closed swallows the rest of the file into one field (read leniently);
	// the row then has too few fields and is rejected at the line where it starts.
	_, rej, err := readCSV(strings.NewReader("recording,onset\n\"rec-aaaa,1\nrec-aaaa,2\n"), "y.csv", 0, Mapping{}, -1)
	if err != nil || len(rej) != 1 || rej[0].Line != 2 || rej[0].Field != "row" {
		t.Errorf("unclosed quote: %v %+v", err, rej)
	}
}

func TestReadCSV(t *testing.T) {
	in := "File Name;Peak time;Chan;prob;comment\n" +
		"pt01_night.edf;23:00:00.5;T7;0.93;first\n" +
		"rec-bbbb;12.5;n/a;;\n" +
		"rec-bbbb;13;F8;0,7;comma decimal\n" +
		"rec-bbbb;14\n"
	m, err := ParseMapping("recording=file name,onset=PEAK TIME,channel=chan,score=Prob")
	if err != nil {
		t.Fatal(err)
	}
	evs, rej, err := readCSV(strings.NewReader(in), "team.csv", 0, m, -1)
	if err != nil {
		t.Fatal(err)
	}
	if len(evs) != 2 || len(rej) != 2 {
		t.Fatalf("%d events %d rejections, want 2 and 2: %v", len(evs), len(rej), rej)
	}
	e := evs[0]
	if e.recKey != "pt01_night.edf" || e.onset != "23:00:00.5" || e.channel != "T7" || e.score != 0.93 || e.line != 2 {
		t.Errorf("event 0: %+v", e)
	}
	if evs[1].channel != "" || !math.IsNaN(evs[1].score) {
		t.Errorf("n/a channel and empty score: %+v", evs[1])
	}
	if rej[0].Line != 4 || rej[0].Field != "prob" || rej[0].Value != "0,7" {
		t.Errorf("bad score: %+v", rej[0])
	}
	if rej[1].Line != 5 || rej[1].Field != "row" {
		t.Errorf("short row: %+v", rej[1])
	}

	rs := newResolver(testRecordings())
	p, r := place(evs[0], rs)
	if r != nil || p.rec != 0 || !near(p.onset, 1800.5, 1e-9) {
		t.Errorf("placed %+v %v, want recording 0 at 1800.5 s", p, r)
	}

	// A named column must exist; default names must too when required.
	_, _, err = readCSV(strings.NewReader("recording,time\nrec-aaaa,1\n"), "t.csv", 0, Mapping{}, -1)
	if ce := as[*columnError](t, err); ce.Column != "onset" || !strings.Contains(ce.Want, `"time"`) {
		t.Errorf("missing onset: %+v", ce)
	}
	_, _, err = readCSV(strings.NewReader("recording,onset\nrec-aaaa,1\n"), "t.csv", 0, Mapping{Score: "p"}, -1)
	as[*columnError](t, err)
	_, _, err = readCSV(strings.NewReader("onset,Onset\n1,2\n"), "t.csv", 0, Mapping{}, 0)
	as[*columnError](t, err)
	// With a fixed recording no recording column is needed.
	evs, _, err = readCSV(strings.NewReader("onset\n1\n2\n"), "t.csv", 0, Mapping{}, 1)
	if err != nil || len(evs) != 2 || evs[1].rec != 1 {
		t.Errorf("single recording: %v %+v", err, evs)
	}
}

func TestPlaceSeconds(t *testing.T) {
	rs := newResolver(testRecordings())
	for _, c := range []struct {
		key, onset string
		format     OnsetFormat
		field      string // "" when placed
	}{
		{"rec-bbbb", "600", OnsetAuto, ""},
		{"rec-bbbb", "0", OnsetSeconds, ""},
		{"rec-bbbb", "600.001", OnsetAuto, "onset"},
		{"rec-bbbb", "-0.5", OnsetAuto, "onset"},
		{"rec-bbbb", "n/a", OnsetAuto, "onset"},
		{"rec-bbbb", "0x10", OnsetAuto, "onset"},
		{"rec-bbbb", "1e2", OnsetSeconds, ""},
		{"rec-bbbb", "23:00:00", OnsetSeconds, "onset"},
		{"rec-bbbb", "12.5", OnsetClock, "onset"},
		{"rec-zzzz", "1", OnsetAuto, "recording"},
		{"pt02.edf", "1", OnsetAuto, "recording"},
	} {
		ev := event{file: "f", line: 7, rec: -1, recField: "recording", recKey: c.key, onsetField: "onset", onset: c.onset, format: c.format}
		_, rej := place(ev, rs)
		switch {
		case c.field == "" && rej != nil:
			t.Errorf("%s %s: rejected: %v", c.key, c.onset, rej)
		case c.field != "" && rej == nil:
			t.Errorf("%s %s: placed, want rejection of %s", c.key, c.onset, c.field)
		case rej != nil && (rej.Field != c.field || rej.Line != 7 || rej.File != "f" || rej.Want == ""):
			t.Errorf("%s %s: %+v", c.key, c.onset, rej)
		}
	}
}

// TestMergeDuplicates merges events within one sample period (1/256 s) of a run's first
// event.
func TestMergeDuplicates(t *testing.T) {
	nan := math.NaN()
	ps := []placed{
		{onset: 10.012, score: 0.2, channel: "T8"},
		{onset: 10.000, score: nan, channel: "T7"},
		{onset: 10.0039, score: 0.9, channel: "F7"}, // 1/256 = 0.00390625 s after 10.000
		{onset: 5, score: 0.1},
		{onset: 10.0079, score: 0.5}, // 2 periods after the run's first: its own event
	}
	out, n := mergeDuplicates(ps, 1.0/256)
	if n != 1 || len(out) != 4 {
		t.Fatalf("merged %d into %d events, want 1 into 4: %+v", n, len(out), out)
	}
	if out[1].onset != 10 || out[1].score != 0.9 || out[1].channel != "F7" {
		t.Errorf("merged event %+v, want onset 10, score 0.9, channel F7", out[1])
	}
	if out[0].onset != 5 || out[2].onset != 10.0079 || out[3].onset != 10.012 {
		t.Errorf("order %+v", out)
	}
}
