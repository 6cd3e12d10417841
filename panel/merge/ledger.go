package merge

import (
	"bufio"
	"encoding/json"
	"fmt"
	"os"
	"time"
)

// Entry is one line of returns/ledger.jsonl: an accepted return file.
type Entry struct {
	Time     time.Time `json:"time"`
	Original string    `json:"original_name"` // the file name as handed to merge
	SHA256   string    `json:"sha256"`
	Stored   string    `json:"stored"` // file name under returns/
	Kind     string    `json:"kind"`   // json or csv
	Packet   string    `json:"packet"`
	Rater    string    `json:"rater"`
	Answered int       `json:"answered"`
	Unrated  int       `json:"unrated"`
}

// ReadLedger reads the ledger; a missing ledger is an empty one.
func ReadLedger(path string) ([]Entry, error) {
	f, err := os.Open(path)
	if os.IsNotExist(err) {
		return nil, nil
	}
	if err != nil {
		return nil, err
	}
	defer f.Close()
	var out []Entry
	sc := bufio.NewScanner(f)
	sc.Buffer(make([]byte, 1<<20), 1<<20)
	for line := 1; sc.Scan(); line++ {
		var e Entry
		if err := json.Unmarshal(sc.Bytes(), &e); err != nil {
			return nil, fmt.Errorf("%s: line %d: %w", path, line, err)
		}
		out = append(out, e)
	}
	return out, sc.Err()
}

func appendLedger(path string, es []Entry) error {
	f, err := os.OpenFile(path, os.O_WRONLY|os.O_APPEND|os.O_CREATE, 0o644)
	if err != nil {
		return err
	}
	var buf []byte
	for _, e := range es {
		b, err := json.Marshal(e)
		if err != nil {
			f.Close()
			return err
		}
		buf = append(append(buf, b...), '\n')
	}
	if _, err := f.Write(buf); err != nil {
		f.Close()
		return err
	}
	return f.Close()
}

// Counting returns, per packet, the ledger entry that counts: the last one merged.
func Counting(ledger []Entry) map[string]Entry {
	m := map[string]Entry{}
	for _, e := range ledger {
		m[e.Packet] = e
	}
	return m
}
