package candidate

import (
	"errors"
	"path/filepath"
	"strings"
	"testing"
)

// A missing or empty candidate folder is ErrNoCandidates, named by its path and in the
// domain's words (the command layer adds which command makes candidates).
func TestReadDirNoCandidates(t *testing.T) {
	empty := t.TempDir()
	for _, dir := range []string{empty, filepath.Join(empty, "absent")} {
		_, err := ReadDir(dir)
		if !errors.Is(err, ErrNoCandidates) || !strings.Contains(err.Error(), dir) || strings.Contains(err.Error(), "quorate") {
			t.Errorf("ReadDir(%s): %v, want ErrNoCandidates naming the folder", dir, err)
		}
	}
}
