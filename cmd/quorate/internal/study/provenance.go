package study

import (
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"time"
)

// FileHash names a file by its path within the study (or as given, outside it) and its
// SHA-256, so a later reader can tell whether an artefact is still the one a step used.
type FileHash struct {
	Path   string `json:"path"`
	SHA256 string `json:"sha256"`
	Bytes  int64  `json:"bytes"`
	Error  string `json:"error,omitempty"` // why the file could not be read; SHA256 is then empty
}

// Entry is one line of provenance.jsonl.
type Entry struct {
	Time    time.Time      `json:"time"`
	Version string         `json:"version"`
	Command string         `json:"command"`
	Argv    []string       `json:"argv"`
	Seed    *uint64        `json:"seed,omitempty"`
	Inputs  []FileHash     `json:"inputs"`
	Outputs []FileHash     `json:"outputs"`
	Notes   map[string]any `json:"notes,omitempty"`
	// KeepGeneration is set by a stage's command that ran but rebuilt nothing (a merge
	// of returns already stored): the stage keeps the generation it had.
	KeepGeneration bool `json:"-"`
}

// Hash reads the files (folders are walked) and returns their hashes with paths made
// relative to the study folder where they lie inside it. A path that does not exist is
// skipped (an optional output); a file that cannot be read is listed with its error
// and no hash, never left out silently.
func (s *Study) Hash(paths ...string) []FileHash {
	out, _ := s.hash(paths)
	return out
}

// HashAll is Hash that fails on the first file it cannot read.
func (s *Study) HashAll(paths ...string) ([]FileHash, error) {
	out, errs := s.hash(paths)
	return out, errors.Join(errs...)
}

func (s *Study) hash(paths []string) ([]FileHash, []error) {
	var out []FileHash
	var errs []error
	for _, p := range paths {
		filepath.WalkDir(p, func(q string, d os.DirEntry, err error) error {
			if err != nil && errors.Is(err, fs.ErrNotExist) && q == p {
				return nil
			}
			rel := q
			if r, err := filepath.Rel(s.Dir, q); err == nil && !filepath.IsAbs(r) && len(r) > 0 && !strings.HasPrefix(r, "..") {
				rel = r
			}
			rel = filepath.ToSlash(rel)
			if err != nil {
				out = append(out, FileHash{Path: rel, Error: err.Error()})
				errs = append(errs, err)
				return nil
			}
			if d.IsDir() {
				return nil
			}
			sum, n, err := hashFile(q)
			if err != nil {
				out = append(out, FileHash{Path: rel, Error: err.Error()})
				errs = append(errs, err)
				return nil
			}
			out = append(out, FileHash{Path: rel, SHA256: sum, Bytes: n})
			return nil
		})
	}
	sort.Slice(out, func(i, j int) bool { return out[i].Path < out[j].Path })
	return out, errs
}

func hashFile(p string) (string, int64, error) {
	f, err := os.Open(p)
	if err != nil {
		return "", 0, err
	}
	defer f.Close()
	h := sha256.New()
	n, err := io.Copy(h, f)
	if err != nil {
		return "", 0, fmt.Errorf("%s: %w", p, err)
	}
	return hex.EncodeToString(h.Sum(nil)), n, nil
}

// Record appends one entry to the provenance log. The log is append-only: one JSON
// object per line, written in a single write so concurrent commands do not interleave.
func (s *Study) Record(e Entry) error {
	if e.Time.IsZero() {
		e.Time = time.Now().UTC()
	}
	if e.Inputs == nil {
		e.Inputs = []FileHash{}
	}
	if e.Outputs == nil {
		e.Outputs = []FileHash{}
	}
	b, err := json.Marshal(e)
	if err != nil {
		return err
	}
	f, err := os.OpenFile(s.Path(ProvenanceFile), os.O_WRONLY|os.O_APPEND|os.O_CREATE, 0o644)
	if err != nil {
		return err
	}
	if _, err := f.Write(append(b, '\n')); err != nil {
		f.Close()
		return err
	}
	if err := f.Close(); err != nil {
		return err
	}
	if st, ok := s.stageNamed(e.Command); ok && !e.KeepGeneration {
		return s.recordGeneration(st, e.Argv)
	}
	return nil
}
