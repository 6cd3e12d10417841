package candidate

import (
	"errors"
	"math"
	"os"
	"path/filepath"
	"testing"
)

// TestWriterStreams writes more rows than one row group in several calls and
// reads them back unchanged; nothing is at the path before Close.
func TestWriterStreams(t *testing.T) {
	path := filepath.Join(t.TempDir(), "shard=0", "r.parquet")
	w, err := NewWriter(path)
	if err != nil {
		t.Fatal(err)
	}
	const n = 2*rowGroupRows + 17
	var want []Row
	for i := 0; i < n; i += 1000 {
		var batch []Row
		for k := i; k < min(i+1000, n); k++ {
			batch = append(batch, Row{EventID: EventID("r", "builtin", int64(k)), RecordingID: "r",
				OnsetS: float64(k) / 256, C1Sharpness: float64(k), Imported: math.NaN(), Channels: []string{"Cz"}})
		}
		if err := w.Write(batch); err != nil {
			t.Fatal(err)
		}
		want = append(want, batch...)
	}
	if _, err := os.Stat(path); !errors.Is(err, os.ErrNotExist) {
		t.Fatalf("table visible before Close: %v", err)
	}
	if err := w.Close(); err != nil {
		t.Fatal(err)
	}
	got, err := Read(path)
	if err != nil {
		t.Fatal(err)
	}
	if len(got) != n || w.Rows() != n {
		t.Fatalf("%d rows read, %d written, want %d", len(got), w.Rows(), n)
	}
	for i := range got {
		if got[i].EventID != want[i].EventID || got[i].OnsetS != want[i].OnsetS || got[i].C1Sharpness != want[i].C1Sharpness {
			t.Fatalf("row %d: %+v, want %+v", i, got[i], want[i])
		}
	}
	w.Abort() // after Close: no effect
	if _, err := os.Stat(path); err != nil {
		t.Errorf("Abort after Close removed the table: %v", err)
	}
}

// TestWriterAbort leaves neither the table nor a temporary file behind.
func TestWriterAbort(t *testing.T) {
	dir := t.TempDir()
	w, err := NewWriter(filepath.Join(dir, "r.parquet"))
	if err != nil {
		t.Fatal(err)
	}
	if err := w.Write([]Row{{EventID: "a", Imported: math.NaN()}}); err != nil {
		t.Fatal(err)
	}
	w.Abort()
	if err := w.Write(nil); err == nil {
		t.Error("Write after Abort succeeded")
	}
	if ents, _ := os.ReadDir(dir); len(ents) != 0 {
		t.Errorf("left behind: %v", ents)
	}
}
