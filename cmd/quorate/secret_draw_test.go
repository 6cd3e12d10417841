package main

import (
	"fmt"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"testing"

	"github.com/quorate-eeg/quorate/cmd/quorate/internal/study"
	"github.com/quorate-eeg/quorate/sampling/draw"
	"github.com/quorate-eeg/quorate/sampling/synth"
)

// Two studies of one archive, made by init with different --secret-files and run with
// the same --seed through scan, detect and draw, draw the same events. The secret keys
// the subject keys (HMAC-SHA-256, RFC 2104), so those differ between the studies; the
// drawn events are compared by what identifies them in the archive — the recording's
// content hash, the event ID built from it, the kind, stratum and onset — never by
// subject keys or blinded codes.
func TestTwoSecretsOneSeedDrawTheSameEvents(t *testing.T) {
	if testing.Short() {
		t.Skip("detects on a generated archive; skipped in -short mode")
	}
	dir := t.TempDir()
	arch := filepath.Join(dir, "archive")
	subjects := synth.Archive(synth.ArchiveConfig{Seed: 11, Subjects: 3, Recordings: 1, Duration: 120, Forward: synth.HeadForward()})
	if _, err := synth.WriteArchive(arch, filepath.Join(dir, "truth"), subjects); err != nil {
		t.Fatal(err)
	}
	// drawn returns the drawn events and the study's recordings in the order of their
	// subject keys (the order a draw keyed on subjects would walk them in).
	drawn := func(name, key string) (events []string, byKey string) {
		secret := filepath.Join(dir, name+".key")
		if err := os.WriteFile(secret, []byte(key+"\n"), 0o600); err != nil {
			t.Fatal(err)
		}
		st := filepath.Join(dir, name)
		if _, err := run(t, "init", st, "--archive", arch, "--secret-file", secret, "--seed", "3"); err != nil {
			t.Fatal("init:", err)
		}
		for _, args := range [][]string{
			{"scan"}, {"detect"},
			// A per-subject cap and a small n, so that the walk over subjects decides
			// which events are thinned and subject order would show.
			{"draw", "--n", "10", "--strata", "score:q2", "--min-per-stratum", "1", "--subject-cap", "2", "--seed", "42"},
		} {
			if _, err := run(t, append([]string{"--study", st}, args...)...); err != nil && !isWarnings(err) {
				t.Fatalf("%s: %v", args[0], err)
			}
		}
		rows, err := draw.ReadRows(filepath.Join(st, study.DrawDir, draw.DrawFile))
		if err != nil {
			t.Fatal(err)
		}
		keyOf := map[string]string{}
		for _, r := range rows {
			events = append(events, fmt.Sprintf("%s %s %s %s %.6f", r.EventID, r.Kind, r.Stratum, r.RecordingID, r.OnsetS))
			keyOf[r.RecordingID] = r.SubjectKey
		}
		sort.Strings(events)
		recs := make([]string, 0, len(keyOf))
		for r := range keyOf {
			recs = append(recs, r)
		}
		sort.Slice(recs, func(i, j int) bool { return keyOf[recs[i]] < keyOf[recs[j]] })
		return events, strings.Join(recs, " ")
	}
	a, ka := drawn("first", strings.Repeat("0123456789abcdef", 4))
	b, kb := drawn("second", strings.Repeat("5a5a5a5a5a5a5a5a", 4))
	if len(a) == 0 {
		t.Fatal("the first study drew nothing")
	}
	// The two secrets were chosen so that the subject keys sort the recordings in
	// different orders; otherwise a draw walking subjects in key order would pass too
	// (with the subjects taken in key order instead of event-ID order this test fails).
	if ka == kb {
		t.Fatalf("both secrets sort the subjects alike (%s): the test could not fail", ka)
	}
	if strings.Join(a, "\n") != strings.Join(b, "\n") {
		t.Errorf("the same archive and seed drew different events under two secrets:\nfirst:\n%s\nsecond:\n%s",
			strings.Join(a, "\n"), strings.Join(b, "\n"))
	}
}
