package atomicfile

import (
	"errors"
	"io"
	"os"
	"path/filepath"
	"testing"
)

func TestWriteReplacesWhole(t *testing.T) {
	dir := t.TempDir()
	p := filepath.Join(dir, "a.txt")
	if err := WriteBytes(p, []byte("old"), 0o644); err != nil {
		t.Fatal(err)
	}
	boom := errors.New("boom")
	err := Write(p, 0o644, func(w io.Writer) error {
		io.WriteString(w, "half")
		return boom
	})
	if !errors.Is(err, boom) {
		t.Fatalf("err = %v, want boom", err)
	}
	b, _ := os.ReadFile(p)
	if string(b) != "old" {
		t.Fatalf("content %q after failed write, want the old content", b)
	}
	ents, _ := os.ReadDir(dir)
	if len(ents) != 1 {
		t.Fatalf("temporary file left behind: %v", ents)
	}
}

func TestCreateNeverOverwrites(t *testing.T) {
	p := filepath.Join(t.TempDir(), "r.json")
	if err := Create(p, []byte("first"), 0o444); err != nil {
		t.Fatal(err)
	}
	if err := Create(p, []byte("second"), 0o444); !errors.Is(err, os.ErrExist) {
		t.Fatalf("second Create: %v, want ErrExist", err)
	}
	b, _ := os.ReadFile(p)
	if string(b) != "first" {
		t.Fatalf("content %q, want first", b)
	}
	st, _ := os.Stat(p)
	if st.Mode().Perm() != 0o444 {
		t.Fatalf("mode %v, want read-only", st.Mode().Perm())
	}
}

// A tuning run killed between its files once left a new operating point beside an old
// report. WriteDir shows the old folder or the whole new one; a failed fill leaves the
// old one as it was; files of the old folder that the new one lacks are kept.
func TestWriteDir(t *testing.T) {
	parent := t.TempDir()
	dir := filepath.Join(parent, "tuning")
	put := func(files map[string]string) func(string) error {
		return func(tmp string) error {
			for n, c := range files {
				if err := os.WriteFile(filepath.Join(tmp, n), []byte(c), 0o644); err != nil {
					return err
				}
			}
			return nil
		}
	}
	if err := WriteDir(dir, put(map[string]string{"point": "1", "report": "1", "notes": "mine"})); err != nil {
		t.Fatal(err)
	}
	err := WriteDir(dir, func(tmp string) error {
		os.WriteFile(filepath.Join(tmp, "point"), []byte("2"), 0o644)
		return os.ErrDeadlineExceeded // killed before the report
	})
	if err == nil {
		t.Fatal("failed fill reported no error")
	}
	for n, want := range map[string]string{"point": "1", "report": "1"} {
		if b, _ := os.ReadFile(filepath.Join(dir, n)); string(b) != want {
			t.Errorf("after a failed fill %s = %q, want %q", n, b, want)
		}
	}
	if err := WriteDir(dir, put(map[string]string{"point": "3", "report": "3"})); err != nil {
		t.Fatal(err)
	}
	for n, want := range map[string]string{"point": "3", "report": "3", "notes": "mine"} {
		if b, _ := os.ReadFile(filepath.Join(dir, n)); string(b) != want {
			t.Errorf("%s = %q, want %q", n, b, want)
		}
	}
	if m, _ := filepath.Glob(filepath.Join(parent, ".*")); len(m) != 0 {
		t.Errorf("left %v", m)
	}
}

// Temporary files of a killed writer (".NAME.tmp-DIGITS") are removed; nothing else.
func TestRemoveLeftovers(t *testing.T) {
	root := t.TempDir()
	keep := []string{"a.json", ".quorate", "x.tmp-1", ".b.tmp-", ".c.tmp-12x"}
	gone := []string{".a.json.tmp-12345", "sub/.d.parquet.tmp-9", ".export.tmp-77"}
	for _, p := range append(keep, gone...) {
		p = filepath.Join(root, p)
		os.MkdirAll(filepath.Dir(p), 0o755)
		os.WriteFile(p, []byte("x"), 0o644)
	}
	os.Remove(filepath.Join(root, ".export.tmp-77"))
	os.MkdirAll(filepath.Join(root, ".export.tmp-77", "inner"), 0o755)
	got, err := RemoveLeftovers(root)
	if err != nil || len(got) != len(gone) {
		t.Fatalf("removed %v, %v; want %d", got, err, len(gone))
	}
	for _, p := range keep {
		if _, err := os.Lstat(filepath.Join(root, p)); err != nil {
			t.Errorf("%s removed", p)
		}
	}
}

// A WriteDir killed between its two renames (old folder moved aside, new one not yet in
// place) once left only two ".tuning.tmp-N" folders, and the next command's
// RemoveLeftovers deleted both: no report at all. The aside folder is now put back.
func TestRemoveLeftoversRestoresAside(t *testing.T) {
	root := t.TempDir()
	aside := filepath.Join(root, ".tuning"+asideTag+"123")
	staged := filepath.Join(root, ".tuning.tmp-456")
	for d, c := range map[string]string{aside: "old", staged: "new"} {
		os.Mkdir(d, 0o755)
		os.WriteFile(filepath.Join(d, "point"), []byte(c), 0o644)
	}
	gone, err := RemoveLeftovers(root)
	if err != nil {
		t.Fatal(err)
	}
	if b, err := os.ReadFile(filepath.Join(root, "tuning", "point")); err != nil || string(b) != "old" {
		t.Errorf("tuning/point = %q, %v; want the old folder put back", b, err)
	}
	if len(gone) != 1 || gone[0] != staged {
		t.Errorf("removed %v, want only %s", gone, staged)
	}
	if m, _ := filepath.Glob(filepath.Join(root, ".*")); len(m) != 0 {
		t.Errorf("left %v", m)
	}
	// With the folder in place, an aside folder is an ordinary leftover.
	os.Mkdir(aside, 0o755)
	if gone, _ := RemoveLeftovers(root); len(gone) != 1 || gone[0] != aside {
		t.Errorf("removed %v, want %s", gone, aside)
	}
	if _, err := os.Stat(filepath.Join(root, "tuning", "point")); err != nil {
		t.Errorf("the folder in place was touched: %v", err)
	}
}

// Leftovers lists what RemoveLeftovers would remove or put back, and changes nothing.
func TestLeftoversListsOnly(t *testing.T) {
	root := t.TempDir()
	file := filepath.Join(root, "sub", ".d.parquet.tmp-9")
	aside := filepath.Join(root, ".tuning"+asideTag+"123")
	os.MkdirAll(filepath.Dir(file), 0o755)
	os.WriteFile(file, []byte("x"), 0o644)
	os.WriteFile(filepath.Join(root, "a.json"), []byte("x"), 0o644)
	os.MkdirAll(filepath.Join(aside, "inner"), 0o755)
	got, err := Leftovers(root)
	if err != nil {
		t.Fatal(err)
	}
	want := []Leftover{{Path: aside, Restores: filepath.Join(root, "tuning")}, {Path: file}}
	if len(got) != len(want) || got[0] != want[0] || got[1] != want[1] {
		t.Fatalf("Leftovers = %+v, want %+v", got, want)
	}
	for _, p := range []string{file, aside, filepath.Join(aside, "inner")} {
		if _, err := os.Lstat(p); err != nil {
			t.Errorf("%s changed by a listing: %v", p, err)
		}
	}
	if _, err := os.Lstat(filepath.Join(root, "tuning")); err == nil {
		t.Error("a listing put the aside folder back")
	}
}
