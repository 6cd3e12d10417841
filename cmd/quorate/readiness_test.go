package main

import (
	"bytes"
	"errors"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"testing"

	"github.com/quorate-eeg/quorate/cmd/quorate/internal/study"
	"github.com/quorate-eeg/quorate/export/report"
	"github.com/quorate-eeg/quorate/tuning"
)

// clearReturns removes a demo study's stored returns (read-only by design) and its
// consensus, as if no rater had returned yet.
func clearReturns(t *testing.T, st string) {
	t.Helper()
	for _, d := range []string{study.ReturnsDir, study.ConsensusDir} {
		p := filepath.Join(st, d)
		filepath.WalkDir(p, func(q string, _ os.DirEntry, _ error) error { os.Chmod(q, 0o755); return nil })
		if err := os.RemoveAll(p); err != nil {
			t.Fatal(err)
		}
	}
}

// panelOf empties a demo study's returns and consensus and merges the first n of its
// simulated raters' returns (the demo's inbox holds one per packet, one packet per
// rater), as a coordinator would part-way through a study.
func panelOf(t *testing.T, n int) string {
	t.Helper()
	st := demoStudy(t)
	clearReturns(t, st)
	inbox, _ := filepath.Glob(filepath.Join(filepath.Dir(st), "inbox", "*.json"))
	sort.Strings(inbox)
	if len(inbox) != 3 {
		t.Fatalf("demo inbox holds %d returns, want 3", len(inbox))
	}
	if _, err := run(t, append([]string{"--study", st, "merge"}, inbox[:n]...)...); err != nil {
		t.Fatalf("merge of %d returns: %v", n, err)
	}
	return st
}

// With one of three raters returned and a quorum of 2, merge has run but no event has
// a verdict: tune says that no event reached the quorum, not that merge must be run.
func TestTuneNoQuorumSaysSo(t *testing.T) {
	st := panelOf(t, 1)
	_, err := run(t, "--study", st, "tune")
	if err == nil {
		t.Fatal("tune on one rater's answers succeeded")
	}
	msg := err.Error()
	if !strings.Contains(msg, "no event reached the panel's quorum of 2 answers") || !strings.Contains(msg, "2 of 3 packets outstanding") ||
		strings.Contains(msg, "run quorate merge first") {
		t.Errorf("tune with one rater returned: %q, want the no-quorum message", msg)
	}
}

// With two of three raters returned, tune tunes, and says on stderr and in both reports
// that a packet is outstanding.
func TestTuneWarnsOfOutstandingPackets(t *testing.T) {
	st := panelOf(t, 2)
	var out, errs bytes.Buffer
	root := newRoot(&globals{argv: []string{"quorate", "tune"}, stdout: &out, stderr: &errs})
	root.SetArgs([]string{"--quiet", "--study", st, "tune"})
	if err := root.Execute(); err != nil && !isWarnings(err) {
		t.Fatalf("tune: %v\n%s", err, errs.String())
	}
	const want = "1 of 3 packets are outstanding"
	if !strings.Contains(errs.String(), want) {
		t.Errorf("stderr lacks %q:\n%s", want, errs.String())
	}
	if n := strings.Count(errs.String(), want); n != 1 {
		t.Errorf("stderr says %q %d times, want once", want, n)
	}
	for _, f := range []string{report.HTMLFile, report.MarkdownFile, report.PointFile} {
		b, err := os.ReadFile(filepath.Join(st, study.TuningDir, f))
		if err != nil || !bytes.Contains(b, []byte(want)) {
			t.Errorf("%s lacks %q (%v)", f, want, err)
		}
	}
}

// A tune that then fails has still said what state the panel is in.
func TestTuneWarnsBeforeFailing(t *testing.T) {
	st := panelOf(t, 2)
	var out, errs bytes.Buffer
	root := newRoot(&globals{argv: []string{"quorate", "tune"}, stdout: &out, stderr: &errs})
	root.SetArgs([]string{"--quiet", "--study", st, "tune", "--folds", "1"})
	if err := root.Execute(); err == nil || isWarnings(err) {
		t.Fatalf("tune --folds 1: %v, want an error", err)
	}
	if want := "1 of 3 packets are outstanding"; !strings.Contains(errs.String(), want) {
		t.Errorf("stderr lacks %q:\n%s", want, errs.String())
	}
}

// An unknown --method is a usage error naming the flag and every method, before
// anything is read or written.
func TestTuneUnknownMethod(t *testing.T) {
	st := demoStudy(t)
	_, err := run(t, "--study", st, "tune", "--method", "k-of-six")
	var u usageError
	if !errors.As(err, &u) || !strings.Contains(err.Error(), "--method") {
		t.Fatalf("tune --method k-of-six: %v, want a usage error naming --method", err)
	}
	for _, m := range tuning.Methods {
		if !strings.Contains(err.Error(), m) {
			t.Errorf("%q does not list %s", err, m)
		}
	}
}
