package export

import (
	"context"
	"encoding/csv"
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"reflect"
	"strconv"
	"testing"

	"github.com/parquet-go/parquet-go"

	"github.com/quorate-eeg/quorate/panel/consensus"
)

func runExport(t testing.TB, o Options, format string, epochs bool) (string, *Result) {
	t.Helper()
	o.To = filepath.Join(t.TempDir(), "out-"+format)
	o.Format, o.Epochs = format, epochs
	res, err := Run(context.Background(), o)
	if err != nil {
		t.Fatal(err)
	}
	return o.To, res
}

func readParquet[T any](t *testing.T, path string) []T {
	t.Helper()
	rows, err := parquet.ReadFile[T](path)
	if err != nil {
		t.Fatal(err)
	}
	return rows
}

// checkAgainstSource compares exported events with the source tables they were made
// from: every candidate field, the consensus votes, and the draw's design.
func checkAgainstSource(t *testing.T, o *Options, got []EventRow) {
	t.Helper()
	if len(got) != len(o.Draw) {
		t.Fatalf("%d event rows, want one per drawn event, %d", len(got), len(o.Draw))
	}
	by := map[string]*EventRow{}
	for i := range got {
		by[got[i].EventID] = &got[i]
	}
	same := func(id, col string, g *float64, w float64) {
		if math.IsNaN(w) {
			if g != nil {
				t.Errorf("%s %s = %v, want null (NaN in source)", id, col, *g)
			}
		} else if g == nil || *g != w {
			t.Errorf("%s %s = %v, want %v", id, col, g, w)
		}
	}
	for _, c := range o.Candidates {
		e := by[c.EventID]
		if e == nil {
			t.Fatalf("candidate %s missing", c.EventID)
		}
		if e.RecordingID != c.RecordingID || e.SubjectKey != c.SubjectKey || e.OnsetS != c.OnsetS || *e.PeakChannel != c.PeakChannel {
			t.Errorf("%s: placement differs", c.EventID)
		}
		for k, f := range c.Features() {
			col := reflect.ValueOf(e).Elem().FieldByName([...]string{"C1Sharpness", "C2DurationLogRatio", "C3Asymmetry", "C4SlowWaveRatio", "C5Disruption", "C6DipoleGOF"}[k]).Interface().(*float64)
			same(c.EventID, "feature", col, f)
		}
		same(c.EventID, "c1_duration_ms", e.C1DurationMS, c.C1DurationMS)
		same(c.EventID, "c6_dipole_z", e.C6DipoleZ, c.C6DipoleZ)
		same(c.EventID, "amplitude_uv", e.AmplitudeUV, c.AmplitudeUV)
		same(c.EventID, "import_score", e.Imported, c.Imported)
		met := c.Met()
		for k, m := range []*bool{e.C1Met, e.C2Met, e.C3Met, e.C4Met, e.C5Met, e.C6Met} {
			if m == nil || *m != met[k] {
				t.Errorf("%s c%d_met = %v, want %v", c.EventID, k+1, m, met[k])
			}
		}
		if *e.AutoCount != c.AutoCount {
			t.Errorf("%s auto_count %d, want %d", c.EventID, *e.AutoCount, c.AutoCount)
		}
		if v, ok := o.OperatingPoint.Decision[c.EventID]; !ok || e.OPDecision == nil || *e.OPDecision != v {
			t.Errorf("%s op_decision %v, want %v", c.EventID, e.OPDecision, v)
		}
		if x := o.External[c.EventID]; (x == nil) != (e.RefExternal == nil) || x != nil && *x != *e.RefExternal {
			t.Errorf("%s ref_external %v, want %v", c.EventID, e.RefExternal, x)
		}
	}
	for _, c := range o.Consensus {
		e := by[c.EventID]
		if *e.C3Present != c.C3Present || *e.C3Absent != c.C3Absent || *e.C6Majority != c.C6 || *e.Verdict != c.Verdict {
			t.Errorf("%s: votes differ from the consensus table", c.EventID)
		}
		wantPanel := map[string]*bool{"epileptiform": ptr(true), "not-epileptiform": ptr(false)}[c.Verdict]
		if !reflect.DeepEqual(e.RefPanel, wantPanel) {
			t.Errorf("%s ref_panel %v for verdict %s", c.EventID, e.RefPanel, c.Verdict)
		}
		same(c.EventID, "ds_probability", e.DSProbability, c.DSProbability)
		if math.IsNaN(c.DSProbability) != (e.RefDS == nil) || e.RefDS != nil && *e.RefDS != (c.DSProbability >= 0.5) {
			t.Errorf("%s ref_dawid_skene %v for p=%v", c.EventID, e.RefDS, c.DSProbability)
		}
	}
	for _, d := range o.Draw {
		e := by[d.EventID]
		if e.Pi != d.Pi || e.Weight != d.Weight || e.Stratum != d.Stratum || e.Kind != d.Kind || int(e.Phase) != d.Phase {
			t.Errorf("%s: design differs from the draw", d.EventID)
		}
	}
}

// TestParquetReadBack reads every Parquet file back with parquet-go and compares it
// with the source tables.
func TestParquetReadBack(t *testing.T) {
	f := newFixture(t, 40)
	dir, res := runExport(t, f.opts, "parquet", false)
	events := readParquet[EventRow](t, filepath.Join(dir, EventsFile+".parquet"))
	checkAgainstSource(t, &f.opts, events)
	built, _ := buildEvents(&f.opts)
	for i := range built {
		gv, wv := reflect.ValueOf(events[i]), reflect.ValueOf(built[i])
		for k := range gv.NumField() {
			if !reflect.DeepEqual(gv.Field(k).Interface(), wv.Field(k).Interface()) {
				t.Errorf("events.parquet row %d %s = %#v, written %#v", i, gv.Type().Field(k).Name, gv.Field(k).Interface(), wv.Field(k).Interface())
			}
		}
	}
	ratings := readParquet[RatingRow](t, filepath.Join(dir, RatingsFile+".parquet"))
	if len(ratings) != len(f.opts.Ratings) || res.Ratings != len(ratings) {
		t.Fatalf("%d ratings, want %d", len(ratings), len(f.opts.Ratings))
	}
	if !reflect.DeepEqual(ratings, buildRatings(&f.opts)) {
		t.Error("ratings.parquet differs from the rows written")
	}
	for _, r := range ratings {
		if r.Comment != nil {
			t.Fatal("comment exported without Options.Comments")
		}
	}
	recs := readParquet[RecordingRow](t, filepath.Join(dir, RecordingsFile+".parquet"))
	if len(recs) != 2 || recs[0].StartDate != nil || recs[0].StartYear == nil {
		t.Fatalf("recordings: %+v", recs)
	}
	for _, r := range recs {
		for _, src := range f.opts.Recordings {
			if src.RecordingID == r.RecordingID && (int(*r.StartYear) != src.StartTime.Year() || r.DurationS != src.DurationS ||
				!reflect.DeepEqual(r.EEGChannels, src.EEGChannels)) {
				t.Errorf("recording %s differs from the index", r.RecordingID)
			}
		}
	}
}

// TestParquetLogicalTypes checks the schema analytic engines see: zstd, dictionary
// strings, nullable features, booleans, a DATE start (Apache Parquet format,
// LogicalTypes.md).
func TestParquetLogicalTypes(t *testing.T) {
	f := newFixture(t, 10)
	f.opts.ShiftDates = true
	dir, _ := runExport(t, f.opts, "parquet", false)
	for name, want := range map[string]map[string]string{
		EventsFile + ".parquet":     {"c1_sharpness": "optional", "subject_key": "dict", "ref_panel": "optional", "c1_met": "optional"},
		RecordingsFile + ".parquet": {"start_date": "date", "recording_id": "dict"},
	} {
		fh, err := os.Open(filepath.Join(dir, name))
		if err != nil {
			t.Fatal(err)
		}
		st, _ := fh.Stat()
		pf, err := parquet.OpenFile(fh, st.Size())
		if err != nil {
			t.Fatal(err)
		}
		for col, prop := range want {
			leaf, ok := pf.Schema().Lookup(col)
			if !ok {
				t.Fatalf("%s: no column %s", name, col)
			}
			node := leaf.Node
			switch prop {
			case "optional":
				if !node.Optional() {
					t.Errorf("%s.%s is not nullable", name, col)
				}
			case "dict":
				if enc := node.Encoding(); enc == nil || enc.String() != "RLE_DICTIONARY" {
					t.Errorf("%s.%s encoding %v, want dictionary", name, col, enc)
				}
			case "date":
				if lt := node.Type().LogicalType(); lt == nil || lt.String() != "DATE" {
					t.Errorf("%s.%s logical type %v, want DATE", name, col, lt)
				}
			}
		}
		for _, rg := range pf.Metadata().RowGroups {
			for _, cc := range rg.Columns {
				if codec := cc.MetaData.Codec.String(); codec != "ZSTD" {
					t.Fatalf("%s: column %v compressed with %s, want ZSTD", name, cc.MetaData.PathInSchema, codec)
				}
			}
		}
		fh.Close()
	}
}

// TestCSVReadBack parses the CSV files with encoding/csv (RFC 4180) and compares every
// event cell with the source tables.
func TestCSVReadBack(t *testing.T) {
	f := newFixture(t, 40)
	dir, _ := runExport(t, f.opts, "csv", false)
	rows := readCSV(t, filepath.Join(dir, "events.csv"))
	header := rows[0]
	var got []EventRow
	fs := fieldsOf(reflect.TypeFor[EventRow]())
	for _, rec := range rows[1:] {
		var e EventRow
		v := reflect.ValueOf(&e).Elem()
		for i, fl := range fs {
			if header[i] != fl.name {
				t.Fatalf("column %d is %s, want %s", i, header[i], fl.name)
			}
			parseCell(t, v.Field(fl.index), rec[i])
		}
		got = append(got, e)
	}
	checkAgainstSource(t, &f.opts, got)
	ratings := readCSV(t, filepath.Join(dir, "ratings.csv"))
	if len(ratings)-1 != len(f.opts.Ratings) {
		t.Fatalf("%d rating rows, want %d", len(ratings)-1, len(f.opts.Ratings))
	}
}

func readCSV(t *testing.T, path string) [][]string {
	t.Helper()
	fh, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer fh.Close()
	rows, err := csv.NewReader(fh).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	return rows
}

// parseCell is the inverse of csvCells.cell for the event table's kinds.
func parseCell(t *testing.T, v reflect.Value, s string) {
	t.Helper()
	if v.Kind() == reflect.Pointer {
		if s == "" {
			return
		}
		v.Set(reflect.New(v.Type().Elem()))
		v = v.Elem()
	}
	var err error
	switch v.Kind() {
	case reflect.String:
		v.SetString(s)
	case reflect.Bool:
		var b bool
		b, err = strconv.ParseBool(s)
		v.SetBool(b)
	case reflect.Int32, reflect.Int64:
		var n int64
		n, err = strconv.ParseInt(s, 10, 64)
		v.SetInt(n)
	case reflect.Float64:
		var x float64
		x, err = strconv.ParseFloat(s, 64)
		v.SetFloat(x)
	case reflect.Slice:
		if s != "" {
			v.Set(reflect.ValueOf(splitList(s)))
		}
	}
	if err != nil {
		t.Fatalf("cell %q: %v", s, err)
	}
}

func splitList(s string) []string {
	var out []string
	start := 0
	for i := range len(s) {
		if s[i] == ';' {
			out = append(out, s[start:i])
			start = i + 1
		}
	}
	return append(out, s[start:])
}

// TestDictionaryCoversEveryColumn checks, for every format, that every written column
// is in schema.json and every documented column is written, each with a meaning.
func TestDictionaryCoversEveryColumn(t *testing.T) {
	f := newFixture(t, 6)
	for _, format := range Formats {
		dir, _ := runExport(t, f.opts, format, true)
		var d Dictionary
		b, err := os.ReadFile(filepath.Join(dir, DictionaryJSON))
		if err != nil {
			t.Fatal(err)
		}
		if err := json.Unmarshal(b, &d); err != nil {
			t.Fatal(err)
		}
		md, _ := os.ReadFile(filepath.Join(dir, DictionaryMD))
		written := writtenColumns(t, dir, format)
		if len(d.Tables) != len(written) {
			t.Errorf("%s: dictionary has %d tables, %d written", format, len(d.Tables), len(written))
		}
		for _, tb := range d.Tables {
			cols, ok := written[tb.Name]
			if !ok {
				t.Errorf("%s: table %s documented but not written", format, tb.Name)
				continue
			}
			var names []string
			for _, c := range tb.Columns {
				names = append(names, c.Name)
				if c.Description == "" || c.Type == "" {
					t.Errorf("%s: %s.%s has no meaning or type", format, tb.Name, c.Name)
				}
				if !contains(string(md), "| `"+c.Name+"` |") {
					t.Errorf("%s: %s.%s missing from %s", format, tb.Name, c.Name, DictionaryMD)
				}
			}
			if !reflect.DeepEqual(names, cols) {
				t.Errorf("%s: table %s\n documented %v\n written    %v", format, tb.Name, names, cols)
			}
		}
	}
}

func contains(s, sub string) bool { return len(sub) == 0 || len(s) >= len(sub) && indexOf(s, sub) >= 0 }

func indexOf(s, sub string) int {
	for i := 0; i+len(sub) <= len(s); i++ {
		if s[i:i+len(sub)] == sub {
			return i
		}
	}
	return -1
}

// writtenColumns reads the header of each table as written.
func writtenColumns(t *testing.T, dir, format string) map[string][]string {
	t.Helper()
	out := map[string][]string{}
	pq := func(name, file string) {
		fh, err := os.Open(filepath.Join(dir, file))
		if err != nil {
			t.Fatal(err)
		}
		defer fh.Close()
		st, _ := fh.Stat()
		pf, err := parquet.OpenFile(fh, st.Size())
		if err != nil {
			t.Fatal(err)
		}
		for _, fl := range pf.Schema().Fields() {
			out[name] = append(out[name], fl.Name())
		}
	}
	tsvHeader := func(name, pattern string) {
		m, _ := filepath.Glob(filepath.Join(dir, pattern))
		if len(m) == 0 {
			t.Fatalf("no %s", pattern)
		}
		for _, p := range m {
			rows := readTSV(t, p)
			if out[name] != nil && !reflect.DeepEqual(out[name], rows[0]) {
				t.Fatalf("%s: header differs between files", p)
			}
			out[name] = rows[0]
		}
	}
	switch format {
	case "parquet":
		pq("events", EventsFile+".parquet")
		pq("ratings", RatingsFile+".parquet")
		pq("recordings", RecordingsFile+".parquet")
	case "csv":
		for _, n := range []string{"events", "ratings", "recordings"} {
			out[n] = readCSV(t, filepath.Join(dir, n+".csv"))[0]
		}
	case "bids":
		tsvHeader("bids-events", "sub-*/eeg/*_events.tsv")
		tsvHeader("bids-channels", "sub-*/eeg/*_channels.tsv")
		tsvHeader("bids-participants", ParticipantsFile)
	}
	pq("epochs", EpochsFile)
	return out
}

func readTSV(t *testing.T, path string) [][]string {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	var rows [][]string
	for _, line := range splitLines(string(b)) {
		rows = append(rows, splitTab(line))
	}
	return rows
}

func splitLines(s string) []string {
	var out []string
	start := 0
	for i := range len(s) {
		if s[i] == '\n' {
			out = append(out, s[start:i])
			start = i + 1
		}
	}
	if start < len(s) {
		out = append(out, s[start:])
	}
	return out
}

func splitTab(s string) []string {
	var out []string
	start := 0
	for i := range len(s) {
		if s[i] == '\t' {
			out = append(out, s[start:i])
			start = i + 1
		}
	}
	return append(out, s[start:])
}

// TestCSVQuoting writes values that need RFC 4180 quoting (comma, double quote, line
// break, non-ASCII) and reads them back with encoding/csv.
func TestCSVQuoting(t *testing.T) {
	f := newFixture(t, 3)
	o := f.opts
	o.Comments = true
	want := "a, \"quoted\"\nsecond line — µV"
	o.Ratings = append([]consensus.Rating(nil), o.Ratings...)
	o.Ratings[0].Comment = want
	o.Ratings[0].Rater = "Rater, A"
	dir, _ := runExport(t, o, "csv", false)
	rows := readCSV(t, filepath.Join(dir, "ratings.csv"))
	found := false
	for _, r := range rows[1:] {
		if r[1] == "Rater, A" {
			found = r[len(r)-1] == want
		}
	}
	if !found {
		t.Errorf("quoted values did not read back")
	}
}
