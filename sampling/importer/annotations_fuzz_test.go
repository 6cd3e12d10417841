package importer

import (
	"context"
	"os"
	"path/filepath"
	"regexp"
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
