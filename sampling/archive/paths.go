package archive

import (
	"encoding/json"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"sort"

	"github.com/quorate-eeg/quorate/internal/atomicfile"
)

// Paths keep where each recording lies in the archive apart from the index: file and
// folder names often carry a patient's name, so recordings.parquet holds no path and
// the paths go to a file readable by the owner only, which no export reads.
//
// The file is JSON: recording_id → {"root": index into the archive roots, "path":
// slash-separated path under that root}.
type pathEntry struct {
	Root int32  `json:"root"`
	Path string `json:"path"`
}

// WritePaths writes the recordings' archive paths to path (mode 0600), atomically.
func WritePaths(path string, recs []Recording) error {
	m := make(map[string]pathEntry, len(recs))
	for _, r := range recs {
		m[r.RecordingID] = pathEntry{r.Root, r.Path}
	}
	b, err := json.MarshalIndent(m, "", "  ")
	if err != nil {
		return err
	}
	return atomicfile.WriteBytes(path, append(b, '\n'), 0o600)
}

// AttachPaths fills each recording's Root and Path from the paths file. Rows that
// already carry a path (an index written before paths were kept apart) keep it. A
// recording the file does not list is an error: it cannot be read from the archive.
func AttachPaths(recs []Recording, path string) ([]Recording, error) {
	b, err := os.ReadFile(path)
	if errors.Is(err, fs.ErrNotExist) {
		for _, r := range recs {
			if r.Path == "" {
				return nil, fmt.Errorf("%s: missing; the archive paths of the index are kept there (scan again to make it)", path)
			}
		}
		return recs, nil
	}
	if err != nil {
		return nil, err
	}
	m := map[string]pathEntry{}
	if err := json.Unmarshal(b, &m); err != nil {
		return nil, fmt.Errorf("%s: %w", path, err)
	}
	out := make([]Recording, len(recs))
	var missing []string
	for i, r := range recs {
		out[i] = r
		if r.Path != "" {
			continue
		}
		e, ok := m[r.RecordingID]
		if !ok {
			missing = append(missing, r.RecordingID)
			continue
		}
		out[i].Root, out[i].Path = e.Root, e.Path
	}
	if len(missing) > 0 {
		sort.Strings(missing)
		return nil, fmt.Errorf("%s: no archive path for %d recording(s) of the index, e.g. %s (scan again)", path, len(missing), missing[0])
	}
	return out, nil
}

// withoutPaths returns the recordings with Path cleared, as recordings.parquet keeps them.
func withoutPaths(recs []Recording) []Recording {
	out := make([]Recording, len(recs))
	for i, r := range recs {
		out[i] = r
		out[i].Path = ""
	}
	return out
}
