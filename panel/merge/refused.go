package merge

import (
	"bufio"
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"time"
)

// RefusedFile is the log of files merge refused, beside the ledger: a
// refused file is not stored, so this is where status finds it.
const RefusedFile = "refused.jsonl"

// Refusal is one line of the refused log.
type Refusal struct {
	Time     time.Time `json:"time"`
	Original string    `json:"original_name"`
	Reason   string    `json:"reason"`
}

// ReadRefused reads the refused log; a missing log is an empty one.
func ReadRefused(path string) ([]Refusal, error) { return readJSONL[Refusal](path) }

// readJSONL reads one JSON value per line; a missing file is an empty one.
func readJSONL[T any](path string) ([]T, error) {
	f, err := os.Open(path)
	if os.IsNotExist(err) {
		return nil, nil
	}
	if err != nil {
		return nil, err
	}
	defer f.Close()
	var out []T
	sc := bufio.NewScanner(f)
	sc.Buffer(make([]byte, 1<<20), 1<<22)
	for line := 1; sc.Scan(); line++ {
		var v T
		if err := json.Unmarshal(sc.Bytes(), &v); err != nil {
			return nil, fmt.Errorf("%s: line %d: %w", path, line, err)
		}
		out = append(out, v)
	}
	return out, sc.Err()
}

func appendRefused(path string, rs []Refusal) error {
	return appendJSONL(path, rs)
}

func appendJSONL[T any](path string, rows []T) error {
	if len(rows) == 0 {
		return nil
	}
	var buf []byte
	for _, r := range rows {
		b, err := json.Marshal(r)
		if err != nil {
			return err
		}
		buf = append(append(buf, b...), '\n')
	}
	// The folder may not exist yet: the first file ever handed in may be refused.
	if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
		return err
	}
	f, err := os.OpenFile(path, os.O_WRONLY|os.O_APPEND|os.O_CREATE, 0o644)
	if err != nil {
		return err
	}
	if _, err := f.Write(buf); err != nil {
		f.Close()
		return err
	}
	return f.Close()
}
