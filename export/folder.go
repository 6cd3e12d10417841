package export

import (
	"encoding/json"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
	"time"

	"github.com/quorate-eeg/quorate/internal/atomicfile"
)

// MarkerFile marks a folder as a finished export. An export is written into a hidden
// sibling folder, marked last, and renamed into place, so that a folder at the target
// is either a whole, marked export or not there at all (a run killed half-way leaves
// only the hidden sibling, removed by the next run). Replace moves aside only a
// folder that carries this marker.
const MarkerFile = ".quorate-export.json"

// notExportError reports a folder that Replace will not move: it holds no export's
// marker, or it is (or holds) a folder that must never move.
type notExportError struct {
	Dir    string
	Reason string
}

func (e *notExportError) Error() string {
	return fmt.Sprintf("export: %s %s; it is left where it is: choose another folder", e.Dir, e.Reason)
}

// Unwrap gives ErrNotExport, for errors.Is.
func (e *notExportError) Unwrap() error { return ErrNotExport }

// staging is an export being written into a hidden sibling of its target.
type staging struct {
	dir, tmp string
}

// stage checks that dir may receive an export and makes the hidden sibling to write
// into. A folder that holds anything is refused unless replace is set; then it must be
// an earlier export (it holds MarkerFile) and must not be or contain a protected
// folder (the archive roots, the study). Leftovers of killed runs are removed first.
func stage(dir string, replace bool, protect []string) (*staging, error) {
	parent, base := filepath.Dir(dir), filepath.Base(dir)
	if err := os.MkdirAll(parent, 0o755); err != nil {
		return nil, err
	}
	leftovers, _ := filepath.Glob(filepath.Join(parent, "."+base+".tmp-*"))
	for _, l := range leftovers {
		os.RemoveAll(l)
	}
	for _, p := range protect {
		if within(p, dir) {
			return nil, &notExportError{Dir: dir, Reason: "is or holds " + p + ", which an export never touches"}
		}
	}
	entries, err := os.ReadDir(dir)
	switch {
	case errors.Is(err, fs.ErrNotExist), err == nil && len(entries) == 0:
	case err != nil:
		return nil, err
	case !replace:
		return nil, &notEmptyError{Dir: dir}
	default:
		if _, err := os.Lstat(filepath.Join(dir, MarkerFile)); err != nil {
			return nil, &notExportError{Dir: dir, Reason: "holds no " + MarkerFile + " (it is not an earlier export)"}
		}
	}
	tmp, err := os.MkdirTemp(parent, "."+base+".tmp-")
	if err != nil {
		return nil, err
	}
	return &staging{dir: dir, tmp: tmp}, nil
}

// within reports whether path p is dir or lies inside it, comparing absolute paths with
// symbolic links resolved where they exist.
func within(p, dir string) bool {
	p, dir = resolved(p), resolved(dir)
	rel, err := filepath.Rel(dir, p)
	return err == nil && rel != ".." && !strings.HasPrefix(rel, ".."+string(filepath.Separator))
}

func resolved(p string) string {
	a, err := filepath.Abs(p)
	if err != nil {
		return filepath.Clean(p)
	}
	if r, err := filepath.EvalSymlinks(a); err == nil {
		return r
	}
	return a
}

// commit marks the staged export and puts it in place, moving an earlier export to the
// first free "dir.old-N" (never deleted).
func (s *staging) commit(format string) (movedAside string, err error) {
	b, _ := json.MarshalIndent(map[string]string{"format": format, "written": time.Now().UTC().Format(time.RFC3339)}, "", "  ")
	if err := atomicfile.WriteBytes(filepath.Join(s.tmp, MarkerFile), append(b, '\n'), 0o644); err != nil {
		return "", err
	}
	entries, err := os.ReadDir(s.dir)
	switch {
	case errors.Is(err, fs.ErrNotExist):
	case err != nil:
		return "", err
	case len(entries) == 0:
		if err := os.Remove(s.dir); err != nil {
			return "", err
		}
	default:
		for n := 1; movedAside == ""; n++ {
			aside := fmt.Sprintf("%s.old-%d", s.dir, n)
			if _, err := os.Lstat(aside); errors.Is(err, fs.ErrNotExist) {
				if err := os.Rename(s.dir, aside); err != nil {
					return "", err
				}
				movedAside = aside
			}
		}
	}
	return movedAside, os.Rename(s.tmp, s.dir)
}

// abort removes the staged export.
func (s *staging) abort() { os.RemoveAll(s.tmp) }
