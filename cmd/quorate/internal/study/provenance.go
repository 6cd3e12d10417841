package study

import (
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"io"
	"os"
	"path/filepath"
	"sort"
	"time"
)

// FileHash names a file by its path within the study (or as given, outside it) and its
// SHA-256, so a later reader can tell whether an artefact is still the one a step used.
type FileHash struct {
	Path   string `json:"path"`
	SHA256 string `json:"sha256"`
	Bytes  int64  `json:"bytes"`
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
}

// Hash reads the files (folders are walked) and returns their hashes with paths made
// relative to the study folder where they lie inside it. Missing files are skipped.
func (s *Study) Hash(paths ...string) []FileHash {
	var out []FileHash
	for _, p := range paths {
		filepath.WalkDir(p, func(q string, d os.DirEntry, err error) error {
			if err != nil || d.IsDir() {
				return nil
			}
			f, err := os.Open(q)
			if err != nil {
				return nil
			}
			defer f.Close()
			h := sha256.New()
			n, err := io.Copy(h, f)
			if err != nil {
				return nil
			}
			rel := q
			if r, err := filepath.Rel(s.Dir, q); err == nil && !filepath.IsAbs(r) && len(r) > 0 && r[0] != '.' {
				rel = r
			}
			out = append(out, FileHash{Path: filepath.ToSlash(rel), SHA256: hex.EncodeToString(h.Sum(nil)), Bytes: n})
			return nil
		})
	}
	sort.Slice(out, func(i, j int) bool { return out[i].Path < out[j].Path })
	return out
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
	return f.Close()
}
