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
