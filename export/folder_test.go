package export

import (
	"context"
	"errors"
	"os"
	"path/filepath"
	"testing"
)

// export --to ARCHIVE --replace once moved the archive root aside (archive.old-1), and
// the study with it. A folder that is, or holds, a protected folder never moves, even
// when it carries an export's marker.
func TestReplaceNeverMovesProtected(t *testing.T) {
	f := newFixture(t, 4)
	top := t.TempDir()
	archive := filepath.Join(top, "archive")
	studyDir := filepath.Join(top, "studies", "s1")
	for _, d := range []string{archive, studyDir} {
		os.MkdirAll(d, 0o755)
		os.WriteFile(filepath.Join(d, "keep"), []byte("x"), 0o644)
		os.WriteFile(filepath.Join(d, MarkerFile), []byte("{}"), 0o644) // even a planted marker
	}
	for _, to := range []string{archive, studyDir, filepath.Join(top, "studies"), top} {
		o := f.opts
		o.To, o.Format, o.Replace, o.Protect = to, "csv", true, []string{archive, studyDir}
		_, err := Run(context.Background(), o)
		var nx *notExportError
		if !errors.As(err, &nx) {
			t.Errorf("--to %s --replace: %v, want a refusal", to, err)
		}
	}
	for _, d := range []string{archive, studyDir} {
		if _, err := os.Stat(filepath.Join(d, "keep")); err != nil {
			t.Errorf("%s moved: %v", d, err)
		}
	}
}

// A killed export once left an unmarked half export at the target and .tmp-* files; the
// export is written beside the target and renamed into place whole, and the next run
// removes what a killed run left.
func TestExportWholeOrAbsent(t *testing.T) {
	f := newFixture(t, 4)
	parent := t.TempDir()
	to := filepath.Join(parent, "out")
	left := filepath.Join(parent, ".out.tmp-123")
	os.MkdirAll(left, 0o755)
	os.WriteFile(filepath.Join(left, "events.csv"), []byte("half"), 0o644)
	o := f.opts
	o.To, o.Format = to, "csv"
	// A failing write (an epoch montage the archive cannot give) leaves nothing at the target.
	bad := o
	bad.Epochs, bad.ArchiveRoots = true, nil
	if _, err := Run(context.Background(), bad); err == nil {
		t.Fatal("export with epochs and no archive succeeded")
	}
	if _, err := os.Stat(to); !errors.Is(err, os.ErrNotExist) {
		t.Errorf("a failed export left %s: %v", to, err)
	}
	if _, err := Run(context.Background(), o); err != nil {
		t.Fatal(err)
	}
	if _, err := os.Stat(filepath.Join(to, MarkerFile)); err != nil {
		t.Errorf("finished export unmarked: %v", err)
	}
	if m, _ := filepath.Glob(filepath.Join(parent, ".out.tmp-*")); len(m) != 0 {
		t.Errorf("leftovers %v", m)
	}
}
