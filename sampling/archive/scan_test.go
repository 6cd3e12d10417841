package archive

import (
	"context"
	"encoding/csv"
	"errors"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"testing/fstest"
	"time"

	"github.com/quorate-eeg/quorate/sampling/edf"
)

var secret = []byte("0123456789abcdef0123456789abcdef")

// writeEDF writes a small EDF+ recording with three EEG channels and an ECG channel.
func writeEDF(t testing.TB, path, patient string, seconds int, offset float32) {
	t.Helper()
	os.MkdirAll(filepath.Dir(path), 0o755)
	f, err := os.Create(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	sig := func(label string) edf.Signal {
		return edf.Signal{Label: label, PhysDim: "uV", PhysMin: -500, PhysMax: 500, DigMin: -32768, DigMax: 32767, SamplesPerRecord: 256}
	}
	w, err := edf.NewWriter(f, edf.WriterHeader{
		Format: edf.EDFPlusC, PatientID: patient, RecordingID: "Startdate 02-MAR-2026 X X X",
		Start: time.Date(2026, 3, 2, 9, 30, 0, 0, time.UTC), RecordDuration: 1, NumRecords: int64(seconds),
		Signals: []edf.Signal{sig("EEG Fp1-REF"), sig("EEG T3-REF"), sig("EEG O2-REF"), sig("ECG")},
	})
	if err != nil {
		t.Fatal(err)
	}
	rec := make([][]float32, 4)
	for i := range rec {
		rec[i] = make([]float32, 256)
		for j := range rec[i] {
			rec[i][j] = offset + float32(j%17)
		}
	}
	for r := 0; r < seconds; r++ {
		if err := w.WriteRecord(rec); err != nil {
			t.Fatal(err)
		}
	}
	if err := w.Close(); err != nil {
		t.Fatal(err)
	}
}

func readProblems(t *testing.T, path string) [][]string {
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	return rows[1:]
}

func TestScan(t *testing.T) {
	arch := t.TempDir()
	writeEDF(t, filepath.Join(arch, "ward-a", "rec01.edf"), "MCH-0001 F 01-JAN-1970 Fictional_Alba", 10, 0)
	writeEDF(t, filepath.Join(arch, "ward-a", "rec02.EDF"), "MCH-0001 F 01-JAN-1970 Fictional_Alba", 5, 3)
	writeEDF(t, filepath.Join(arch, "ward-b", "other.dat"), "MCH-0002 M 02-FEB-1971 Fictional_Bran", 4, 1) // no .edf name: found by content
	b, _ := os.ReadFile(filepath.Join(arch, "ward-a", "rec01.edf"))
	// The same content under a later path (lexical order) is the duplicate.
	os.MkdirAll(filepath.Join(arch, "zz-copies"), 0o755)
	os.WriteFile(filepath.Join(arch, "zz-copies", "rec01-copy.edf"), b, 0o644)
	os.WriteFile(filepath.Join(arch, "broken.edf"), b[:len(b)/2], 0o644) // truncated data records
	os.WriteFile(filepath.Join(arch, "empty.edf"), nil, 0o644)
	os.WriteFile(filepath.Join(arch, "notes.txt"), []byte("not a recording"), 0o644)

	idx := t.TempDir()
	res, err := Run(context.Background(), Options{Roots: []string{arch}, Secret: secret, IndexDir: idx, Workers: 2})
	if err != nil {
		t.Fatal(err)
	}
	if len(res.Recordings) != 3 {
		t.Fatalf("%d recordings indexed, want 3: %+v", len(res.Recordings), res.Recordings)
	}
	got, err := ReadIndex(filepath.Join(idx, IndexFile))
	if err != nil || len(got) != 3 {
		t.Fatalf("index read back: %v, %d rows", err, len(got))
	}
	byPath := map[string]Recording{}
	for _, r := range got {
		byPath[r.Path] = r
	}
	r1, r2, r3 := byPath["ward-a/rec01.edf"], byPath["ward-a/rec02.EDF"], byPath["ward-b/other.dat"]
	if r1.SubjectKey == "" || r1.SubjectKey != r2.SubjectKey || r1.SubjectKey == r3.SubjectKey {
		t.Errorf("subject keys %q %q %q: want the first two equal and the third different", r1.SubjectKey, r2.SubjectKey, r3.SubjectKey)
	}
	if r1.DurationS != 10 || r1.RecordCount != 10 || r1.Format != edf.EDFPlusC.String() {
		t.Errorf("rec01: duration %v records %d format %s", r1.DurationS, r1.RecordCount, r1.Format)
	}
	// T3 is the old 10-20 name of T7 (ACNS guideline 2, Acharya et al. 2016); ECG is not EEG.
	if strings.Join(r1.EEGChannels, ",") != "Fp1,T7,O2" || len(r1.SampleRatesHz) != 1 || r1.SampleRatesHz[0] != 256 {
		t.Errorf("rec01 channels %v rates %v", r1.EEGChannels, r1.SampleRatesHz)
	}
	if !r1.StartTime.Equal(time.Date(2026, 3, 2, 9, 30, 0, 0, time.UTC)) {
		t.Errorf("start %v", r1.StartTime)
	}
	probs := readProblems(t, filepath.Join(idx, ProblemsFile))
	reasons := map[string]string{}
	for _, p := range probs {
		reasons[filepath.Base(p[0])] = p[1] + ": " + p[3]
	}
	if !strings.Contains(reasons["rec01-copy.edf"], "duplicate") {
		t.Errorf("copy not reported as duplicate: %q", reasons["rec01-copy.edf"])
	}
	if reasons["broken.edf"] == "" || reasons["empty.edf"] == "" {
		t.Errorf("broken/empty files not reported: %v", reasons)
	}
	if _, ok := reasons["notes.txt"]; ok {
		t.Error("a text file was reported as a problem; it should be passed over")
	}
	// The identification itself is stored nowhere.
	for _, f := range []string{IndexFile, ProblemsFile} {
		b, _ := os.ReadFile(filepath.Join(idx, f))
		if strings.Contains(string(b), "Fictional_Alba") || strings.Contains(string(b), "MCH-0001") {
			t.Errorf("%s contains the patient identification", f)
		}
	}

	// A second scan reads nothing again and writes the same index.
	before, _ := os.ReadFile(filepath.Join(idx, IndexFile))
	res2, err := Run(context.Background(), Options{Roots: []string{arch}, Secret: secret, IndexDir: idx, Workers: 1})
	if err != nil {
		t.Fatal(err)
	}
	if res2.Reused != 3 {
		t.Errorf("second scan reused %d rows, want 3", res2.Reused)
	}
	after, _ := os.ReadFile(filepath.Join(idx, IndexFile))
	if string(before) != string(after) {
		t.Error("rescanning an unchanged archive changed the index")
	}
}

// permFS fails to list one folder, as an unreadable folder would for a non-root user.
type permFS struct {
	fstest.MapFS
	deny string
}

func (p permFS) ReadDir(name string) ([]fs.DirEntry, error) {
	if name == p.deny {
		return nil, &fs.PathError{Op: "open", Path: name, Err: fs.ErrPermission}
	}
	return p.MapFS.ReadDir(name)
}

func TestScanUnreadableFolderCarriesOn(t *testing.T) {
	arch := t.TempDir()
	writeEDF(t, filepath.Join(arch, "ok", "a.edf"), "X X X X", 2, 0)
	b, _ := os.ReadFile(filepath.Join(arch, "ok", "a.edf"))
	mfs := permFS{MapFS: fstest.MapFS{
		"ok/a.edf":        {Data: b, Mode: 0o644},
		"locked/b.edf":    {Data: b, Mode: 0o644},
		"locked/sub/c.ed": {Data: b},
	}, deny: "locked"}
	idx := t.TempDir()
	res, err := Run(context.Background(), Options{Roots: []string{arch}, Secret: secret, IndexDir: idx, Workers: 1,
		fsys: func(string) fs.FS { return mfs }})
	if err != nil {
		t.Fatal(err)
	}
	if len(res.Recordings) != 1 {
		t.Fatalf("%d recordings, want 1", len(res.Recordings))
	}
	found := false
	for _, p := range res.Problems {
		if strings.HasSuffix(p.File, "locked") && strings.Contains(p.Reason, "permission denied") {
			found = true
		}
	}
	if !found {
		t.Fatalf("unreadable folder not reported: %+v", res.Problems)
	}
	// An anonymised patient field is indexed with a warning.
	if w := res.Recordings[0].Warnings; len(w) == 0 {
		t.Error("anonymised patient field gave no warning")
	}
}

func TestSubjectKeyFoldsSpacingAndCase(t *testing.T) {
	a := SubjectKey(secret, "MCH-0001 F 01-JAN-1970 Fictional_Alba")
	b := SubjectKey(secret, "mch-0001  f 01-jan-1970 fictional_alba ")
	c := SubjectKey([]byte("another study's secret, 32 bytes"), "MCH-0001 F 01-JAN-1970 Fictional_Alba")
	if a != b || a == c || len(a) != 20 {
		t.Fatalf("keys %q %q %q", a, b, c)
	}
}

// A non-ASCII patient field once put the raw field (name, birth date) into
// problems.csv. Such a field is now read as Latin-1 (edf.TestLatin1FreeText)
// and the recording indexed with a warning that names the field and
// withholds its content; problems.csv stays empty.
func TestProblemsWithholdIdentification(t *testing.T) {
	arch := t.TempDir()
	p := filepath.Join(arch, "r.edf")
	writeEDF(t, p, "MCH-0009 F 03-MAR-1980 Fictional_Zoe", 2, 0)
	b, _ := os.ReadFile(p)
	copy(b[8+22:], "Fict\xefonal_Zo\xeb") // Latin-1 bytes in the patient field
	os.WriteFile(p, b, 0o644)
	idx := t.TempDir()
	res, err := Run(context.Background(), Options{Roots: []string{arch}, Secret: secret, IndexDir: idx})
	if err != nil {
		t.Fatal(err)
	}
	raw, _ := os.ReadFile(filepath.Join(idx, ProblemsFile))
	if probs := readProblems(t, filepath.Join(idx, ProblemsFile)); len(probs) != 0 {
		t.Fatalf("problems %q, want none", probs)
	}
	if len(res.Recordings) != 1 {
		t.Fatalf("%d recordings indexed, want 1", len(res.Recordings))
	}
	warned := strings.Join(res.Recordings[0].Warnings, "\n")
	if !strings.Contains(warned, "local patient identification") {
		t.Errorf("warnings %q do not name the patient field", warned)
	}
	for _, leak := range []string{"Fict", "1980", "MCH-0009", "Zo"} {
		if strings.Contains(string(raw), leak) || strings.Contains(warned, leak) {
			t.Errorf("problems.csv or the warnings carry %q: %s / %s", leak, raw, warned)
		}
	}
}

// A rescan with the archive root missing (an unmounted share) once emptied the index.
func TestScanRefusesMissingRoot(t *testing.T) {
	arch := t.TempDir()
	writeEDF(t, filepath.Join(arch, "a.edf"), "X X X X", 2, 0)
	idx := t.TempDir()
	o := Options{Roots: []string{arch}, Secret: secret, IndexDir: idx}
	if _, err := Run(context.Background(), o); err != nil {
		t.Fatal(err)
	}
	before, _ := os.ReadFile(filepath.Join(idx, IndexFile))
	o.Roots = []string{filepath.Join(arch, "unmounted")}
	_, err := Run(context.Background(), o)
	var re *RootError
	if !errors.As(err, &re) {
		t.Fatalf("missing root: %v, want a RootError", err)
	}
	if after, _ := os.ReadFile(filepath.Join(idx, IndexFile)); string(after) != string(before) {
		t.Error("the index changed")
	}
}

// A symbolic link to a recording was once passed over silently: it is followed; a
// link to a folder or to nothing is listed as a problem.
func TestScanSymlinks(t *testing.T) {
	arch, elsewhere := t.TempDir(), t.TempDir()
	writeEDF(t, filepath.Join(elsewhere, "real.edf"), "X X X X", 2, 0)
	os.Symlink(filepath.Join(elsewhere, "real.edf"), filepath.Join(arch, "linked.edf"))
	os.Symlink(elsewhere, filepath.Join(arch, "folder-link"))
	os.Symlink(filepath.Join(elsewhere, "gone.edf"), filepath.Join(arch, "dangling.edf"))
	idx := t.TempDir()
	res, err := Run(context.Background(), Options{Roots: []string{arch}, Secret: secret, IndexDir: idx})
	if err != nil {
		t.Fatal(err)
	}
	if len(res.Recordings) != 1 || res.Recordings[0].Path != "linked.edf" {
		t.Errorf("recordings %+v, want the linked one", res.Recordings)
	}
	got := map[string]string{}
	for _, p := range res.Problems {
		got[filepath.Base(p.File)] = p.Reason
	}
	if !strings.Contains(got["folder-link"], "link to a folder") || !strings.Contains(got["dangling.edf"], "cannot be followed") {
		t.Errorf("problems %q", got)
	}
}

// With a paths file, recordings.parquet keeps no archive path; the paths go to the
// private file and are joined back for the stages that read the archive.
func TestPathsKeptApart(t *testing.T) {
	arch := t.TempDir()
	writeEDF(t, filepath.Join(arch, "Fictional_Alba", "a.edf"), "X X X X", 2, 0)
	idx := t.TempDir()
	paths := filepath.Join(t.TempDir(), "paths.json")
	o := Options{Roots: []string{arch}, Secret: secret, IndexDir: idx, PathsFile: paths}
	if _, err := Run(context.Background(), o); err != nil {
		t.Fatal(err)
	}
	raw, _ := os.ReadFile(filepath.Join(idx, IndexFile))
	if strings.Contains(string(raw), "Fictional_Alba") {
		t.Error("recordings.parquet carries the archive path")
	}
	if st, err := os.Stat(paths); err != nil || st.Mode().Perm() != 0o600 {
		t.Fatalf("paths file: %v", err)
	}
	recs, _ := ReadIndex(filepath.Join(idx, IndexFile))
	recs, err := AttachPaths(recs, paths)
	if err != nil || recs[0].Path != "Fictional_Alba/a.edf" {
		t.Fatalf("attached %+v, %v", recs, err)
	}
	res, err := Run(context.Background(), o)
	if err != nil || res.Reused != 1 {
		t.Errorf("rescan: %+v %v, want the unchanged file reused", res, err)
	}
}

// No roots is ErrNoRoots, in the domain's words (no flag, no study.yaml).
func TestRunNoRoots(t *testing.T) {
	_, err := Run(context.Background(), Options{IndexDir: t.TempDir()})
	if !errors.Is(err, ErrNoRoots) || strings.Contains(err.Error(), "--") || strings.Contains(err.Error(), "study.yaml") {
		t.Errorf("no roots: %v, want ErrNoRoots", err)
	}
}
