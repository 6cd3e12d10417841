package importer

import (
	"context"
	"io"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"github.com/quorate-eeg/quorate/sampling/archive"
	"github.com/quorate-eeg/quorate/sampling/edf"
)

// FuzzReadAnnotations imports the EDF+ annotations of arbitrary bytes taken as a
// recording: nothing may panic, and every event it accepts has a finite onset.
func FuzzReadAnnotations(f *testing.F) {
	dir := f.TempDir()
	seed := filepath.Join(dir, "seed.edf")
	writeEDFPlus(&testing.T{}, seed, []edf.Annotation{{Onset: 1.5, Text: "spike"}, {Onset: 4, Duration: 1, Text: "sharp wave"}, {Onset: 7, Text: "eyes open"}})
	if b, err := os.ReadFile(seed); err == nil {
		f.Add(b)
	}
	f.Add([]byte("0       "))
	pattern := regexp.MustCompile("(?i)spike|sharp")
	f.Fuzz(func(t *testing.T, data []byte) {
		if len(data) > 1<<16 {
			return
		}
		root := t.TempDir()
		if err := os.WriteFile(filepath.Join(root, "r.edf"), data, 0o644); err != nil {
			t.Fatal(err)
		}
		recs := []archive.Recording{{RecordingID: "rec-f", Path: "r.edf"}}
		evs, _, err := readAnnotations(context.Background(), []string{root}, recs, 0, pattern)
		if err != nil {
			return
		}
		for _, e := range evs {
			if e.seconds != e.seconds {
				t.Fatalf("NaN onset from %q", e.onset)
			}
		}
	})
}

// An events table above maxTableBytes is refused, not read into memory whole.
func TestReadTableCap(t *testing.T) {
	defer func(n int) { maxTableBytes = n }(maxTableBytes)
	maxTableBytes = 1 << 10
	r := io.MultiReader(strings.NewReader("recording,onset\n"), io.LimitReader(zeros{}, int64(maxTableBytes)))
	if _, err := readTable(r, "huge.csv", 0); err == nil || !strings.Contains(err.Error(), "huge.csv") {
		t.Errorf("oversized table: %v", err)
	}
}

type zeros struct{}

func (zeros) Read(p []byte) (int, error) {
	for i := range p {
		p[i] = '0'
	}
	return len(p), nil
}
