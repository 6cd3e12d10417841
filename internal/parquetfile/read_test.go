package parquetfile

import (
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"testing"
)

type other struct {
	Name  string `parquet:"name"`
	Count int64  `parquet:"count"`
}

func written(t *testing.T) (string, []byte) {
	t.Helper()
	p := filepath.Join(t.TempDir(), "t.parquet")
	rows := make([]row, 300)
	for i := range rows {
		rows[i] = row{ID: string(rune('a' + i%26)), X: float64(i), Tags: []string{"x", "y"}}
	}
	if err := Write(p, rows, 0o644); err != nil {
		t.Fatal(err)
	}
	b, err := os.ReadFile(p)
	if err != nil {
		t.Fatal(err)
	}
	return p, b
}

// A damaged file is an error naming the file and marked ErrDamaged; never a panic.
func TestReadDamaged(t *testing.T) {
	p, b := written(t)
	cases := map[string][]byte{
		"truncated footer": b[:len(b)-10],
		"half":             b[:len(b)/2],
		"empty":            {},
		"not parquet":      []byte("event_id,onset\na,1\n"),
	}
	// Bytes overwritten inside the column chunks (after the leading "PAR1" magic).
	mid := append([]byte(nil), b...)
	for i := 8; i < len(mid)/2; i++ {
		mid[i] ^= 0x5a
	}
	cases["pages overwritten"] = mid
	for name, data := range cases {
		if err := os.WriteFile(p, data, 0o644); err != nil {
			t.Fatal(err)
		}
		_, err := Read[row](p)
		var fe *FileError
		if !errors.As(err, &fe) || !errors.Is(err, ErrDamaged) || fe.Path != p {
			t.Errorf("%s: got %v, want a FileError marked damaged naming %s", name, err, p)
		}
	}
}

// A whole Parquet file of another table is refused, not read as zero-valued rows.
func TestReadOtherSchema(t *testing.T) {
	p := filepath.Join(t.TempDir(), "o.parquet")
	if err := Write(p, []other{{"a", 1}, {"b", 2}}, 0o644); err != nil {
		t.Fatal(err)
	}
	rows, err := Read[row](p)
	if !errors.Is(err, ErrSchema) || rows != nil {
		t.Fatalf("got %d rows, %v; want ErrSchema", len(rows), err)
	}
	// The same table read as itself is fine.
	if back, err := Read[other](p); err != nil || len(back) != 2 || back[1].Count != 2 {
		t.Fatalf("read as itself: %v %v", back, err)
	}
}

// FuzzRead: any bytes at all give rows or an error, never a panic.
func FuzzRead(f *testing.F) {
	dir := f.TempDir()
	p := filepath.Join(dir, "seed.parquet")
	if err := Write(p, []row{{ID: "a", X: 1, Tags: []string{"t"}}}, 0o644); err != nil {
		f.Fatal(err)
	}
	b, _ := os.ReadFile(p)
	f.Add(b)
	f.Add([]byte("PAR1PAR1"))
	f.Fuzz(func(t *testing.T, data []byte) {
		q := filepath.Join(t.TempDir(), "f.parquet")
		if err := os.WriteFile(q, data, 0o644); err != nil {
			t.Fatal(err)
		}
		rows, err := Read[row](q)
		if err != nil && rows != nil {
			t.Fatalf("rows beside an error")
		}
	})
}

// Rows are read in chunks of readChunk: a table longer than several chunks comes back
// whole and in order, and an empty table as an empty slice, not nil.
func TestReadAcrossChunks(t *testing.T) {
	dir := t.TempDir()
	for _, n := range []int{0, 1, readChunk, 2*readChunk + 17} {
		rows := make([]row, n)
		for i := range rows {
			rows[i] = row{ID: fmt.Sprint(i), X: float64(i), Tags: []string{}}
		}
		p := filepath.Join(dir, fmt.Sprintf("t%d.parquet", n))
		if err := Write(p, rows, 0o644); err != nil {
			t.Fatal(err)
		}
		got, err := Read[row](p)
		if err != nil || got == nil || len(got) != n {
			t.Fatalf("%d rows: read %d, nil %v, %v", n, len(got), got == nil, err)
		}
		for i, r := range got {
			if r.X != float64(i) || r.ID != fmt.Sprint(i) {
				t.Fatalf("%d rows: row %d is %+v", n, i, r)
			}
		}
	}
}
