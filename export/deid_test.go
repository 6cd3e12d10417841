package export

import (
	"bytes"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/parquet-go/parquet-go"
)

// TestNoIdentifiersInAnyExport plants patient names, record numbers and birth dates in
// the EDF patient fields (Kemp & Olivan 2003, section 2.1.3.3) and telling file and
// folder names in the archive, runs every format with epochs, and searches every byte
// written — and, since Parquet pages are compressed, every decoded value of every
// Parquet file.
func TestNoIdentifiersInAnyExport(t *testing.T) {
	f := newFixture(t, 12)
	for _, shift := range []bool{false, true} {
		for _, format := range Formats {
			o := f.opts
			o.ShiftDates = shift
			dir, _ := runExport(t, o, format, true)
			n := 0
			filepath.WalkDir(dir, func(p string, d fs.DirEntry, err error) error {
				if err != nil || d.IsDir() {
					return err
				}
				n++
				b, err := os.ReadFile(p)
				if err != nil {
					t.Fatal(err)
				}
				check(t, p, b)
				if strings.HasSuffix(p, ".parquet") {
					checkParquetValues(t, p)
				}
				return nil
			})
			if n < 4 {
				t.Fatalf("%s: only %d files", format, n)
			}
			if shift {
				// The real start dates must not survive a shift either.
				for _, p := range []string{"2019-06-15", "2020-11-02", "15.06.19"} {
					filepath.WalkDir(dir, func(q string, d fs.DirEntry, err error) error {
						if err == nil && !d.IsDir() {
							if b, _ := os.ReadFile(q); bytes.Contains(b, []byte(p)) {
								t.Errorf("%s holds the real date %s", q, p)
							}
						}
						return err
					})
				}
			}
		}
	}
}

func check(t *testing.T, where string, b []byte) {
	t.Helper()
	for _, id := range leaks(b) {
		t.Errorf("%s contains identifier %q", where, id)
	}
}

func leaks(b []byte) []string {
	var out []string
	for _, id := range identifiers {
		if bytes.Contains(bytes.ToLower(b), []byte(strings.ToLower(id))) {
			out = append(out, id)
		}
	}
	return out
}

// checkParquetValues searches every decoded string value of a Parquet file.
func checkParquetValues(t *testing.T, path string) {
	t.Helper()
	for _, id := range parquetLeaks(t, path) {
		t.Errorf("%s: a value contains identifier %q", path, id)
	}
}

func parquetLeaks(t *testing.T, path string) []string {
	t.Helper()
	var out []string
	fh, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer fh.Close()
	st, _ := fh.Stat()
	pf, err := parquet.OpenFile(fh, st.Size())
	if err != nil {
		t.Fatal(err)
	}
	for _, kv := range pf.Metadata().KeyValueMetadata {
		out = append(out, leaks([]byte(kv.Key+kv.Value))...)
	}
	r := parquet.NewReader(pf)
	defer r.Close()
	rows := make([]parquet.Row, 64)
	for {
		n, err := r.ReadRows(rows)
		for _, row := range rows[:n] {
			for _, v := range row {
				if v.Kind() == parquet.ByteArray {
					out = append(out, leaks(v.ByteArray())...)
				}
			}
		}
		if err != nil {
			return out
		}
	}
}

// TestLeakCheckFindsPlantedName is the positive control of the search above: with
// comments exported on request, the rater's comment naming the patient is compressed
// inside ratings.parquet, invisible to a byte search, and the value search must find it.
func TestLeakCheckFindsPlantedName(t *testing.T) {
	f := newFixture(t, 4)
	o := f.opts
	o.Comments = true
	dir, _ := runExport(t, o, "parquet", false)
	if got := parquetLeaks(t, filepath.Join(dir, RatingsFile+".parquet")); len(got) == 0 {
		t.Error("planted comment not found in ratings.parquet values")
	}
	o.Format = "csv"
	dir, _ = runExport(t, o, "csv", false)
	b, _ := os.ReadFile(filepath.Join(dir, "ratings.csv"))
	if len(leaks(b)) == 0 {
		t.Error("planted comment not found in ratings.csv bytes")
	}
}

// TestDateShift checks the shifted date against calendar arithmetic: 2019-06-15 shifted
// by d days is the proleptic Gregorian date d days away, time of day unchanged.
func TestDateShift(t *testing.T) {
	f := newFixture(t, 2)
	o := f.opts
	o.ShiftDates = true
	recs, err := buildRecordings(&o)
	if err != nil {
		t.Fatal(err)
	}
	for _, r := range recs {
		for _, src := range o.Recordings {
			if src.RecordingID != r.RecordingID {
				continue
			}
			days := o.DateShiftDays[src.SubjectKey]
			y, m, d := src.StartTime.Date()
			// Day count via the Julian Day Number (Fliegel & Van Flandern 1968, CACM 11:657).
			jdn := func(y, m, d int) int {
				return d - 32075 + 1461*(y+4800+(m-14)/12)/4 + 367*(m-2-(m-14)/12*12)/12 - 3*((y+4900+(m-14)/12)/100)/4
			}
			gy, gm, gd := r.StartDate.Date()
			if jdn(gy, int(gm), gd)-jdn(y, int(m), d) != days {
				t.Errorf("%s: shifted %v → %v, want %d days", r.RecordingID, src.StartTime, r.StartDate, days)
			}
			h, mi, s := src.StartTime.Clock()
			if r.StartTimeOfDayS != float64(h*3600+mi*60+s) || r.StartYear != nil || !r.DateShifted {
				t.Errorf("%s: time of day %v, year %v", r.RecordingID, r.StartTimeOfDayS, r.StartYear)
			}
		}
	}
	delete(o.DateShiftDays, o.Recordings[0].SubjectKey)
	if _, err := buildRecordings(&o); err == nil {
		t.Error("a subject without an offset was exported unshifted")
	}
}
